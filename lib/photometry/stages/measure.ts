import { checkerboardContrast } from '../checkerboard';
import { deltaE2000 } from '../ciede2000';
import { chromaticity, linearRgbToXyz, xyzToLab, D65_WHITE } from '../color';
import { contrastRatio, michelson } from '../contrast';
import { exposureFactor } from '../exposure';
import { meterLuminance, METERED_TONE } from '../meter';
import { roundedOffsetIn, type Motion } from '../motion';
import { gridCells, intersectRects } from '../rect';
import { measureRects, totalsMean, totalsRgbMean, type RectRequest, type RectTotals } from '../region-pass';
import type { CaptureResult, EngineWarning } from '../result';
import type { Pattern, PhotoRole, Rect } from '../types';
import { idOf, type AnalysisMemo } from './memo';
import type { CapturePhoto, Normalised } from './normalise';

/** The rectangles measured in each photo, by name. */
export interface Regions {
  screen: Rect;
  background: Rect | null;
  overlap: Rect | null;
  seeThrough: Rect;
  /** 3 × 3 grid of the screen (pattern full), or null. */
  cells: Rect[] | null;
  /** 4 × 4 checkerboard cells over their central 50% (pattern checkerboard), or null. */
  checker: Rect[] | null;
}

/** The rectangles of docs/method.md §5.8 for a screen and an optional background. */
export function regionsOf(screen: Rect, background: Rect | null, pattern: Pattern): Regions {
  return {
    screen,
    background,
    overlap: background ? intersectRects(screen, background) : null,
    seeThrough: background ?? screen,
    cells: pattern === 'full' && screen.w >= 3 && screen.h >= 3 ? gridCells(screen, 3, 3) : null,
    checker: pattern === 'checkerboard' ? gridCells(screen, 4, 4, 0.5) : null,
  };
}

type Index = { screen: number; background: number; overlap: number; seeThrough: number; cells: number[]; checker: number[] };

/** Each photo's sums over the rectangles it needs. */
export interface RegionTotals {
  totals: Partial<Record<PhotoRole, RectTotals[]>>;
  index: Partial<Record<PhotoRole, Index>>;
}

/**
 * One pass per photo over its raw pixels gathers every rectangle measured (aligned and
 * exposure-normalised), with no full-resolution plane in memory. A photo that turned a little is
 * read at each rectangle's own whole-pixel shift (its motion at the rectangle's centre): a turn
 * about the rectangle's centre changes its mean only along its border.
 */
export function measureRegions(n: Normalised, motion: Partial<Record<PhotoRole, Motion>>, regions: Regions, opts: { ambientFollows: boolean }, memo: AnalysisMemo | null): RegionTotals {
  const requests: Partial<Record<PhotoRole, RectRequest[]>> = {};
  const ask = (role: PhotoRole, rect: Rect, rgb = false): number => {
    const list = (requests[role] ??= []);
    list.push({ rect, rgb });
    return list.length - 1;
  };
  const index: Partial<Record<PhotoRole, Index>> = {};
  for (const role of n.roles) {
    const wantCells = regions.cells !== null && role !== 'ambient';
    index[role] = {
      screen: ask(role, regions.screen),
      background: regions.background ? ask(role, regions.background) : -1,
      overlap: regions.overlap ? ask(role, regions.overlap) : -1,
      seeThrough: (n.photos.ambient || opts.ambientFollows) && (role === 'off' || role === 'ambient') ? ask(role, regions.seeThrough, true) : -1,
      cells: wantCells ? (regions.cells as Rect[]).map((c) => ask(role, c)) : [],
      checker: regions.checker && role === 'on' ? regions.checker.map((c) => ask(role, c)) : [],
    };
  }
  const totals: Partial<Record<PhotoRole, RectTotals[]>> = {};
  for (const role of n.roles) {
    const p = n.photos[role] as CapturePhoto;
    const m = motion[role];
    const list = requests[role] as RectRequest[];
    const offsets = list.map((q) => (m ? roundedOffsetIn(m, q.rect) : { dx: 0, dy: 0 }));
    const keys = list.map((q, i) => `rect:${idOf(p.raster)}@${(offsets[i] as { dx: number }).dx},${(offsets[i] as { dy: number }).dy}*${n.scale[role]}:${q.rect.x},${q.rect.y},${q.rect.w},${q.rect.h}:${q.rgb ? 'rgb' : 'y'}`);
    const out: (RectTotals | undefined)[] = keys.map((k) => memo?.get(k) as RectTotals | undefined);
    // rectangles read at the same shift share one pass
    const groups = new Map<string, number[]>();
    for (let i = 0; i < list.length; i++) {
      if (out[i]) continue;
      const o = offsets[i] as { dx: number; dy: number };
      const g = `${o.dx},${o.dy}`;
      const members = groups.get(g) ?? [];
      members.push(i);
      groups.set(g, members);
    }
    for (const members of groups.values()) {
      const fresh = measureRects(p.raster, members.map((i) => list[i] as RectRequest), offsets[members[0] as number] as { dx: number; dy: number }, n.scale[role] as number);
      members.forEach((i, j) => {
        out[i] = fresh[j] as RectTotals;
        memo?.set(keys[i] as string, out[i]);
      });
    }
    totals[role] = out as RectTotals[];
  }
  return { totals, index };
}

/** Mean luminance of a named rectangle in a role's photo. */
export function meanOf(t: RegionTotals, role: PhotoRole, k: number): number {
  return totalsMean(((t.totals[role] as RectTotals[])[k]) as RectTotals);
}

export function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

export interface Levels {
  lOn: number;
  lOff: number;
  lAmb: number;
  lDark: number;
  acr: number | null;
  michelson: number | null;
  ansi: number | null;
  checker: CaptureResult['checkerboard'];
}

/** Luminance over the screen and the contrast figures of docs/method.md §5.8. */
export function contrastFigures(n: Normalised, t: RegionTotals, pattern: Pattern, warnings: EngineWarning[]): Levels {
  const idx = t.index;
  const lOn = meanOf(t, 'on', (idx.on as Index).screen);
  const lOff = meanOf(t, 'off', (idx.off as Index).screen);
  const lAmb = n.photos.ambient ? meanOf(t, 'ambient', (idx.ambient as Index).screen) : Number.NaN;
  const lDark = n.photos.dark ? meanOf(t, 'dark', (idx.dark as Index).screen) : Number.NaN;
  // a screen lit all over (full, checkerboard) gives the ambient contrast ratio; the slanted-edge square
  // and the orientation marker darken part of it, so their on/off ratio is not the display's contrast
  const acr = lOff > 0 && (pattern === 'full' || pattern === 'checkerboard') ? contrastRatio(lOn, lOff) : Number.NaN;
  let mich: number | null = null;
  let ansi: number | null = null;
  let checker: CaptureResult['checkerboard'] = null;
  if (pattern === 'full') {
    mich = finiteOrNull(michelson(lOn, lOff));
  } else if (pattern === 'checkerboard') {
    // ANSI/IEC checkerboard: each cell over its central 50% × 50%
    const cells = (idx.on as Index).checker.map((k) => meanOf(t, 'on', k));
    const cb = checkerboardContrast(cells);
    ansi = finiteOrNull(cb.ansiContrast);
    mich = finiteOrNull(cb.michelson);
    checker = { white: cb.white, black: cb.black, whiteParity: cb.whiteParity, separation: finiteOrNull(cb.separation) ?? 0 };
    if (!(cb.separation > 1.2)) warnings.push({ code: 'checkerboard-unclear', message: 'the white and black cells overlap in level: check the pattern is a 4 × 4 checkerboard filling the screen region' });
  }
  return { lOn, lOff, lAmb, lDark, acr: finiteOrNull(acr), michelson: mich, ansi, checker };
}

/** Nine cell means of D (on − off, or the dark photo alone) over the screen's 3 × 3 grid, or null. */
export function uniformityCells(t: RegionTotals, roles: readonly PhotoRole[]): number[] | null {
  const [first, minus] = roles as [PhotoRole, PhotoRole | undefined];
  const fi = t.index[first] as Index;
  if (fi.cells.length === 0) return null;
  const cells = fi.cells.map((k, i) => meanOf(t, first, k) - (minus ? meanOf(t, minus, (t.index[minus] as Index).cells[i] as number) : 0));
  return cells.every(Number.isFinite) ? cells : null;
}

/** Mean luminance of the off and ambient photos over the see-through region (null without an ambient photo). */
export function seeThroughMeans(n: Normalised, t: RegionTotals): { off: number; ambient: number } | null {
  if (!n.photos.ambient) return null;
  const io = t.index.off as Index;
  const ia = t.index.ambient as Index;
  if (io.seeThrough < 0 || ia.seeThrough < 0) return null;
  return { off: meanOf(t, 'off', io.seeThrough), ambient: meanOf(t, 'ambient', ia.seeThrough) };
}

/** Transmission and tint over the background (or the screen), docs/method.md §5.8. */
export function seeThrough(n: Normalised, t: RegionTotals, warnings: EngineWarning[], backgroundMarked: boolean): { transmission: number | null; tint: CaptureResult['tint'] } {
  if (!n.photos.ambient) return { transmission: null, tint: null };
  if (!backgroundMarked) warnings.push({ code: 'transmission-over-screen', message: 'no background region marked: transmission and tint are measured over the screen' });
  const io = t.index.off as Index;
  const ia = t.index.ambient as Index;
  const tOff = meanOf(t, 'off', io.seeThrough);
  const tAmb = meanOf(t, 'ambient', ia.seeThrough);
  const transmission = tAmb > 0 ? finiteOrNull(tOff / tAmb) : null;
  const sOff = n.scale.off as number;
  const sAmb = n.scale.ambient as number;
  const rgbOff = totalsRgbMean((t.totals.off as RectTotals[])[io.seeThrough] as RectTotals);
  const rgbAmb = totalsRgbMean((t.totals.ambient as RectTotals[])[ia.seeThrough] as RectTotals);
  const xyzOff = linearRgbToXyz(rgbOff.r * sOff, rgbOff.g * sOff, rgbOff.b * sOff);
  const xyzAmb = linearRgbToXyz(rgbAmb.r * sAmb, rgbAmb.g * sAmb, rgbAmb.b * sAmb);
  let tint: CaptureResult['tint'] = null;
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
  return { transmission, tint };
}

/** Share of clipped pixels inside the analysed regions of each photo (docs/method.md §5.5). */
export function clipping(n: Normalised, t: RegionTotals): { byPhoto: Partial<Record<PhotoRole, number>>; worst: number } {
  const byPhoto: Partial<Record<PhotoRole, number>> = {};
  let worst = 0;
  for (const role of n.roles) {
    const k = t.index[role] as Index;
    const list = t.totals[role] as RectTotals[];
    // union of the regions = sum of each minus their overlap
    const parts: [number, number][] = [[k.screen, 1]];
    if (k.background >= 0) parts.push([k.background, 1]);
    if (k.overlap >= 0) parts.push([k.overlap, -1]);
    let clipped = 0;
    let total = 0;
    for (const [i, sign] of parts) {
      const tt = list[i] as RectTotals;
      clipped += sign * tt.clipped;
      total += sign * tt.n;
    }
    const f = total > 0 ? clipped / total : 0;
    byPhoto[role] = f;
    worst = Math.max(worst, f);
  }
  return { byPhoto, worst };
}

/** cd/m² from a camera profile, or the meter equation as a labelled rough estimate (docs/method.md §5.4). */
export function absoluteLuminance(n: Normalised, levels: Levels, calibration: number | null | undefined, warnings: EngineWarning[]): CaptureResult['absoluteLuminance'] {
  const onPhoto = n.photos.on as CapturePhoto;
  const eOn = exposureFactor(onPhoto.exposure);
  const onTags = onPhoto.exposure;
  if (calibration) {
    if (eOn === null) {
      warnings.push({ code: 'calibration-needs-exposure', message: 'the on photo has no exposure EXIF, so the calibration factor cannot convert to cd/m²' });
      return null;
    }
    // camera profile: L = k·Y·N²/(t·S)
    const k = calibration / eOn;
    return { kind: 'calibrated', on: k * levels.lOn, off: k * levels.lOff, ambient: finiteOrNull(k * levels.lAmb) };
  }
  if (eOn !== null && onTags?.exposureTime && onTags.fNumber && onTags.iso) {
    const k = meterLuminance(onTags.exposureTime, onTags.fNumber, onTags.iso) / METERED_TONE;
    return { kind: 'rough-estimate', on: k * levels.lOn, off: k * levels.lOff, ambient: finiteOrNull(k * levels.lAmb) };
  }
  return null;
}
