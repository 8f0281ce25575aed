/**
 * Reference measurements for the realism suite, written apart from the engine: they decode the photos
 * with sharp directly, linearise with the IEC 61966-2-1 sRGB decoding written out here, and measure
 * with the known registration and regions of the rendered scene. A scene whose reference lands within
 * the tolerance is passable: when the engine misses there, the engine is wrong, not the scene.
 */
import sharp from 'sharp';
import { differenceCiede2000 } from 'culori';
import type { Rect } from '../../../lib/photometry/types';
import { cells } from '../../fixtures/capture-generator';

export interface LinearPhoto {
  width: number;
  height: number;
  r: Float32Array | null;
  g: Float32Array | null;
  b: Float32Array | null;
  y: Float32Array;
}

export type Sampler = (x: number, y: number) => number;
export type PointMap = (x: number, y: number) => [number, number];

// IEC 61966-2-1: threshold 0.04045, linear segment /12.92, power 2.4 with offset 0.055
const SRGB_LUT = Float64Array.from({ length: 256 }, (_, k) => {
  const v = k / 255;
  return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
});

/** Decodes with EXIF orientation applied; values linear relative to full scale, Y with BT.709 weights. */
export async function decodeLinear(buf: Buffer, linear16: boolean, keepRgb = true): Promise<LinearPhoto> {
  const img = sharp(buf, { limitInputPixels: false }).rotate();
  const { data, info } = linear16 ? await img.toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true }) : await img.raw().toBuffer({ resolveWithObject: true });
  if (info.channels !== 3) throw new Error(`expected 3 channels, got ${info.channels}`);
  const n = info.width * info.height;
  const src = linear16 ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2) : data;
  const lin = linear16 ? (v: number): number => v / 65535 : (v: number): number => SRGB_LUT[v] as number;
  const y = new Float32Array(n);
  const r = keepRgb ? new Float32Array(n) : null;
  const g = keepRgb ? new Float32Array(n) : null;
  const b = keepRgb ? new Float32Array(n) : null;
  for (let i = 0; i < n; i++) {
    const R = lin(src[3 * i] as number);
    const G = lin(src[3 * i + 1] as number);
    const B = lin(src[3 * i + 2] as number);
    y[i] = 0.2126 * R + 0.7152 * G + 0.0722 * B;
    if (r && g && b) {
      r[i] = R;
      g[i] = G;
      b[i] = B;
    }
  }
  return { width: info.width, height: info.height, r, g, b, y };
}

/** Bilinear sample of a plane at index coordinates (pixel i at coordinate i), edges clamped. */
export function bilinear(p: Float32Array, w: number, h: number, x: number, y: number): number {
  const cx = Math.min(Math.max(x, 0), w - 1);
  const cy = Math.min(Math.max(y, 0), h - 1);
  const ix = Math.min(Math.floor(cx), w - 2);
  const iy = Math.min(Math.floor(cy), h - 2);
  const fx = cx - ix;
  const fy = cy - iy;
  const i = iy * w + ix;
  return (1 - fy) * ((1 - fx) * (p[i] as number) + fx * (p[i + 1] as number)) + fy * ((1 - fx) * (p[i + w] as number) + fx * (p[i + w + 1] as number));
}

/** A photo's plane seen in world (on photo) coordinates through its known pose, on the on photo's exposure scale. */
export function sampler(photo: LinearPhoto, plane: 'y' | 'r' | 'g' | 'b', map: PointMap, exposureScale: number): Sampler {
  const p = photo[plane] as Float32Array;
  return (x, y) => {
    const [u, v] = map(x, y);
    return bilinear(p, photo.width, photo.height, u, v) / exposureScale;
  };
}

export function meanOver(s: Sampler, r: Rect): number {
  let sum = 0;
  for (let y = r.y; y < r.y + r.h; y++) for (let x = r.x; x < r.x + r.w; x++) sum += s(x, y);
  return sum / (r.w * r.h);
}

export function uniformityOf(d: Sampler, screen: Rect): number {
  const m = cells(screen, 3, 1).map((c) => meanOver(d, c));
  return Math.min(...m) / Math.max(...m);
}

export function checkerboardOf(on: Sampler, screen: Rect): { ansi: number; michelson: number } {
  const m = cells(screen, 4, 0.5).map((c) => meanOver(on, c));
  const even = m.filter((_, k) => ((k % 4) + Math.floor(k / 4)) % 2 === 0).reduce((a, b) => a + b, 0) / 8;
  const odd = m.filter((_, k) => ((k % 4) + Math.floor(k / 4)) % 2 === 1).reduce((a, b) => a + b, 0) / 8;
  const lw = Math.max(even, odd);
  const lb = Math.min(even, odd);
  return { ansi: lw / lb, michelson: (lw - lb) / (lw + lb) };
}

/**
 * Ghost ratio at a known offset from the display's light D: B over the band's inner part (the
 * displaced screen shrunk by `edge`, less the screen grown by `edge`, so neither edge's blur reaches
 * it), S1 and S2 over the same pixels moved back by one and two offsets; g solves B = g·S1 − g²·S2.
 */
export function ghostRatioAt(d: Sampler, screen: Rect, dx: number, dy: number, edge: number): { ratio: number; pixels: number } {
  let b = 0;
  let s1 = 0;
  let s2 = 0;
  let n = 0;
  const gx0 = screen.x + dx + edge;
  const gx1 = screen.x + screen.w + dx - edge;
  const gy0 = screen.y + dy + edge;
  const gy1 = screen.y + screen.h + dy - edge;
  for (let y = Math.ceil(gy0); y < gy1; y++) {
    for (let x = Math.ceil(gx0); x < gx1; x++) {
      const nearScreen = x >= screen.x - edge && x < screen.x + screen.w + edge && y >= screen.y - edge && y < screen.y + screen.h + edge;
      if (nearScreen) continue;
      b += d(x, y);
      s1 += d(x - dx, y - dy);
      s2 += d(x - 2 * dx, y - 2 * dy);
      n++;
    }
  }
  if (n === 0) return { ratio: Number.NaN, pixels: 0 };
  b /= n;
  s1 /= n;
  s2 /= n;
  const disc = s1 * s1 - 4 * s2 * b;
  return { ratio: disc >= 0 && Math.abs(s2 * b) > 1e-15 ? (2 * b) / (s1 + Math.sqrt(disc)) : b / s1, pixels: n };
}

/**
 * Shift of `moving` against `reference` over a patch, by exhaustive zero-mean normalised
 * cross-correlation over whole pixels and a parabola through the peak's neighbours on each axis.
 */
export function shiftByCorrelation(reference: Sampler, moving: Sampler, patch: Rect, range: number): { dx: number; dy: number; peak: number } {
  const a: number[] = [];
  for (let y = patch.y; y < patch.y + patch.h; y++) for (let x = patch.x; x < patch.x + patch.w; x++) a.push(reference(x, y));
  const ma = a.reduce((s, v) => s + v, 0) / a.length;
  const va = Math.sqrt(a.reduce((s, v) => s + (v - ma) * (v - ma), 0));
  const size = 2 * range + 1;
  const score = new Float64Array(size * size);
  for (let sy = -range; sy <= range; sy++) {
    for (let sx = -range; sx <= range; sx++) {
      const bvals: number[] = [];
      for (let y = patch.y; y < patch.y + patch.h; y++) for (let x = patch.x; x < patch.x + patch.w; x++) bvals.push(moving(x + sx, y + sy));
      const mb = bvals.reduce((s, v) => s + v, 0) / bvals.length;
      let num = 0;
      let vb = 0;
      for (let i = 0; i < a.length; i++) {
        num += ((a[i] as number) - ma) * ((bvals[i] as number) - mb);
        vb += ((bvals[i] as number) - mb) ** 2;
      }
      score[(sy + range) * size + sx + range] = num / (va * Math.sqrt(vb));
    }
  }
  let best = 0;
  for (let i = 1; i < score.length; i++) if ((score[i] as number) > (score[best] as number)) best = i;
  const bx = best % size;
  const by = Math.floor(best / size);
  const at = (x: number, y: number): number => score[y * size + x] as number;
  const vertex = (l: number, c: number, r: number): number => {
    const den = l - 2 * c + r;
    return den < 0 ? (0.5 * (l - r)) / den : 0;
  };
  const fx = bx > 0 && bx < size - 1 ? vertex(at(bx - 1, by), at(bx, by), at(bx + 1, by)) : 0;
  const fy = by > 0 && by < size - 1 ? vertex(at(bx, by - 1), at(bx, by), at(bx, by + 1)) : 0;
  return { dx: bx - range + fx, dy: by - range + fy, peak: score[best] as number };
}

/** Tint between off and ambient over a region from mean linear RGB: Δxy and ΔE00 at equal luminance. */
export function tintOf(off: [number, number, number], amb: [number, number, number]): { dx: number; dy: number; deltaE00: number } {
  // sRGB (IEC 61966-2-1) linear RGB → XYZ, D65
  const xyz = ([r, g, b]: [number, number, number]): [number, number, number] => [0.4124 * r + 0.3576 * g + 0.1805 * b, 0.2126 * r + 0.7152 * g + 0.0722 * b, 0.0193 * r + 0.1192 * g + 0.9505 * b];
  const xo = xyz(off);
  const xa = xyz(amb);
  const ch = (v: [number, number, number]): [number, number] => [v[0] / (v[0] + v[1] + v[2]), v[1] / (v[0] + v[1] + v[2])];
  const co = ch(xo);
  const ca = ch(xa);
  const k = xa[1] / xo[1];
  const white: [number, number, number] = [(0.95047 * xa[1]) / 0.18, xa[1] / 0.18, (1.08883 * xa[1]) / 0.18];
  const f = (t: number): number => (t > (6 / 29) ** 3 ? Math.cbrt(t) : t / (3 * (6 / 29) ** 2) + 4 / 29);
  const lab = (v: [number, number, number]): { mode: 'lab65'; l: number; a: number; b: number } => {
    const fx = f(v[0] / white[0]);
    const fy = f(v[1] / white[1]);
    const fz = f(v[2] / white[2]);
    return { mode: 'lab65', l: 116 * fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz) };
  };
  const de = differenceCiede2000()(lab([xo[0] * k, xo[1] * k, xo[2] * k]), lab(xa));
  return { dx: co[0] - ca[0], dy: co[1] - ca[1], deltaE00: de };
}

/**
 * The ghost's offset read from its own outer edges, apart from the scene's numbers: along the strip
 * right of the screen (and the strip below it) the mean profile of D falls from the ghost's plateau to
 * nothing; a symmetric blur puts its half-height crossing on the edge. `approx` only places the strips.
 */
export function ghostOffsetFromEdges(d: Sampler, screen: Rect, approx: { dx: number; dy: number }, edge: number): { dx: number; dy: number } {
  const crossing = (profile: (t: number) => number, from: number, to: number): number => {
    const plateau = profile(from);
    const floor = profile(to);
    const half = (plateau + floor) / 2;
    let prev = plateau;
    for (let t = from + 1; t <= to; t++) {
      const v = profile(t);
      if (v <= half) return t - 1 + (prev - half) / (prev - v);
      prev = v;
    }
    return Number.NaN;
  };
  const avg = (n0: number, n1: number, f: (k: number) => number): number => {
    let s = 0;
    let n = 0;
    for (let k = Math.ceil(n0); k < n1; k++) {
      s += f(k);
      n++;
    }
    return s / n;
  };
  const sign = (v: number): number => (v < 0 ? -1 : 1);
  // columns: rows shared by the ghost and clear of the screen's corners; the ghost's far edge in x
  const y0 = Math.max(screen.y, screen.y + approx.dy) + edge;
  const y1 = Math.min(screen.y + screen.h, screen.y + screen.h + approx.dy) - edge;
  const farX = approx.dx > 0 ? screen.x + screen.w + approx.dx : screen.x + approx.dx;
  const sx = sign(approx.dx);
  const reachX = Math.round(Math.min(2 * edge, Math.abs(approx.dx) - edge));
  const xEdge = crossing((t) => avg(y0, y1, (y) => d(farX + sx * t, y)), -reachX, Math.round(2 * edge));
  const x0 = Math.max(screen.x, screen.x + approx.dx) + edge;
  const x1 = Math.min(screen.x + screen.w, screen.x + screen.w + approx.dx) - edge;
  const farY = approx.dy > 0 ? screen.y + screen.h + approx.dy : screen.y + approx.dy;
  const sy = sign(approx.dy);
  const reachY = Math.round(Math.min(2 * edge, Math.abs(approx.dy) - edge));
  const yEdge = crossing((t) => avg(x0, x1, (x) => d(x, farY + sy * t)), -reachY, Math.round(2 * edge));
  // samples sit at pixel centres (index i stands for [i, i + 1)), so an edge at C crosses half height at C − ½
  return { dx: approx.dx + sx * xEdge + 0.5, dy: approx.dy + sy * yEdge + 0.5 };
}
