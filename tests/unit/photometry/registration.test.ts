import { describe, expect, it } from 'vitest';
import { phaseCorrelate, registerPhotos, downsampleLuminance, fft2d, detectScreen } from '../../../lib/photometry';
import type { PhotoRaster } from '../../../lib/photometry';
import { seededRandom } from '../../fixtures/capture-generator';

function texture(w: number, h: number, seed: number, shift = { dx: 0, dy: 0 }): PhotoRaster {
  const big = 64;
  const rand = seededRandom(seed);
  const W = w + 2 * big;
  const H = h + 2 * big;
  const tex = new Uint8Array(W * H);
  for (let i = 0; i < tex.length; i++) tex[i] = 60 + Math.floor(rand() * 20);
  for (let k = 0; k < (W * H) / 300; k++) {
    const x0 = Math.floor(rand() * (W - 20));
    const y0 = Math.floor(rand() * (H - 20));
    const v = Math.floor(rand() * 255);
    for (let y = y0; y < y0 + 4 + (k % 16); y++) for (let x = x0; x < x0 + 4 + (k % 13); x++) tex[y * W + x] = v;
  }
  const data = new Uint8Array(w * h * 3);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const v = tex[(y - shift.dy + big) * W + (x - shift.dx + big)] as number;
      data.set([v, v, v], 3 * (y * w + x));
    }
  }
  return { data, width: w, height: h, channels: 3, bitDepth: 8, encoding: 'srgb' };
}

describe('phase correlation and registration (docs/method.md §5.6)', () => {
  it('the 2-D FFT round-trips', () => {
    const a = new Float64Array(2 * 16 * 8).map((_, i) => (i % 2 === 0 ? Math.sin(i) : 0));
    const b = a.slice();
    fft2d(b, 16, 8);
    fft2d(b, 16, 8, true);
    for (let i = 0; i < a.length; i++) expect(b[i]).toBeCloseTo(a[i] as number, 10);
    expect(() => fft2d(new Float64Array(2 * 12 * 8), 12, 8)).toThrow(RangeError);
  });

  it.each([
    [0, 0],
    [5, -3],
    [-17, 11],
    [30, 25],
  ])('finds a shift of %i, %i px exactly on a 640 × 480 photo', (dx, dy) => {
    const ref = texture(640, 480, 3);
    const mov = texture(640, 480, 3, { dx, dy });
    const r = registerPhotos({ reference: ref, moving: mov, referenceSmall: downsampleLuminance(ref, 1), movingSmall: downsampleLuminance(mov, 1), factor: 1, maxShift: 70 });
    // sub-pixel estimates: a whole-pixel shift comes back within a few hundredths
    expect(Math.abs(r.dx - dx)).toBeLessThan(0.05);
    expect(Math.abs(r.dy - dy)).toBeLessThan(0.05);
    expect(Math.abs(r.angle)).toBeLessThan(1e-4);
  });

  it('works through a downsampled plane (factor 3, odd size)', () => {
    const ref = texture(901, 601, 9);
    const mov = texture(901, 601, 9, { dx: -8, dy: 5 });
    const r = registerPhotos({ reference: ref, moving: mov, referenceSmall: downsampleLuminance(ref, 3), movingSmall: downsampleLuminance(mov, 3), factor: 3, maxShift: 60 });
    expect(Math.abs(r.dx + 8)).toBeLessThan(0.05);
    expect(Math.abs(r.dy - 5)).toBeLessThan(0.05);
  });

  it('phaseCorrelate refuses planes of different sizes', () => {
    expect(() => phaseCorrelate({ data: new Float32Array(4), width: 2, height: 2 }, { data: new Float32Array(6), width: 3, height: 2 }, 1)).toThrow(RangeError);
  });
});

describe('screen detection (docs/method.md §5.7)', () => {
  it('boxes the bright display and ignores a faint ghost and specks', () => {
    const w = 200;
    const h = 150;
    const d = new Float32Array(w * h);
    for (let y = 40; y < 100; y++) for (let x = 50; x < 150; x++) d[y * w + x] = 0.5;
    for (let y = 48; y < 108; y++) for (let x = 58; x < 158; x++) d[y * w + x] = (d[y * w + x] as number) + 0.02;
    d[5 * w + 5] = 0.6;
    expect(detectScreen({ data: d, width: w, height: h })).toEqual({ x: 50, y: 40, w: 100, h: 60 });
  });

  it('returns null when there is no display light', () => {
    expect(detectScreen({ data: new Float32Array(100), width: 10, height: 10 })).toBeNull();
  });
});
