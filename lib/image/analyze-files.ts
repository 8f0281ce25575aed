import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { analyzeCaptureDetailed, preparePhoto, type CapturePhoto } from '../photometry/analyze-capture';
import { EngineInputError } from '../photometry/errors';
import type { CaptureResult } from '../photometry/result';
import type { Offset, Pattern, PhotoRole, Rect } from '../photometry/types';
import { renderArtifacts, type Artifacts } from './artifacts';
import { decodePhoto } from './decode';

/** A photo by path or as bytes already in memory (the worker reads from storage). */
export type PhotoSource = string | { name: string; bytes: Uint8Array };

export interface AnalyzeFilesOptions {
  on: PhotoSource;
  off: PhotoSource;
  ambient?: PhotoSource | null;
  dark?: PhotoSource | null;
  pattern?: Pattern;
  screen?: Rect | null;
  background?: Rect | null;
  ghostOffset?: Offset | 'none' | null;
  calibration?: number | null;
  /** Declare 16-bit TIFFs linear instead of sRGB-encoded. */
  linear16?: boolean;
  /** Skip the PNG maps (faster when only numbers are wanted). */
  artifacts?: boolean;
  onProgress?: (stage: string, fraction: number) => void;
}

export interface FileAnalysis {
  result: CaptureResult;
  artifacts: Artifacts | null;
}

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
  const progress = options.onProgress ?? ((): void => undefined);
  const sources: [PhotoRole, PhotoSource][] = [['on', options.on], ['off', options.off]];
  if (options.ambient) sources.push(['ambient', options.ambient]);
  if (options.dark) sources.push(['dark', options.dark]);
  progress('read', 0);
  const files = await Promise.all(sources.map(([role, s]) => load(s, role)));
  progress('decode', 0.05);
  // each photo's downsampled plane is made as soon as it is decoded, while the others still decode
  const photos = await Promise.all(
    files.map(async (f, k) => {
      const role = (sources[k] as [PhotoRole, PhotoSource])[0];
      const decoded = await decodePhoto(f.bytes, { name: `the ${role} photo ${f.name}`, linear16: options.linear16 ?? false });
      const photo: CapturePhoto = { raster: decoded.raster, exposure: decoded.exposure, small: preparePhoto(decoded.raster) };
      return [role, photo] as const;
    }),
  );
  const byRole = Object.fromEntries(photos) as Partial<Record<PhotoRole, CapturePhoto>>;
  progress('analyse', 0.4);
  const { result, maps } = analyzeCaptureDetailed({
    on: byRole.on as CapturePhoto,
    off: byRole.off as CapturePhoto,
    ambient: byRole.ambient ?? null,
    dark: byRole.dark ?? null,
    pattern: options.pattern ?? 'full',
    screen: options.screen ?? null,
    background: options.background ?? null,
    ghostOffset: options.ghostOffset ?? null,
    calibration: options.calibration ?? null,
    onProgress: (stage, f) => progress(stage, 0.4 + 0.5 * f),
  });
  const artifacts = options.artifacts === false ? null : await renderArtifacts(maps);
  progress('done', 1);
  return { result, artifacts };
}
