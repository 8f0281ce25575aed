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

function rowPass(data: Float64Array, fr: FFT, w: number, rows: Iterable<number>, inverse: boolean): void {
  const rowOut = new Float64Array(2 * w);
  for (const y of rows) {
    const off = 2 * w * y;
    const row = data.subarray(off, off + 2 * w);
    if (inverse) fr.inverseTransform(rowOut, row);
    else fr.transform(rowOut, row);
    data.set(rowOut, off);
  }
}

function columnPass(data: Float64Array, fc: FFT, w: number, h: number, inverse: boolean): void {
  const colIn = new Float64Array(2 * h);
  const colOut = new Float64Array(2 * h);
  for (let x = 0; x < w; x++) {
    for (let y = 0, i = 2 * x; y < h; y++, i += 2 * w) {
      colIn[2 * y] = data[i] as number;
      colIn[2 * y + 1] = data[i + 1] as number;
    }
    if (inverse) fc.inverseTransform(colOut, colIn);
    else fc.transform(colOut, colIn);
    for (let y = 0, i = 2 * x; y < h; y++, i += 2 * w) {
      data[i] = colOut[2 * y] as number;
      data[i + 1] = colOut[2 * y + 1] as number;
    }
  }
}

function checkSizes(data: Float64Array, w: number, h: number): void {
  if (data.length !== 2 * w * h) throw new RangeError('complex data must hold 2·w·h values');
  if (nextPow2(w) !== w || nextPow2(h) !== h) throw new RangeError(`fft2d sizes must be powers of two ≥ 4, got ${w} × ${h}`);
}

function range(from: number, to: number): number[] {
  return Array.from({ length: Math.max(0, to - from) }, (_, i) => from + i);
}

/**
 * In-place 2-D discrete Fourier transform of an interleaved complex array (re, im per pixel) of
 * w × h pixels, both powers of two; the inverse includes the 1/(w·h) factor. `rowsWithData`
 * (forward only) says that rows from there on hold zeros, as zero padding does, so their
 * transforms are skipped.
 */
export function fft2d(data: Float64Array, w: number, h: number, inverse = false, rowsWithData = h): void {
  checkSizes(data, w, h);
  if (inverse && rowsWithData !== h) throw new RangeError('rowsWithData applies to the forward transform');
  rowPass(data, fftOf(w), w, range(0, Math.min(h, rowsWithData)), inverse);
  columnPass(data, fftOf(h), w, h, inverse);
}

/**
 * Inverse 2-D transform computing only the output rows listed (columns first, then those rows):
 * enough when only shifts near zero are read. The other rows are left in an intermediate state.
 */
export function inverseFft2dRows(data: Float64Array, w: number, h: number, rows: readonly number[]): void {
  checkSizes(data, w, h);
  columnPass(data, fftOf(h), w, h, true);
  rowPass(data, fftOf(w), w, rows, true);
}

/** The rows holding shifts −reach … reach of an h-row circular result (each once). */
export function shiftRows(h: number, reach: number): number[] {
  if (2 * reach + 1 >= h) return range(0, h);
  return range(-reach, reach + 1).map((d) => (d + h) % h);
}

/**
 * Two real w × h planes, zero-padded to pw × ph, packed as one complex array: `a` as the real part,
 * `b` as the imaginary part, so that one transform serves both.
 */
export function packPair(a: ArrayLike<number>, b: ArrayLike<number>, w: number, h: number, pw: number, ph: number): Float64Array {
  if (a.length !== w * h || b.length !== w * h) throw new RangeError('planes must hold w·h values');
  if (pw < w || ph < h) throw new RangeError('the padded size must hold the plane');
  const out = new Float64Array(2 * pw * ph);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      out[2 * (y * pw + x)] = a[y * w + x] as number;
      out[2 * (y * pw + x) + 1] = b[y * w + x] as number;
    }
  }
  return out;
}

/**
 * From the transform Z = A + iB of a packed pair of real planes (packPair), the cross-power
 * spectrum B·conj(A), using A(k) = (Z(k) + conj Z(−k))/2 and B(k) = (Z(k) − conj Z(−k))/2i.
 */
export function pairCrossPower(z: Float64Array, pw: number, ph: number): Float64Array {
  if (z.length !== 2 * pw * ph) throw new RangeError('complex data must hold 2·pw·ph values');
  const cross = new Float64Array(2 * pw * ph);
  for (let v = 0; v < ph; v++) {
    const nv = v === 0 ? 0 : ph - v;
    for (let u = 0; u < pw; u++) {
      const nu = u === 0 ? 0 : pw - u;
      const k = 2 * (v * pw + u);
      const m = 2 * (nv * pw + nu);
      const zr = z[k] as number;
      const zi = z[k + 1] as number;
      const wr = z[m] as number;
      const wi = z[m + 1] as number;
      // 2A and 2B; the product carries a factor 4, taken out exactly (a power of two)
      const ar = zr + wr;
      const ai = zi - wi;
      const br = zi + wi;
      const bi = wr - zr;
      cross[k] = 0.25 * (br * ar + bi * ai);
      cross[k + 1] = 0.25 * (bi * ar - br * ai);
    }
  }
  return cross;
}

/**
 * Two circular cross-correlations at once, c(o) = Σ_x a(x + o)·b(x) for the pairs (a1, b1) and
 * (a2, b2) of real w × h planes zero-padded to pw × ph: three transforms instead of six (both
 * results are real, so one inverse carries them as real and imaginary parts). Each result is on the
 * padded grid (index o mod size); only the rows of vertical shifts up to `reach` are computed.
 */
export function crossCorrelateTwo(
  first: readonly [ArrayLike<number>, ArrayLike<number>],
  second: readonly [ArrayLike<number>, ArrayLike<number>],
  w: number,
  h: number,
  pw: number,
  ph: number,
  reach: number,
): [Float64Array, Float64Array] {
  const spectra = [first, second].map(([a, b]) => {
    const z = packPair(b, a, w, h, pw, ph);
    fft2d(z, pw, ph, false, h);
    return pairCrossPower(z, pw, ph);
  }) as [Float64Array, Float64Array];
  const [c1, c2] = spectra;
  // C1 + i·C2, transformed back, is c1 + i·c2
  for (let i = 0; i < c1.length; i += 2) {
    const re = (c1[i] as number) - (c2[i + 1] as number);
    const im = (c1[i + 1] as number) + (c2[i] as number);
    c1[i] = re;
    c1[i + 1] = im;
  }
  inverseFft2dRows(c1, pw, ph, shiftRows(ph, reach));
  const r1 = new Float64Array(pw * ph);
  const r2 = new Float64Array(pw * ph);
  for (let i = 0; i < r1.length; i++) {
    r1[i] = c1[2 * i] as number;
    r2[i] = c1[2 * i + 1] as number;
  }
  return [r1, r2];
}
