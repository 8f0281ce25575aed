/**
 * What each optics reading adds to an analysis (docs/method.md §5.10–5.12), timed on the bench's own
 * decoded photos: the display colour and the field of view as the analysis runs them on every capture,
 * and the slanted-edge sharpness on the same off photo with the slanted-edge pattern put on its
 * screen (the stages before them are run once, untimed). Medians of several runs after a warm-up.
 */
import { decodePhoto } from '../lib/image';
import { renderPattern } from '../lib/patterns';
import { decodeSrgb, encodeSrgb } from '../lib/patterns/srgb';
import { alignAndLocate } from '../lib/photometry/stages/align';
import { normalise } from '../lib/photometry/stages/normalise';
import { measureDisplayColour, measureGeometry, measureSharpness } from '../lib/photometry/stages/optics';
import type { EngineWarning } from '../lib/photometry/result';
import type { CapturePhoto } from '../lib/photometry/stages/normalise';

export interface OpticsCosts {
  colourMs: number;
  geometryMs: number;
  sharpnessMs: number;
  /** MTF50 of the bench's slanted-edge screen, to show the timed run measured something. */
  sharpnessMtf50: number | null;
}

function medianMs(f: () => unknown, runs: number): number {
  for (let i = 0; i < 2; i++) f();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    f();
    t.push(performance.now() - s);
  }
  t.sort((a, b) => a - b);
  return Math.round((t[Math.floor(t.length / 2)] as number) * 10) / 10;
}

export async function opticsCosts(onBytes: Uint8Array, offBytes: Uint8Array, runs = 7): Promise<OpticsCosts> {
  const [on, off] = await Promise.all([decodePhoto(onBytes), decodePhoto(offBytes)]);
  const photo = (d: typeof on): CapturePhoto => ({ raster: d.raster, exposure: d.exposure });
  const n = normalise({ on: photo(on), off: photo(off) }, null);
  const a = alignAndLocate(n, { ghostOffset: 'none' }, null);
  const colourMs = medianMs(() => measureDisplayColour(n, a, 'full', {}, () => 0), runs);
  const geometryMs = medianMs(() => measureGeometry(n, a.screen, { degreesPerPixel: 0.01 }), runs);

  // the off photo with the slanted-edge pattern's light added on its screen (in linear light, at
  // half of full scale, then encoded again), one pattern pixel per camera pixel
  const r = off.raster;
  if (r.bitDepth !== 8 || r.encoding !== 'srgb') throw new Error('the bench photos are 8-bit sRGB JPEGs');
  const s = a.screen;
  const pattern = renderPattern('slanted-edge', s.w, s.h);
  const data = r.data.slice();
  const toLinear = Float64Array.from({ length: 256 }, (_, c) => decodeSrgb(c / 255));
  for (let y = 0; y < s.h; y++) {
    for (let x = 0; x < s.w; x++) {
      const light = 0.5 * (toLinear[pattern.data[(y * s.w + x) * 3] as number] as number);
      const i = ((s.y + y) * r.width + s.x + x) * r.channels;
      for (let c = 0; c < r.channels; c++) data[i + c] = Math.min(255, Math.round(255 * encodeSrgb((toLinear[data[i + c] as number] as number) + light)));
    }
  }
  const edgeOn: CapturePhoto = { raster: { ...r, data }, exposure: off.exposure };
  const n2 = normalise({ on: edgeOn, off: photo(off), pattern: 'slanted-edge' }, null);
  const a2 = alignAndLocate(n2, { screen: s, ghostOffset: 'none' }, null);
  let mtf50: number | null = null;
  const sharpnessMs = medianMs(() => {
    const warnings: EngineWarning[] = [];
    mtf50 = measureSharpness(n2, a2, 0.01, warnings)?.mtf50 ?? null;
  }, runs);
  return { colourMs, geometryMs, sharpnessMs, sharpnessMtf50: mtf50 };
}
