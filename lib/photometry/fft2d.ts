import FFT from 'fft.js';

const cache = new Map<number, FFT>();

function fftOf(size: number): FFT {
  let f = cache.get(size);
  if (!f) {
    f = new FFT(size);
    cache.set(size, f);
  }
  return f;
}

/** Smallest power of two ≥ n (at least 4, the radix-4 transform's minimum). */
export function nextPow2(n: number): number {
  let p = 4;
  while (p < n) p *= 2;
  return p;
}

/**
 * In-place 2-D discrete Fourier transform of an interleaved complex array (re, im per pixel) of
 * w × h pixels, both powers of two; the inverse includes the 1/(w·h) factor.
 */
export function fft2d(data: Float64Array, w: number, h: number, inverse = false): void {
  if (data.length !== 2 * w * h) throw new RangeError('complex data must hold 2·w·h values');
  if (nextPow2(w) !== w || nextPow2(h) !== h) throw new RangeError(`fft2d sizes must be powers of two ≥ 4, got ${w} × ${h}`);
  const fr = fftOf(w);
  const fc = fftOf(h);
  const rowIn = new Float64Array(2 * w);
  const rowOut = new Float64Array(2 * w);
  for (let y = 0; y < h; y++) {
    const off = 2 * w * y;
    rowIn.set(data.subarray(off, off + 2 * w));
    if (inverse) fr.inverseTransform(rowOut, rowIn);
    else fr.transform(rowOut, rowIn);
    data.set(rowOut, off);
  }
  const colIn = new Float64Array(2 * h);
  const colOut = new Float64Array(2 * h);
  for (let x = 0; x < w; x++) {
    for (let y = 0; y < h; y++) {
      colIn[2 * y] = data[2 * (y * w + x)] as number;
      colIn[2 * y + 1] = data[2 * (y * w + x) + 1] as number;
    }
    if (inverse) fc.inverseTransform(colOut, colIn);
    else fc.transform(colOut, colIn);
    for (let y = 0; y < h; y++) {
      data[2 * (y * w + x)] = colOut[2 * y] as number;
      data[2 * (y * w + x) + 1] = colOut[2 * y + 1] as number;
    }
  }
}

/** Packs a real w × h plane into a zero-padded complex array of size pw × ph. */
export function toComplex(values: ArrayLike<number>, w: number, h: number, pw: number, ph: number): Float64Array {
  const out = new Float64Array(2 * pw * ph);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) out[2 * (y * pw + x)] = values[y * w + x] as number;
  }
  return out;
}

/**
 * Circular cross-correlation c(o) = Σ_x a(x + o)·b(x) of two padded complex spectra' sources,
 * returned as the real part on the padded grid (index o mod size).
 */
export function crossCorrelate(a: Float64Array, b: Float64Array, pw: number, ph: number): Float64Array {
  const fa = a.slice();
  const fb = b.slice();
  fft2d(fa, pw, ph);
  fft2d(fb, pw, ph);
  multiplyConj(fa, fb);
  fft2d(fa, pw, ph, true);
  const out = new Float64Array(pw * ph);
  for (let i = 0; i < out.length; i++) out[i] = fa[2 * i] as number;
  return out;
}

/** a ← a·conj(b), element-wise on interleaved complex arrays. */
export function multiplyConj(a: Float64Array, b: Float64Array): void {
  for (let i = 0; i < a.length; i += 2) {
    const ar = a[i] as number;
    const ai = a[i + 1] as number;
    const br = b[i] as number;
    const bi = b[i + 1] as number;
    a[i] = ar * br + ai * bi;
    a[i + 1] = ai * br - ar * bi;
  }
}
