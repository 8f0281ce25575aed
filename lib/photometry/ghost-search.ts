import { crossCorrelateTwo, nextPow2 } from './fft2d';
import { growRect } from './band';
import { strided } from './detect-screen';
import { robustSigma } from './percentile';
import type { Offset, Plane, Rect } from './types';

export interface GhostCandidate {
  /** Ghost position minus screen position, in the plane's pixels (sub-pixel). */
  dx: number;
  dy: number;
  /** One-sided gain: the least-squares gain of the displaced copy over the band minus the same over the mirrored band. */
  gain: number;
  /** The least-squares gain over the mirrored band (offset −d): what blur and stray light put on every side alike. */
  mirrorGain: number;
  /** One-sided gain over its standard error under the plane's noise (a ranking figure; the reading's SNR is measured at full resolution). */
  snr: number;
}

/** Ghosts weaker than this many standard errors are indistinguishable from noise over thousands of trial offsets. */
export const GHOST_MIN_SNR = 8;

const COARSE_SIZE = 192;

function inside(r: Rect, x: number, y: number): boolean {
  return x >= r.x && x < r.x + r.w && y >= r.y && y < r.y + r.h;
}

/** Σ D(x)·D(x − o) and Σ D(x − o)² over the band (the screen moved by o, minus the screen grown by the zone). */
function bandFit(d: Plane, inner: Rect, outer: Rect, o: Offset): { c: number; e: number; n: number } {
  const { width: W, height: H, data } = d;
  let c = 0;
  let e = 0;
  let n = 0;
  const y0 = Math.max(0, inner.y + o.dy);
  const y1 = Math.min(H, inner.y + inner.h + o.dy);
  const x0 = Math.max(0, inner.x + o.dx);
  const x1 = Math.min(W, inner.x + inner.w + o.dx);
  for (let y = y0; y < y1; y++) {
    const rowIn = y >= outer.y && y < outer.y + outer.h;
    for (let x = x0; x < x1; x++) {
      if (rowIn && x >= outer.x && x < outer.x + outer.w) {
        x = outer.x + outer.w - 1;
        continue;
      }
      const t = data[y * W + x] as number;
      const m = data[(y - o.dy) * W + x - o.dx] as number;
      if (t === t && m === m) {
        c += t * m;
        e += m * m;
        n++;
      }
    }
  }
  return { c, e, n };
}

/**
 * The strongest one-sided displaced copy of the screen's content outside the screen (docs/method.md
 * §5.8). Blur and a defocused image spread the screen's light on every side of its edge alike; a
 * ghost is light displaced one way. So for each offset d the least-squares gain of the displaced
 * screen over the band at d is compared with the same over the mirrored band at −d, and only the
 * excess counts. The band leaves out the edge zone, `zone` pixels around the screen (its own
 * spill). Offsets reach a quarter of the screen's size beyond the zone on each axis.
 */
export function searchGhost(d: Plane, screen: Rect, zone: number): GhostCandidate | null {
  if (!Number.isInteger(zone) || zone < 0) throw new RangeError('the edge zone must be a whole number of pixels ≥ 0');
  const { width: W, height: H } = d;
  // the template is the whole screen: a copy displaced past the true offset then leaves ghost-free
  // pixels in the band and loses gain (a template shrunk by the zone would not)
  const inner = { ...screen };
  const outer = growRect(screen, zone) as Rect;
  const rx = zone + Math.ceil(screen.w / 4);
  const ry = zone + Math.ceil(screen.h / 4);
  const dom: Rect = { x: Math.max(0, screen.x - rx), y: Math.max(0, screen.y - ry), w: 0, h: 0 };
  dom.w = Math.min(W, screen.x + screen.w + rx) - dom.x;
  dom.h = Math.min(H, screen.y + screen.h + ry) - dom.y;
  if (dom.w < 1 || dom.h < 1) return null;

  // noise of D outside the screen and its zone, where only the ghost and noise remain
  const outsideAll = new Float64Array(dom.w * dom.h);
  let nOut = 0;
  for (let y = dom.y; y < dom.y + dom.h; y++) {
    for (let x = dom.x; x < dom.x + dom.w; x++) {
      if (!inside(outer, x, y)) outsideAll[nOut++] = d.data[y * W + x] as number;
    }
  }
  if (nOut === 0) return null;
  const sigma = Math.max(robustSigma(strided(outsideAll.subarray(0, nOut), 100_000)), 1e-12);

  // coarse search on a box-reduced copy of the domain by FFT cross-correlation: T is D outside the
  // screen grown by the zone, M is D inside the screen shrunk by it
  const q = Math.max(1, Math.ceil(Math.max(dom.w, dom.h) / COARSE_SIZE));
  const cw = Math.max(1, Math.floor(dom.w / q));
  const ch = Math.max(1, Math.floor(dom.h / q));
  const mVals = new Float64Array(cw * ch);
  const tVals = new Float64Array(cw * ch);
  const m2Vals = new Float64Array(cw * ch);
  const wVals = new Float64Array(cw * ch);
  for (let j = 0; j < ch; j++) {
    for (let i = 0; i < cw; i++) {
      let sum = 0;
      let n = 0;
      let inM = 0;
      let inT = 0;
      for (let yy = 0; yy < q; yy++) {
        for (let xx = 0; xx < q; xx++) {
          const x = dom.x + i * q + xx;
          const y = dom.y + j * q + yy;
          const v = d.data[y * W + x] as number;
          if (v === v) { sum += v; n++; }
          if (inside(inner, x, y)) inM++;
          else if (!inside(outer, x, y)) inT++;
        }
      }
      const mean = n > 0 ? sum / n : 0;
      const k = j * cw + i;
      if (2 * inM > q * q) {
        mVals[k] = mean;
        m2Vals[k] = mean * mean;
      } else if (2 * inT > q * q && n > 0) {
        tVals[k] = mean;
        wVals[k] = 1;
      }
    }
  }
  const crx = Math.max(1, Math.ceil(rx / q));
  const cry = Math.max(1, Math.ceil(ry / q));
  const pw = nextPow2(cw + crx);
  const ph = nextPow2(ch + cry);
  const [c, e] = crossCorrelateTwo([tVals, mVals], [wVals, m2Vals], cw, ch, pw, ph, cry);
  const idx = (ox: number, oy: number): number => ((oy + ph) % ph) * pw + ((ox + pw) % pw);
  const coarseScore = (ox: number, oy: number): number => {
    const e1 = e[idx(ox, oy)] as number;
    const e2 = e[idx(-ox, -oy)] as number;
    // the mirrored band must hold data for the comparison to mean anything
    if (!(e1 > 1e-30) || !(e2 > 0.25 * e1)) return 0;
    const g = (c[idx(ox, oy)] as number) / e1 - (c[idx(-ox, -oy)] as number) / e2;
    return g > 0 ? g * Math.sqrt(e1) : 0;
  };
  let best = 0;
  let bo: Offset | null = null;
  for (let oy = -cry; oy <= cry; oy++) {
    for (let ox = -crx; ox <= crx; ox++) {
      const s = coarseScore(ox, oy);
      if (s > best) { best = s; bo = { dx: ox, dy: oy }; }
    }
  }
  if (bo === null) return null;

  // refine on the plane itself around the coarse peak, with the exact band
  const fits = new Map<string, { c: number; e: number; n: number }>();
  const fitAt = (o: Offset): { c: number; e: number; n: number } => {
    const key = `${o.dx},${o.dy}`;
    let f = fits.get(key);
    if (!f) {
      f = Math.abs(o.dx) > rx || Math.abs(o.dy) > ry ? { c: 0, e: 0, n: 0 } : bandFit(d, inner, outer, o);
      fits.set(key, f);
    }
    return f;
  };
  const oneSided = (o: Offset): { g: number; gm: number; e: number } | null => {
    const f = fitAt(o);
    const m = fitAt({ dx: -o.dx, dy: -o.dy });
    if (!(f.e > 1e-30) || !(m.e > 0.25 * f.e)) return null;
    const gm = m.c / m.e;
    return { g: f.c / f.e - gm, gm, e: f.e };
  };
  const at = (o: Offset): number => {
    const s = oneSided(o);
    return s && s.g > 0 ? s.g * Math.sqrt(s.e) : 0;
  };
  let fine: Offset = { dx: bo.dx * q, dy: bo.dy * q };
  let fineScore = -1;
  const reach = q + 1;
  for (let oy = fine.dy - reach; oy <= fine.dy + reach; oy++) {
    for (let ox = fine.dx - reach; ox <= fine.dx + reach; ox++) {
      const s = at({ dx: ox, dy: oy });
      if (s > fineScore) { fineScore = s; fine = { dx: ox, dy: oy }; }
    }
  }
  // climb in case the coarse peak was off by more than a block
  for (let iter = 0; iter < 50; iter++) {
    let moved = false;
    for (const [ox, oy] of [[1, 0], [-1, 0], [0, 1], [0, -1]] as const) {
      const cand = { dx: fine.dx + ox, dy: fine.dy + oy };
      const s = at(cand);
      if (s > fineScore) { fineScore = s; fine = cand; moved = true; }
    }
    if (!moved) break;
  }
  const fit = oneSided(fine);
  if (!fit || !(fit.g > 0)) return null;
  // a parabola through the neighbours puts the peak between pixels when the plane is downsampled
  const sub = (m: number, z: number, p: number): number => {
    const den = m - 2 * z + p;
    return den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (m - p)) / den)) : 0;
  };
  const sx = sub(at({ dx: fine.dx - 1, dy: fine.dy }), fineScore, at({ dx: fine.dx + 1, dy: fine.dy }));
  const sy = sub(at({ dx: fine.dx, dy: fine.dy - 1 }), fineScore, at({ dx: fine.dx, dy: fine.dy + 1 }));
  return { dx: fine.dx + sx, dy: fine.dy + sy, gain: fit.g, mirrorGain: fit.gm, snr: (fit.g * Math.sqrt(fit.e)) / sigma };
}
