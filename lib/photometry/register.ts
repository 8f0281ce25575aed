import { luminanceCrop } from './crop';
import { boxDownsample } from './downsample';
import { logGradient } from './gradient';
import { phaseCorrelate } from './phase-correlation';
import type { Offset, Plane, PhotoRaster, Rect } from './types';

export interface RegistrationInput {
  reference: PhotoRaster;
  moving: PhotoRaster;
  /** Downsampled luminance of both photos, made with `factor`. */
  referenceSmall: Plane;
  movingSmall: Plane;
  factor: number;
  /** Largest shift to look for, in full-resolution pixels. */
  maxShift: number;
}

// small enough that the frame plus a 10% search reach fits a 256-point transform
const COARSE_SIZE = 200;
const FINE_SIZE = 256;

function fillNaN(p: Plane): Plane {
  let sum = 0;
  let n = 0;
  for (const v of p.data) if (v === v) { sum += v; n++; }
  const mean = n > 0 ? sum / n : 0;
  const data = p.data.map((v) => (v === v ? v : mean));
  return { data, width: p.width, height: p.height };
}

// where both photos have texture: the window for the full-resolution step, in coarse pixels
function texturedWindow(ga: Plane, gb: Plane, shift: Offset, size: number): { x: number; y: number } {
  const { width: w, height: h } = ga;
  const s = Math.min(size, w, h);
  const common = new Float64Array((w + 1) * (h + 1));
  for (let y = 0; y < h; y++) {
    let row = 0;
    for (let x = 0; x < w; x++) {
      const xb = x + shift.dx;
      const yb = y + shift.dy;
      const vb = xb >= 0 && xb < w && yb >= 0 && yb < h ? (gb.data[yb * w + xb] as number) : 0;
      row += Math.min(ga.data[y * w + x] as number, vb);
      common[(y + 1) * (w + 1) + x + 1] = (common[y * (w + 1) + x + 1] as number) + row;
    }
  }
  let best = -1;
  let bx = 0;
  let by = 0;
  for (let y = 0; y + s <= h; y++) {
    for (let x = 0; x + s <= w; x++) {
      const e =
        (common[(y + s) * (w + 1) + x + s] as number) - (common[y * (w + 1) + x + s] as number) -
        (common[(y + s) * (w + 1) + x] as number) + (common[y * (w + 1) + x] as number);
      if (e > best) { best = e; bx = x; by = y; }
    }
  }
  return { x: bx, y: by };
}

/**
 * Integer translation of `moving` against `reference` (feature in moving minus feature in reference):
 * phase correlation of log-gradient images, first on the whole downsampled frame, then at full
 * resolution on the window where both photos share the most texture.
 */
export function registerPhotos(input: RegistrationInput): Offset & { peak: number } {
  const { reference, moving, referenceSmall, movingSmall, factor } = input;
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('photos must have the same size');
  if (referenceSmall.width !== movingSmall.width || referenceSmall.height !== movingSmall.height) throw new RangeError('downsampled planes differ in size');
  const r = Math.max(1, Math.ceil(Math.max(referenceSmall.width, referenceSmall.height) / COARSE_SIZE));
  const scale = r * factor;
  const ga = logGradient(boxDownsample(referenceSmall, r));
  const gb = logGradient(boxDownsample(movingSmall, r));
  const coarseMax = Math.max(1, Math.ceil(input.maxShift / scale) + 1);
  const coarse = phaseCorrelate(ga, gb, Math.min(coarseMax, ga.width, ga.height));
  const d0: Offset = { dx: coarse.dx * scale, dy: coarse.dy * scale };
  if (scale === 1) return coarse;

  // the window plus the search reach fits one power-of-two transform
  const fineSize = Math.min(FINE_SIZE - (scale + 2), reference.width, reference.height);
  const win = texturedWindow(ga, gb, coarse, Math.max(1, Math.round(fineSize / scale)));
  const rect: Rect = {
    x: Math.min(reference.width - fineSize, win.x * scale),
    y: Math.min(reference.height - fineSize, win.y * scale),
    w: fineSize,
    h: fineSize,
  };
  const fa = logGradient(fillNaN(luminanceCrop(reference, rect, { dx: 0, dy: 0 }, 1).plane));
  const fb = logGradient(fillNaN(luminanceCrop(moving, rect, d0, 1).plane));
  const fine = phaseCorrelate(fa, fb, Math.min(scale + 2, fineSize - 1));
  return { dx: d0.dx + fine.dx, dy: d0.dy + fine.dy, peak: fine.peak };
}
