import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { analyzeCaptureDetailed, preparePhoto, resolveRolePhoto, type AnalysisMemo, type BracketedResult, type CapturePhoto } from '../photometry/analyze-capture';
import { EngineInputError } from '../photometry/errors';
import type { CaptureResult } from '../photometry/result';
import type { OpticsOptions } from '../photometry/stages/optics';
import type { Offset, Pattern, PhotoRole, Rect } from '../photometry/types';
import { renderArtifacts, renderMapImages, type Artifacts, type MapImages } from './artifacts';
import { decodePhoto } from './decode';
import { identifyRaw, setWhiteBalance, sniffRaw, type RawWhiteBalance } from './raw';

/**
 * A photo by path or as bytes already in memory (the worker reads from storage). Bytes may carry
 * their own `linear16`, which then wins over the option of the same name for that photo.
 */
export type PhotoSource = string | { name: string; bytes: Uint8Array; linear16?: boolean };

const linearOf = (source: PhotoSource, options: AnalyzeFilesOptions): boolean => (typeof source !== 'string' && source.linear16 !== undefined ? source.linear16 : (options.linear16 ?? false));

/** One photo of a role, or several at different exposures (a bracket, merged before measuring). */
export type RoleSource = PhotoSource | readonly PhotoSource[];

export interface AnalyzeFilesOptions {
  on: RoleSource;
  off: RoleSource;
  ambient?: RoleSource | null;
  dark?: RoleSource | null;
  pattern?: Pattern;
  screen?: Rect | null;
  background?: Rect | null;
  ghostOffset?: Offset | 'none' | null;
  calibration?: number | null;
  /** Camera profile's degrees per pixel, the display's resolution and white (field of view, pixels per degree, Δu′v′). */
  optics?: OpticsOptions | null;
  /** Declare 16-bit TIFFs linear instead of sRGB-encoded. */
  linear16?: boolean;
  /** Skip the PNG maps (faster when only numbers are wanted). */
  artifacts?: boolean;
  onProgress?: (stage: string, fraction: number) => void;
}

export interface FileAnalysis {
  result: CaptureResult & Pick<BracketedResult, 'brackets'>;
  artifacts: Artifacts | null;
  /** The one white balance every camera raw photo of the set was decoded with; null without raw photos. */
  rawWhiteBalance: RawWhiteBalance | null;
}

/**
 * The white balance fixed for the whole set (lib/image/raw.ts): the daylight multipliers of its first
 * raw photo in role order (on, off, ambient, dark; a bracket's first member first). Null without raw.
 */
async function setRawWhiteBalance(files: readonly { name: string; bytes: Uint8Array }[], roleOf: (k: number) => PhotoRole): Promise<RawWhiteBalance | null> {
  for (let k = 0; k < files.length; k++) {
    const f = files[k] as { name: string; bytes: Uint8Array };
    const kind = sniffRaw(f.bytes, f.name);
    if (kind) return setWhiteBalance(await identifyRaw(f.bytes, `the ${roleOf(k)} photo ${f.name}`, kind));
  }
  return null;
}

// a file of several pages (a multi-page TIFF): the decoder measured the first, and the reading says so
const pagesOf = (count: number): CapturePhoto['pages'] => (count > 1 ? { count, measured: 0 } : null);

async function load(source: PhotoSource, role: PhotoRole): Promise<{ name: string; bytes: Uint8Array }> {
  if (typeof source !== 'string') return source;
  try {
    return { name: basename(source), bytes: await readFile(source) };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new EngineInputError('file-missing', `the ${role} photo ${source} does not exist`);
    if (code === 'EISDIR') throw new EngineInputError('file-unreadable', `the ${role} photo ${source} is a folder, not a file`);
    throw new EngineInputError('file-unreadable', `the ${role} photo ${source} cannot be read (${code ?? 'error'})`);
  }
}

/** Decodes and analyses a capture set end to end: files in, reading and artifacts out. */
export async function analyzeFiles(options: AnalyzeFilesOptions): Promise<FileAnalysis> {
  const roles = [['on', options.on], ['off', options.off], ['ambient', options.ambient], ['dark', options.dark]] as const;
  if (roles.some(([, s]) => Array.isArray(s) && s.length !== 1)) return analyzeBrackets(options);
  const single = (s: RoleSource | null | undefined): PhotoSource | null => (s === null || s === undefined ? null : Array.isArray(s) ? (s[0] as PhotoSource) : (s as PhotoSource));
  return analyzeSingles({ ...options, on: single(options.on) as PhotoSource, off: single(options.off) as PhotoSource, ambient: single(options.ambient), dark: single(options.dark) });
}

// at least one role is a bracket: decode everything, merge each bracket once, analyse once
async function analyzeBrackets(options: AnalyzeFilesOptions): Promise<FileAnalysis> {
  const progress = options.onProgress ?? ((): void => undefined);
  const list = (s: RoleSource | null | undefined): PhotoSource[] => (s === null || s === undefined ? [] : Array.isArray(s) ? [...(s as readonly PhotoSource[])] : [s as PhotoSource]);
  const byRole: [PhotoRole, PhotoSource[]][] = [['on', list(options.on)], ['off', list(options.off)], ['ambient', list(options.ambient)], ['dark', list(options.dark)]];
  progress('read', 0);
  const loaded: [PhotoRole, PhotoSource[], { name: string; bytes: Uint8Array }[]][] = [];
  for (const [role, sources] of byRole) loaded.push([role, sources, await Promise.all(sources.map((s) => load(s, role)))]);
  const flat = loaded.flatMap(([role, , files]) => files.map((f) => [role, f] as const));
  const rawWhiteBalance = await setRawWhiteBalance(flat.map(([, f]) => f), (k) => (flat[k] as readonly [PhotoRole, unknown])[0]);
  const photos: Partial<Record<PhotoRole, CapturePhoto>> = {};
  for (const [role, sources, files] of loaded) {
    if (sources.length === 0) continue;
    const decoded = await Promise.all(
      files.map(async (f, i) => {
        const d = await decodePhoto(f.bytes, { name: sources.length > 1 ? `the ${role} photo ${f.name} (bracket ${i + 1} of ${sources.length})` : `the ${role} photo ${f.name}`, linear16: linearOf(sources[i] as PhotoSource, options), rawWhiteBalance });
        return { raster: d.raster, exposure: d.exposure, pages: pagesOf(d.pages) } satisfies CapturePhoto;
      }),
    );
    const merged = resolveRolePhoto(decoded, role);
    photos[role] = { ...merged, small: preparePhoto(merged.raster) };
  }
  if (!photos.on || !photos.off) throw new EngineInputError('file-missing', 'both an on and an off photo are needed');
  progress('analyse', 0.4);
  const { result, maps } = analyzeCaptureDetailed({
    on: photos.on,
    off: photos.off,
    ambient: photos.ambient ?? null,
    dark: photos.dark ?? null,
    pattern: options.pattern ?? 'full',
    screen: options.screen ?? null,
    background: options.background ?? null,
    ghostOffset: options.ghostOffset ?? null,
    calibration: options.calibration ?? null,
    optics: options.optics ?? null,
    onProgress: (stage, f) => progress(stage, 0.4 + 0.5 * f),
  });
  const artifacts = options.artifacts !== false ? await renderArtifacts(maps, null) : null;
  progress('done', 1);
  return { result, artifacts, rawWhiteBalance };
}

async function analyzeSingles(options: AnalyzeFilesOptions & { on: PhotoSource; off: PhotoSource; ambient: PhotoSource | null; dark: PhotoSource | null }): Promise<FileAnalysis> {
  const progress = options.onProgress ?? ((): void => undefined);
  const sources: [PhotoRole, PhotoSource][] = [['on', options.on], ['off', options.off]];
  if (options.ambient) sources.push(['ambient', options.ambient]);
  if (options.dark) sources.push(['dark', options.dark]);
  progress('read', 0);
  const files = await Promise.all(sources.map(([role, s]) => load(s, role)));
  const rawWhiteBalance = await setRawWhiteBalance(files, (k) => (sources[k] as [PhotoRole, PhotoSource])[0]);
  progress('decode', 0.05);
  // each photo's downsampled plane is made as soon as it is decoded, while the others still decode
  const decodeOne = async (k: number, onDecodeStarted?: () => void): Promise<readonly [PhotoRole, CapturePhoto]> => {
    const f = files[k] as { name: string; bytes: Uint8Array };
    const role = (sources[k] as [PhotoRole, PhotoSource])[0];
    const decoded = await decodePhoto(f.bytes, { name: `the ${role} photo ${f.name}`, linear16: linearOf((sources[k] as [PhotoRole, PhotoSource])[1], options), onDecodeStarted, rawWhiteBalance });
    const photo: CapturePhoto = { raster: decoded.raster, exposure: decoded.exposure, small: preparePhoto(decoded.raster), pages: pagesOf(decoded.pages) };
    return [role, photo] as const;
  };
  const common = {
    pattern: options.pattern ?? 'full',
    screen: options.screen ?? null,
    background: options.background ?? null,
    ghostOffset: options.ghostOffset ?? null,
    calibration: options.calibration ?? null,
    optics: options.optics ?? null,
  } as const;
  const wantArtifacts = options.artifacts !== false;
  const memo: AnalysisMemo = new Map();
  let photos: (readonly [PhotoRole, CapturePhoto])[];
  let early: Promise<MapImages | null> | null = null;
  if (files.length <= 2) {
    photos = await Promise.all(files.map((_, k) => decodeOne(k)));
  } else {
    // on and off first, with both cores; the other photos decode while the on/off part of the
    // analysis runs (registration, detection, ghost search, on/off region sums, maps) into the memo
    const pair = await Promise.all([decodeOne(0), decodeOne(1)]);
    let started = 0;
    let allStarted: () => void = (): void => undefined;
    const startedAll = new Promise<void>((resolve) => (allStarted = resolve));
    const restCount = files.length - 2;
    const onStarted = (): void => {
      if (++started === restCount) allStarted();
    };
    const rest = Promise.all(files.slice(2).map((_, k) => decodeOne(k + 2, onStarted)));
    // a decode error is reported below, when the rest is awaited
    rest.catch((): void => undefined);
    await Promise.race([startedAll, rest.then(() => undefined, () => undefined)]);
    try {
      const partial = analyzeCaptureDetailed({ on: (pair[0] as readonly [PhotoRole, CapturePhoto])[1], off: (pair[1] as readonly [PhotoRole, CapturePhoto])[1], ...common, memo, ambientFollows: options.ambient !== null });
      if (wantArtifacts) {
        early = renderMapImages(partial.maps).catch(() => null);
      }
    } catch {
      // the analysis of the full set below meets the same problem and reports it
    }
    photos = [...pair, ...(await rest)];
  }
  const byRole = Object.fromEntries(photos) as Partial<Record<PhotoRole, CapturePhoto>>;
  progress('analyse', 0.4);
  const { result, maps } = analyzeCaptureDetailed({
    on: byRole.on as CapturePhoto,
    off: byRole.off as CapturePhoto,
    ambient: byRole.ambient ?? null,
    dark: byRole.dark ?? null,
    ...common,
    memo,
    onProgress: (stage, f) => progress(stage, 0.4 + 0.5 * f),
  });
  const artifacts = wantArtifacts ? await renderArtifacts(maps, early ? await early : null) : null;
  progress('done', 1);
  return { result, artifacts, rawWhiteBalance };
}
