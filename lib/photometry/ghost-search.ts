import { crossCorrelateTwo, nextPow2 } from './fft2d';
import { strided } from './detect-screen';
import { robustSigma } from './percentile';
import type { Offset, Plane, Rect } from './types';

export interface GhostCandidate {
  /** Ghost position minus screen position, in the plane's pixels (sub-pixel). */
  dx: number;
  dy: number;
  /** Least-squares gain of the displaced copy over the band (a first guess of the ratio). */
  gain: number;
  /** Fit amplitude over its standard error under the plane's noise. */
  snr: number;
}

/** Ghosts weaker than this many standard errors are indistinguishable from noise over thousands of trial offsets. */
export const GHOST_MIN_SNR = 8;

const COARSE_SIZE = 192;

function valueAt(p: Plane, x: number, y: number): number {
  if (x < 0 || y < 0 || x >= p.width || y >= p.height) return Number.NaN;
  return p.data[y * p.width + x] as number;
}

// least-squares fit of band = g·(screen displaced by o): returns Σ D(x+o)·D(x) and Σ D(x)² over the band
function bandFit(d: Plane, screen: Rect, o: Offset): { c: number; e: number; n: number } {
  // the band's pixels in forEachBandPixel's order, with the plane read directly
  const { width: W, height: H, data } = d;
  const { x: sx, y: sy, w, h } = screen;
  const { dx, dy } = o;
  let c = 0;
  let e = 0;
  let n = 0;
  const span = (y: number, xa: number, xb: number): void => {
    const ym = y - dy;
    if (y < 0 || y >= H || ym < 0 || ym >= H) return;
    const a = Math.max(xa, 0, dx);
    const b = Math.min(xb, W, W + dx);
    for (let x = a, i = y * W + a, j = ym * W + a - dx; x < b; x++, i++, j++) {
      const t = data[i] as number;
      const m = data[j] as number;
      if (t === t && m === m) {
        c += t * m;
        e += m * m;
        n++;
      }
    }
  };
  for (let y = sy + dy; y < sy + dy + h; y++) {
    if (y < sy || y >= sy + h) span(y, sx + dx, sx + dx + w);
    else if (dx > 0) span(y, Math.max(sx + w, sx + dx), sx + dx + w);
    else if (dx < 0) span(y, sx + dx, Math.min(sx, sx + dx + w));
  }
  return { c, e, n };
}

function score(fit: { c: number; e: number }): number {
  return fit.c > 0 && fit.e > 0 ? (fit.c * fit.c) / fit.e : 0;
}

/**
 * The strongest displaced copy of the screen's content outside the screen, searched over offsets
 * up to a quarter of the screen's size with |offset| ≥ minOffset. Scores are the energy a
 * least-squares gain explains, C²/E, which peaks at the true offset even for a uniform screen
 * (a plain correlation would tie every shorter offset in the same direction).
 */
export function searchGhost(d: Plane, screen: Rect, minOffset: number): GhostCandidate | null {
  const { width: W, height: H } = d;
  const rx = Math.floor(screen.w / 4);
  const ry = Math.floor(screen.h / 4);
  if (rx < 1 && ry < 1) return null;
  const dom: Rect = {
    x: Math.max(0, screen.x - rx),
    y: Math.max(0, screen.y - ry),
    w: 0,
    h: 0,
  };
  dom.w = Math.min(W, screen.x + screen.w + rx) - dom.x;
  dom.h = Math.min(H, screen.y + screen.h + ry) - dom.y;

  // noise of D outside the screen, where only the ghost and noise remain
  const outsideAll = new Float64Array(dom.w * dom.h);
  let nOut = 0;
  for (let y = dom.y; y < dom.y + dom.h; y++) {
    for (let x = dom.x; x < dom.x + dom.w; x++) {
      const inside = x >= screen.x && x < screen.x + screen.w && y >= screen.y && y < screen.y + screen.h;
      if (!inside) outsideAll[nOut++] = valueAt(d, x, y);
    }
  }
  if (nOut === 0) return null;
  const outside = outsideAll.subarray(0, nOut);
  const sigma = Math.max(robustSigma(strided(outside, 100_000)), 1e-12);

  // coarse search on a box-reduced copy of the domain by FFT cross-correlation
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
      let inS = 0;
      for (let yy = 0; yy < q; yy++) {
        for (let xx = 0; xx < q; xx++) {
          const x = dom.x + i * q + xx;
          const y = dom.y + j * q + yy;
          const v = valueAt(d, x, y);
          if (v === v) { sum += v; n++; }
          if (x >= screen.x && x < screen.x + screen.w && y >= screen.y && y < screen.y + screen.h) inS++;
        }
      }
      const mean = n > 0 ? sum / n : 0;
      const k = j * cw + i;
      if (2 * inS >= q * q) {
        mVals[k] = mean;
        m2Vals[k] = mean * mean;
      } else {
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
  let best = 0;
  let bo: Offset | null = null;
  const minCoarse = minOffset / q;
  for (let oy = -cry; oy <= cry; oy++) {
    for (let ox = -crx; ox <= crx; ox++) {
      if (Math.hypot(ox, oy) < Math.max(1, minCoarse)) continue;
      const idx = ((oy + ph) % ph) * pw + ((ox + pw) % pw);
      const s = score({ c: c[idx] as number, e: e[idx] as number });
      if (s > best) { best = s; bo = { dx: ox, dy: oy }; }
    }
  }
  if (bo === null) return null;

  // refine on the plane itself around the coarse peak
  const scores = new Map<string, number>();
  const at = (o: Offset): number => {
    const key = `${o.dx},${o.dy}`;
    let s = scores.get(key);
    if (s === undefined) {
      s = Math.abs(o.dx) > rx || Math.abs(o.dy) > ry || Math.hypot(o.dx, o.dy) < minOffset ? 0 : score(bandFit(d, screen, o));
      scores.set(key, s);
    }
    return s;
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
  const fit = bandFit(d, screen, fine);
  if (!(fit.e > 0) || fit.c <= 0) return null;
  // a parabola through the neighbours puts the peak between pixels when the plane is downsampled
  const sub = (m: number, z: number, p: number): number => {
    const den = m - 2 * z + p;
    return den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (m - p)) / den)) : 0;
  };
  const sx = sub(at({ dx: fine.dx - 1, dy: fine.dy }), fineScore, at({ dx: fine.dx + 1, dy: fine.dy }));
  const sy = sub(at({ dx: fine.dx, dy: fine.dy - 1 }), fineScore, at({ dx: fine.dx, dy: fine.dy + 1 }));
  return {
    dx: fine.dx + sx,
    dy: fine.dy + sy,
    gain: fit.c / fit.e,
    snr: fit.c / (sigma * Math.sqrt(fit.e)),
  };
}
