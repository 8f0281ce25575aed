import { checkerboardContrast } from './checkerboard';
import { deltaE2000 } from './ciede2000';
import { chromaticity, linearRgbToXyz, xyzToLab, D65_WHITE } from './color';
import { contrastRatio, michelson } from './contrast';
import { luminanceCrop } from './crop';
import { refineGhostOffset, refineScreenEdges, type EdgeSource } from './screen-edges';
import { detectScreen, strided } from './detect-screen';
import { downsampleLuminance } from './downsample';
import { EngineInputError } from './errors';
import { exposureFactor, exposureScales } from './exposure';
import { GHOST_MIN_SNR, searchGhost } from './ghost-search';
import { measureGhostStrips, type BandStrip } from './ghost-measure';
import { bandRects } from './band';
import { mergeBracket, type BracketSummary } from './bracket-merge';
import { measureRects, totalsMean, totalsRgbMean, type RectRequest, type RectTotals } from './region-pass';
import { luminanceHistogram } from './histogram';
import { meterLuminance, METERED_TONE } from './meter';
import { percentile, robustSigma } from './percentile';
import { assertRaster, downsampleFactor } from './raster';
import { gridCells, intersectRects, translateRect } from './rect';
import { registerPhotos, registerPlanes } from './register';
import type { AnalysisMaps, CaptureResult, EngineWarning, GhostAndUniformity, GhostResult } from './result';
import { scalePlane, shiftPlane, subtractPlanes } from './shift-plane';
import { uniformity } from './uniformity';
import { ENGINE_VERSION } from './version';
import type { ExposureTags, Offset, Pattern, Plane, PhotoRaster, PhotoRole, Rect } from './types';

/** Widest downsampled plane: the maps are made from it, and PRODUCT.md caps them at 1600 px. */
export const MAP_MAX_WIDTH = 800;
/** Camera movement beyond this share of the width means the photos do not show the same view. */
export const MAX_SHIFT_SHARE = 0.05;
/** The shortest ghost offset searched, in pixels of the downsampled plane. */
const GHOST_MIN_BLOCKS = 2;

export interface CapturePhoto {
  raster: PhotoRaster;
  exposure?: ExposureTags | null;
  /** Downsampled luminance made by `preparePhoto` (saves a pass when the caller made it early). */
  small?: Plane;
  /** Multiplier from the raster's luminance to the photo's own exposure scale (a merged bracket's; 1 otherwise). */
  gain?: number;
  /** Set on a merged bracket: how it was merged, reported in the reading. */
  bracket?: BracketSummary;
}

/** A role's photo, or several photos of it at different exposures (a bracket). */
export type CaptureRoleInput = CapturePhoto | readonly CapturePhoto[];

/**
 * One photo standing for a role: a single photo as given, a bracket merged into one linear
 * 16-bit plane on its first member's exposure (see `mergeBracket`).
 */
export function resolveRolePhoto(input: CaptureRoleInput, role: PhotoRole): CapturePhoto {
  if (!Array.isArray(input)) return input as CapturePhoto;
  const list = input as readonly CapturePhoto[];
  if (list.length === 0) throw new EngineInputError('file-missing', `the ${role} bracket holds no photo`);
  if (list.length === 1) return list[0] as CapturePhoto;
  try {
    const m = mergeBracket(list.map((p) => ({ raster: p.raster, exposure: p.exposure ?? null })));
    return { raster: m.raster, exposure: m.exposure, gain: m.gain, bracket: m.summary };
  } catch (e) {
    if (e instanceof RangeError) throw new EngineInputError(/size/.test(e.message) ? 'size-mismatch' : 'bad-argument', `the ${role} bracket: ${e.message}`);
    throw e;
  }
}

export interface CaptureInput {
  on: CaptureRoleInput;
  off: CaptureRoleInput;
  ambient?: CaptureRoleInput | null;
  dark?: CaptureRoleInput | null;
  pattern?: Pattern;
  /** Regions in the on photo's pixels; a missing screen is detected. */
  screen?: Rect | null;
  background?: Rect | null;
  /** Ghost position minus screen position; 'none' skips the ghost; missing detects it. */
  ghostOffset?: Offset | 'none' | null;
  /** Camera profile factor k, cd/m² per unit of Y·N²/(t·S). */
  calibration?: number | null;
  onProgress?: (stage: string, fraction: number) => void;
  /**
   * Results of pure steps kept by a previous call on some of the same photos (see `AnalysisMemo`):
   * each is keyed by everything it depends on, so a hit returns what the step would compute.
   */
  memo?: AnalysisMemo | null;
  /**
   * The caller will run again with an ambient photo and the same memo (see `AnalysisMemo`): the off
   * photo's pass then also sums the colour the see-through measurement needs, sparing a second
   * pass over it.
   */
  ambientFollows?: boolean;
}

/**
 * Memo of one capture's pure analysis steps. A caller that decodes photos one by one can run the
 * analysis on the on and off photos while the others still decode, then run it again on the full
 * set with the same memo: registration, detection, the ghost search, the on/off region sums and the
 * maps are then found in it instead of computed twice. Use one memo per capture, never across captures.
 */
export type AnalysisMemo = Map<string, unknown>;

const objectIds = new WeakMap<object, number>();
let nextObjectId = 1;
function idOf(o: object): number {
  let id = objectIds.get(o);
  if (id === undefined) {
    id = nextObjectId++;
    objectIds.set(o, id);
  }
  return id;
}

function cached<T>(memo: AnalysisMemo | null, key: string, compute: () => T): T {
  if (!memo) return compute();
  if (memo.has(key)) return memo.get(key) as T;
  const v = compute();
  memo.set(key, v);
  return v;
}

const rectKey = (r: Rect): string => `${r.x},${r.y},${r.w},${r.h}`;

/** A reading whose roles were bracketed carries how each bracket was merged. */
export type BracketedResult = CaptureResult & { brackets?: Partial<Record<PhotoRole, BracketSummary>> };

export interface CaptureAnalysis {
  result: BracketedResult;
  maps: AnalysisMaps;
}

/** The downsampled luminance plane analyzeCapture needs, so decoding callers can make it as each photo arrives. */
export function preparePhoto(raster: PhotoRaster): Plane {
  return downsampleLuminance(raster, downsampleFactor(raster.width, MAP_MAX_WIDTH));
}

function checkRegion(name: string, r: Rect, width: number, height: number): void {
  if (![r.x, r.y, r.w, r.h].every(Number.isFinite)) throw new EngineInputError('bad-argument', `the ${name} region must be four numbers x,y,w,h`);
  if (![r.x, r.y, r.w, r.h].every(Number.isInteger)) throw new EngineInputError('bad-argument', `the ${name} region must be whole pixels`);
  if (r.w < 1 || r.h < 1) throw new EngineInputError('region-empty', `the ${name} region ${r.x},${r.y},${r.w},${r.h} is empty: width and height must be at least 1 px`);
  if (r.x < 0 || r.y < 0 || r.x + r.w > width || r.y + r.h > height) {
    throw new EngineInputError('region-outside', `the ${name} region ${r.x},${r.y},${r.w},${r.h} lies outside the ${width} × ${height} on photo`);
  }
}

function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

const ROLES_AFTER_ON = ['off', 'ambient', 'dark'] as const;

/** Analyses one capture set (decoded photos in, reading and map planes out), as PRODUCT.md §5 defines. */
export function analyzeCaptureDetailed(input: CaptureInput): CaptureAnalysis {
  const progress = input.onProgress ?? ((): void => undefined);
  const pattern: Pattern = input.pattern ?? 'full';
  if (pattern !== 'full' && pattern !== 'checkerboard') throw new EngineInputError('bad-argument', `unknown pattern "${String(pattern)}": use full or checkerboard`);
  if (input.calibration !== undefined && input.calibration !== null && !(Number.isFinite(input.calibration) && input.calibration > 0)) {
    throw new EngineInputError('bad-argument', 'the calibration factor must be a positive number');
  }
  const photos: Partial<Record<PhotoRole, CapturePhoto>> = { on: resolveRolePhoto(input.on, 'on'), off: resolveRolePhoto(input.off, 'off') };
  if (input.ambient) photos.ambient = resolveRolePhoto(input.ambient, 'ambient');
  if (input.dark) photos.dark = resolveRolePhoto(input.dark, 'dark');
  const onPhoto = photos.on as CapturePhoto;
  const on = onPhoto.raster;
  const { width: W, height: H } = on;
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    assertRaster(p.raster);
    if (p.raster.width !== W || p.raster.height !== H) {
      throw new EngineInputError('size-mismatch', `the ${role} photo is ${p.raster.width} × ${p.raster.height} but the on photo is ${W} × ${H}: use the same camera settings and no cropping`);
    }
  }
  if (input.screen) checkRegion('screen', input.screen, W, H);
  if (input.background) checkRegion('background', input.background, W, H);
  const warnings: EngineWarning[] = [];

  // exposure normalisation onto the on photo's scale (PRODUCT.md §5.3)
  const tags: Partial<Record<PhotoRole, ExposureTags | null>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) tags[role] = p.exposure ?? null;
  const exp = exposureScales<PhotoRole>(tags as Record<PhotoRole, ExposureTags | null>, 'on');
  if (!exp.known) {
    warnings.push({ code: 'exposure-unknown', message: `no exposure time, f-number and ISO in the EXIF of: ${exp.missing.join(', ')}; equal exposure assumed` });
  }
  // a merged bracket's gain folds into its exposure scale; single photos have none, so their scale is untouched
  const scaleOf = (role: PhotoRole): number => {
    const s = (exp.scales as Partial<Record<PhotoRole, number>>)[role] ?? 1;
    const g = photos[role]?.gain;
    return g === undefined ? s : s * g;
  };

  const memo = input.memo ?? null;
  const factor = downsampleFactor(W, MAP_MAX_WIDTH);
  const small: Partial<Record<PhotoRole, Plane>> = {};
  const smallKey: Partial<Record<PhotoRole, string>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    const expected = { w: Math.max(1, Math.floor(W / factor)), h: Math.max(1, Math.floor(H / factor)) };
    const given = p.small && p.small.width === expected.w && p.small.height === expected.h ? p.small : preparePhoto(p.raster);
    smallKey[role] = `${idOf(p.raster)}/${idOf(given)}*${scaleOf(role)}`;
    small[role] = cached(memo, `small:${smallKey[role]}`, () => scalePlane(given, scaleOf(role)));
  }
  progress('registration', 0.1);

  // registration (PRODUCT.md §5.6)
  const registration: Partial<Record<PhotoRole, Offset>> = { on: { dx: 0, dy: 0 } };
  // A merged bracket keeps a display far brighter than the room; registration's log floor (a share
  // of the brightest level) would then flatten the room it locks onto. Capping both planes a little
  // above the off photo's brightest room level gives it back the view a single exposure has.
  const bracketed = Object.values(photos).some((p) => p?.bracket);
  let regCap = Number.POSITIVE_INFINITY;
  if (bracketed) {
    regCap = 4 * percentile(strided((small.off as Plane).data, 100_000), 99);
    if (!(regCap > 0)) regCap = Number.POSITIVE_INFINITY;
  }
  const capped = new Map<PhotoRole, Plane>();
  const regSmall = (role: PhotoRole): Plane => {
    const p = small[role] as Plane;
    if (!bracketed || !Number.isFinite(regCap)) return p;
    let c = capped.get(role);
    if (!c) {
      c = { data: p.data.map((v) => (v > regCap ? regCap : v)), width: p.width, height: p.height };
      capped.set(role, c);
    }
    return c;
  };
  const maxShift = Math.ceil(2 * MAX_SHIFT_SHARE * W) + 2;
  for (const role of ROLES_AFTER_ON) {
    const p = photos[role];
    if (!p) continue;
    let r: Offset;
    if (role === 'dark') {
      // the dark photo shares the display's light with on − off, not the room
      const o = registration.off as Offset;
      const dOn = subtractPlanes(small.on as Plane, shiftPlane(small.off as Plane, Math.round(o.dx / factor), Math.round(o.dy / factor)));
      const rs = registerPlanes(dOn, small.dark as Plane, Math.ceil(maxShift / factor));
      r = { dx: rs.dx * factor, dy: rs.dy * factor };
    } else {
      r = cached(memo, `register:${smallKey.on}:${smallKey[role]}:${factor}:${maxShift}${bracketed ? `:cap${regCap}` : ''}`, () =>
        registerPhotos({
          reference: on,
          moving: p.raster,
          referenceSmall: regSmall('on'),
          movingSmall: regSmall(role),
          factor,
          maxShift,
        }),
      );
    }
    const d = { dx: r.dx, dy: r.dy };
    const dist = Math.hypot(d.dx, d.dy);
    if (dist > MAX_SHIFT_SHARE * W) {
      throw new EngineInputError('camera-moved', `the camera moved ${dist.toFixed(0)} px between the on and ${role} photos (more than 5% of the width): reshoot from a tripod`);
    }
    if (dist > 1) warnings.push({ code: 'shifted', message: `the ${role} photo is shifted by ${d.dx},${d.dy} px against the on photo; aligned` });
    registration[role] = d;
  }
  progress('regions', 0.35);

  const alignedSmall = (role: PhotoRole): Plane => {
    const d = registration[role] as Offset;
    return shiftPlane(small[role] as Plane, Math.round(d.dx / factor), Math.round(d.dy / factor));
  };
  const diffKey = `${smallKey.on}-${smallKey.off}@${rectKey({ x: (registration.off as Offset).dx, y: (registration.off as Offset).dy, w: factor, h: 0 })}`;
  const { offSmall, diffSmall } = cached(memo, `diff:${diffKey}`, () => {
    const o = alignedSmall('off');
    return { offSmall: o, diffSmall: subtractPlanes(small.on as Plane, o) };
  });
  // every step-th value of D, computed once (detection and the low-signal check both use it)
  let diffSigma: number | null = null;
  const sampleSigma = (p: Plane): number => {
    if (p === diffSmall && diffSigma !== null) return diffSigma;
    const data = p.data;
    const step = Math.max(1, Math.floor(data.length / 200_000));
    const s = new Float64Array(Math.ceil(data.length / step));
    for (let i = 0, k = 0; i < data.length; i += step, k++) s[k] = data[i] as number;
    const sigma = robustSigma(s);
    if (p === diffSmall) diffSigma = sigma;
    return sigma;
  };

  // the on and the aligned off photo at full resolution, for putting coarse edges to the pixel
  const edgeOn: EdgeSource = { raster: on, offset: { dx: 0, dy: 0 }, scale: scaleOf('on') };
  const edgeOff: EdgeSource = { raster: (photos.off as CapturePhoto).raster, offset: registration.off as Offset, scale: scaleOf('off') };

  // screen: marked, or detected from D (PRODUCT.md §5.7)
  let screen: Rect;
  let screenSource: 'marked' | 'detected';
  if (input.screen) {
    screen = { ...input.screen };
    screenSource = 'marked';
  } else {
    const found = cached(memo, `detect:${diffKey}`, () => detectScreen(diffSmall, sampleSigma(diffSmall)));
    if (!found) throw new EngineInputError('no-screen-found', 'no display light found between the on and off photos: check the display was on, or mark the screen region');
    const x0 = found.x * factor;
    const y0 = found.y * factor;
    const x1 = Math.min(W, (found.x + found.w) * factor);
    const y1 = Math.min(H, (found.y + found.h) * factor);
    const coarse = { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
    screen = cached(memo, `edges:${diffKey}:${rectKey(coarse)}`, () => refineScreenEdges(coarse, edgeOn, edgeOff, factor));
    screenSource = 'detected';
  }
  if (pattern === 'checkerboard' && (screen.w < 8 || screen.h < 8)) {
    throw new EngineInputError('region-too-small', `the screen ${screen.w} × ${screen.h} px is too small for a 4 × 4 checkerboard: at least 8 × 8 px`);
  }
  const background = input.background ? { ...input.background } : null;

  // ghost offsets: marked, skipped, or searched on the downsampled difference
  // every block the screen touches: blocks straddling its edge are partly lit, and left outside
  // they would form a ring one block wide that the search would take for a ghost close by
  const screenSmall = (): Rect => {
    const x0 = Math.floor(screen.x / factor);
    const y0 = Math.floor(screen.y / factor);
    const x1 = Math.max(x0 + 1, Math.ceil((screen.x + screen.w) / factor));
    const y1 = Math.max(y0 + 1, Math.ceil((screen.y + screen.h) / factor));
    return { x: x0, y: y0, w: Math.min(diffSmall.width, x1) - x0, h: Math.min(diffSmall.height, y1) - y0 };
  };
  type Found = { offset: Offset; source: 'marked' | 'detected'; snr: number | null } | null;
  const findGhost = (d: Plane): Found => {
    if (input.ghostOffset === 'none') return null;
    if (input.ghostOffset) return { offset: { ...input.ghostOffset }, source: 'marked', snr: null };
    const ss = screenSmall();
    if (ss.w < 1 || ss.h < 1) return null;
    // offsets start at two blocks: closer, a copy cannot be told from the edge's own blur
    const c = d === diffSmall ? cached(memo, `ghost:${diffKey}:${rectKey(ss)}:${factor}`, () => searchGhost(d, ss, GHOST_MIN_BLOCKS)) : searchGhost(d, ss, GHOST_MIN_BLOCKS);
    if (!c || c.snr < GHOST_MIN_SNR || c.gain <= 0) return null;
    const coarse = factor === 1 ? { dx: Math.round(c.dx), dy: Math.round(c.dy) } : { dx: Math.round(c.dx * factor), dy: Math.round(c.dy * factor) };
    // on and off at hand: the ghost's own edges put the offset to the pixel
    const offset =
      d === diffSmall && factor > 1
        ? cached(memo, `ghostfine:${diffKey}:${rectKey(screen)}:${coarse.dx},${coarse.dy}`, () => refineGhostOffset(screen, coarse, edgeOn, edgeOff, factor))
        : coarse;
    if (Math.hypot(offset.dx, offset.dy) < 2) return null;
    return { offset, source: 'detected', snr: c.snr };
  };
  if (input.ghostOffset && input.ghostOffset !== 'none') {
    const o = input.ghostOffset;
    if (!Number.isInteger(o.dx) || !Number.isInteger(o.dy) || (o.dx === 0 && o.dy === 0)) {
      throw new EngineInputError('bad-argument', 'the ghost offset must be whole pixels dx,dy, not 0,0');
    }
    if (!intersectRects(translateRect(screen, o.dx, o.dy), { x: 0, y: 0, w: W, h: H })) {
      throw new EngineInputError('region-outside', `the ghost offset ${o.dx},${o.dy} moves the screen outside the image`);
    }
  }
  progress('ghost', 0.5);
  const ghostOnOff = findGhost(diffSmall);
  const darkSmall = photos.dark ? alignedSmall('dark') : null;
  const ghostDark = darkSmall ? findGhost(darkSmall) : null;

  // full resolution: one pass per photo over its raw pixels gathers every rectangle measured
  // (aligned and exposure-normalised), with no full-resolution plane in memory
  const imageRect: Rect = { x: 0, y: 0, w: W, h: H };
  const overlap = background ? intersectRects(screen, background) : null;
  const seeThrough = background ?? screen;
  const uniformityCellsRects = pattern === 'full' && screen.w >= 3 && screen.h >= 3 ? gridCells(screen, 3, 3) : null;
  const checkerCells = pattern === 'checkerboard' ? gridCells(screen, 4, 4, 0.5) : null;
  const requests: Partial<Record<PhotoRole, RectRequest[]>> = {};
  const ask = (role: PhotoRole, rect: Rect, rgb = false): number => {
    const list = (requests[role] ??= []);
    list.push({ rect, rgb });
    return list.length - 1;
  };
  const at: Partial<Record<PhotoRole, { screen: number; background: number; overlap: number; seeThrough: number; cells: number[]; checker: number[] }>> = {};
  for (const role of Object.keys(photos) as PhotoRole[]) {
    const wantCells = uniformityCellsRects !== null && role !== 'ambient';
    at[role] = {
      screen: ask(role, screen),
      background: background ? ask(role, background) : -1,
      overlap: overlap ? ask(role, overlap) : -1,
      seeThrough: (photos.ambient || input.ambientFollows) && (role === 'off' || role === 'ambient') ? ask(role, seeThrough, true) : -1,
      cells: wantCells ? (uniformityCellsRects as Rect[]).map((c) => ask(role, c)) : [],
      checker: checkerCells && role === 'on' ? checkerCells.map((c) => ask(role, c)) : [],
    };
  }
  progress('measure', 0.6);
  const totals: Partial<Record<PhotoRole, RectTotals[]>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    // rectangles a previous call already summed are taken from the memo; the rest share one pass
    const reg = registration[role] as Offset;
    const base = `rect:${idOf(p.raster)}@${reg.dx},${reg.dy}*${scaleOf(role)}:`;
    const list = requests[role] as RectRequest[];
    const keys = list.map((q) => `${base}${rectKey(q.rect)}:${q.rgb ? 'rgb' : 'y'}`);
    const hit = keys.map((key) => memo?.has(key) ?? false);
    const missing = list.filter((_, i) => !hit[i]);
    const fresh = measureRects(p.raster, missing, reg, scaleOf(role));
    let j = 0;
    totals[role] = list.map((_, i) => {
      if (hit[i]) return memo?.get(keys[i] as string) as RectTotals;
      const t = fresh[j++] as RectTotals;
      memo?.set(keys[i] as string, t);
      return t;
    });
  }
  const totalsOf = (role: PhotoRole, k: number): RectTotals => (totals[role] as RectTotals[])[k] as RectTotals;
  const meanAt = (role: PhotoRole, k: number): number => totalsMean(totalsOf(role, k));
  const idx = (role: PhotoRole): { screen: number; background: number; overlap: number; seeThrough: number; cells: number[]; checker: number[] } =>
    at[role] as { screen: number; background: number; overlap: number; seeThrough: number; cells: number[]; checker: number[] };

  // the ghost's band and its two shifted copies, at full resolution (a few strips, not the whole area)
  const bandStrips = (found: NonNullable<Found>, roles: readonly PhotoRole[]): ((j: number, k: number) => BandStrip | null) => {
    const o = found.offset;
    const strips = bandRects(screen, o).map((r) =>
      [0, 1, 2].map((k): BandStrip | null => {
        const s = intersectRects(translateRect(r, -k * o.dx, -k * o.dy), imageRect);
        if (!s) return null;
        const [first, minus] = roles.map((role) => luminanceCrop((photos[role] as CapturePhoto).raster, s, registration[role] as Offset, scaleOf(role)).plane.data);
        // with two photos, D = on − off is formed only where the band needs it
        return { rect: s, data: first as Float32Array, minus };
      }),
    );
    return (j, k) => strips[j]?.[k] ?? null;
  };
  progress('crops', 0.65);

  const lOn = meanAt('on', idx('on').screen);
  const lOff = meanAt('off', idx('off').screen);
  const lAmb = photos.ambient ? meanAt('ambient', idx('ambient').screen) : Number.NaN;
  const lDark = photos.dark ? meanAt('dark', idx('dark').screen) : Number.NaN;
  const acr = lOff > 0 ? contrastRatio(lOn, lOff) : Number.NaN;

  const screenSigma = cached(memo, `sigma:${diffKey}`, () => sampleSigma(diffSmall));
  if (!(lOn - lOff > 3 * screenSigma / Math.sqrt(Math.max(1, (screen.w * screen.h) / (factor * factor))))) {
    warnings.push({ code: 'low-signal', message: 'the screen is barely brighter in the on photo than in the off photo: check the display and the screen region' });
  }

  let mich: number | null = null;
  let ansi: number | null = null;
  let checker: CaptureResult['checkerboard'] = null;
  if (pattern === 'full') {
    mich = finiteOrNull(michelson(lOn, lOff));
  } else {
    // ANSI/IEC checkerboard: each cell over its central 50% × 50%
    const cells = idx('on').checker.map((k) => meanAt('on', k));
    const cb = checkerboardContrast(cells);
    ansi = finiteOrNull(cb.ansiContrast);
    mich = finiteOrNull(cb.michelson);
    checker = { white: cb.white, black: cb.black, whiteParity: cb.whiteParity, separation: finiteOrNull(cb.separation) ?? 0 };
    if (!(cb.separation > 1.2)) warnings.push({ code: 'checkerboard-unclear', message: 'the white and black cells overlap in level: check the pattern is a 4 × 4 checkerboard filling the screen region' });
  }

  const ghostAndUniformity = (roles: readonly PhotoRole[], found: Found): GhostAndUniformity => {
    let ghost: GhostResult | null = null;
    if (found) {
      const regKey = roles.map((r) => `${idOf((photos[r] as CapturePhoto).raster)}@${(registration[r] as Offset).dx},${(registration[r] as Offset).dy}*${scaleOf(r)}`).join('-');
      const m = cached(memo, `band:${regKey}:${rectKey(screen)}:${found.offset.dx},${found.offset.dy}`, () => measureGhostStrips(screen, found.offset, bandStrips(found, roles)));
      if (m && Number.isFinite(m.ratio)) {
        ghost = { ratio: m.ratio, dx: found.offset.dx, dy: found.offset.dy, source: found.source, firstOrder: m.firstOrder, snr: found.snr };
      }
    }
    let u: number | null = null;
    let cells: number[] | null = null;
    if (uniformityCellsRects) {
      const [first, minus] = roles as [PhotoRole, PhotoRole | undefined];
      cells = idx(first).cells.map((k, i) => meanAt(first, k) - (minus ? meanAt(minus, idx(minus).cells[i] as number) : 0));
      if (cells.every(Number.isFinite)) u = finiteOrNull(uniformity(cells).minOverMax);
      else cells = null;
    }
    return { ghost, uniformity: u, uniformityCells: cells };
  };
  progress('ghost-ratio', 0.68);
  const onMinusOff = ghostAndUniformity(['on', 'off'], ghostOnOff);
  const darkVariant = photos.dark ? ghostAndUniformity(['dark'], ghostDark) : null;
  const primary = darkVariant ?? onMinusOff;

  progress('see-through', 0.7);
  // transmission and tint over the background, or the screen when none is marked
  let transmission: number | null = null;
  let tint: CaptureResult['tint'] = null;
  if (photos.ambient) {
    if (!background) warnings.push({ code: 'transmission-over-screen', message: 'no background region marked: transmission and tint are measured over the screen' });
    const tOff = meanAt('off', idx('off').seeThrough);
    const tAmb = meanAt('ambient', idx('ambient').seeThrough);
    transmission = tAmb > 0 ? finiteOrNull(tOff / tAmb) : null;
    const rgbOff = totalsRgbMean(totalsOf('off', idx('off').seeThrough));
    const rgbAmb = totalsRgbMean(totalsOf('ambient', idx('ambient').seeThrough));
    const xyzOff = linearRgbToXyz(rgbOff.r * scaleOf('off'), rgbOff.g * scaleOf('off'), rgbOff.b * scaleOf('off'));
    const xyzAmb = linearRgbToXyz(rgbAmb.r * scaleOf('ambient'), rgbAmb.g * scaleOf('ambient'), rgbAmb.b * scaleOf('ambient'));
    if (xyzOff.y > 0 && xyzAmb.y > 0) {
      const cOff = chromaticity(xyzOff);
      const cAmb = chromaticity(xyzAmb);
      // equal luminance, placed at mid-grey (Y/Yn = 0.18), where CIEDE2000's lightness weighting is neutral
      const k = xyzAmb.y / xyzOff.y;
      const white = { x: (D65_WHITE.x * xyzAmb.y) / 0.18, y: xyzAmb.y / 0.18, z: (D65_WHITE.z * xyzAmb.y) / 0.18 };
      const labOff = xyzToLab({ x: xyzOff.x * k, y: xyzOff.y * k, z: xyzOff.z * k }, white);
      const labAmb = xyzToLab(xyzAmb, white);
      tint = { dx: cOff.x - cAmb.x, dy: cOff.y - cAmb.y, deltaE00: deltaE2000(labOff, labAmb), off: cOff, ambient: cAmb };
    }
  }

  progress('clipping', 0.75);
  // clipping inside the analysed regions (PRODUCT.md §5.5)
  const clippedByPhoto: Partial<Record<PhotoRole, number>> = {};
  let clippedFraction = 0;
  for (const role of Object.keys(photos) as PhotoRole[]) {
    const k = idx(role);
    // union of the regions = sum of each minus their overlap
    const parts: [number, number][] = [[k.screen, 1]];
    if (k.background >= 0) parts.push([k.background, 1]);
    if (k.overlap >= 0) parts.push([k.overlap, -1]);
    let clipped = 0;
    let total = 0;
    for (const [i, sign] of parts) {
      const t = totalsOf(role, i);
      clipped += sign * t.clipped;
      total += sign * t.n;
    }
    const f = total > 0 ? clipped / total : 0;
    clippedByPhoto[role] = f;
    clippedFraction = Math.max(clippedFraction, f);
  }
  if (clippedFraction > 0.001) {
    const worst = (Object.entries(clippedByPhoto) as [PhotoRole, number][]).filter(([, f]) => f > 0.001).map(([r, f]) => `${r} ${(100 * f).toFixed(2)}%`);
    warnings.push({ code: 'clipped', message: `clipped pixels in the analysed regions (${worst.join(', ')}): contrast is underestimated; lower the exposure or bracket` });
  }
  for (const [name, v] of [['on − off', onMinusOff], ['dark', darkVariant]] as const) {
    if (v?.ghost && v.ghost.ratio > 0 && clippedByPhoto.on !== undefined && clippedByPhoto.on > 0.001) {
      warnings.push({ code: 'ghost-band-clipped', message: `the ${name} ghost ratio is measured against a clipped screen and reads too high` });
      break;
    }
  }

  // absolute luminance: a camera profile, or the meter equation as a labelled rough estimate
  let absoluteLuminance: CaptureResult['absoluteLuminance'] = null;
  const eOn = exposureFactor(onPhoto.exposure);
  const onTags = onPhoto.exposure;
  if (input.calibration) {
    if (eOn === null) warnings.push({ code: 'calibration-needs-exposure', message: 'the on photo has no exposure EXIF, so the calibration factor cannot convert to cd/m²' });
    else {
      // camera profile: L = k·Y·N²/(t·S)
      const k = input.calibration / eOn;
      absoluteLuminance = { kind: 'calibrated', on: k * lOn, off: k * lOff, ambient: finiteOrNull(k * lAmb) };
    }
  } else if (eOn !== null && onTags?.exposureTime && onTags.fNumber && onTags.iso) {
    const k = meterLuminance(onTags.exposureTime, onTags.fNumber, onTags.iso) / METERED_TONE;
    absoluteLuminance = { kind: 'rough-estimate', on: k * lOn, off: k * lOff, ambient: finiteOrNull(k * lAmb) };
  }

  progress('maps', 0.85);
  const logContrast = cached(memo, `log-contrast:${diffKey}`, () => {
    const lc = new Float32Array(diffSmall.data.length);
    const onS = (small.on as Plane).data;
    const offS = offSmall.data;
    for (let i = 0, n = lc.length; i < n; i++) {
      const a = onS[i] as number;
      const b = offS[i] as number;
      lc[i] = a > 0 && b > 0 ? Math.log10(a / b) : Number.NaN;
    }
    return lc;
  });
  const histograms: AnalysisMaps['histograms'] = {};
  for (const [role, p] of Object.entries(small) as [PhotoRole, Plane][]) histograms[role] = cached(memo, `histogram:${smallKey[role]}`, () => luminanceHistogram(p.data, 96, -14, 2, Math.max(1, Math.floor(p.data.length / 250_000))));

  const result: BracketedResult = {
    engineVersion: ENGINE_VERSION,
    image: { width: W, height: H },
    pattern,
    registration: {
      off: registration.off as Offset,
      ambient: registration.ambient ?? null,
      dark: registration.dark ?? null,
    },
    screen: { ...screen, source: screenSource },
    background,
    luminance: { on: lOn, off: lOff, ambient: finiteOrNull(lAmb), dark: finiteOrNull(lDark) },
    absoluteLuminance,
    ambientContrastRatio: finiteOrNull(acr),
    michelson: mich,
    ansiContrast: ansi,
    checkerboard: checker,
    uniformity: primary.uniformity,
    uniformityCells: primary.uniformityCells,
    ghost: primary.ghost,
    variants: { onMinusOff, dark: darkVariant },
    transmission,
    tint,
    clippedFraction,
    clippedByPhoto,
    exposure: { known: exp.known, scales: exp.scales },
    warnings,
  };
  const brackets: Partial<Record<PhotoRole, BracketSummary>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) if (p.bracket) brackets[role] = p.bracket;
  // the key appears only for bracketed input, so single-photo readings keep their exact shape
  if (Object.keys(brackets).length > 0) result.brackets = brackets;
  progress('done', 1);
  return {
    result,
    maps: { factor, logContrast: { data: logContrast, width: diffSmall.width, height: diffSmall.height }, difference: diffSmall, histograms },
  };
}

/** Analyses one capture set and returns the reading only. */
export function analyzeCapture(input: CaptureInput): BracketedResult {
  return analyzeCaptureDetailed(input).result;
}
