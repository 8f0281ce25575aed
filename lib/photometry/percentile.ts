function finiteCopy(values: ArrayLike<number>): Float64Array {
  const out = new Float64Array(values.length);
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    if (Number.isFinite(v)) out[n++] = v;
  }
  return out.subarray(0, n);
}

// Hoare's selection: the k-th smallest in expected linear time, so percentiles of megapixel planes stay cheap.
function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    const pivot = a[(lo + hi) >> 1] as number;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((a[i] as number) < pivot) i++;
      while ((a[j] as number) > pivot) j--;
      if (i <= j) {
        const t = a[i] as number;
        a[i] = a[j] as number;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k] as number;
}

/** The p-th percentile of finite values held in `a`, which it reorders. */
function percentileInPlace(a: Float64Array, p: number): number {
  if (a.length === 0) return Number.NaN;
  const pos = (p / 100) * (a.length - 1);
  const lo = Math.floor(pos);
  const vLo = select(a, lo);
  if (pos === lo) return vLo;
  // after selection everything above index lo is ≥ vLo: the next order statistic is their minimum
  let vHi = Infinity;
  for (let i = lo + 1; i < a.length; i++) if ((a[i] as number) < vHi) vHi = a[i] as number;
  return vLo + (vHi - vLo) * (pos - lo);
}

/** The p-th percentile (0..100) of the finite values, interpolating linearly between order statistics. */
export function percentile(values: ArrayLike<number>, p: number): number {
  if (!(p >= 0 && p <= 100)) throw new RangeError(`percentile must be in 0..100, got ${p}`);
  return percentileInPlace(finiteCopy(values), p);
}

/** Median absolute deviation scaled to a normal SD (×1.4826), ignoring non-finite values. */
export function robustSigma(values: ArrayLike<number>): number {
  // one copy serves both medians: the order statistics do not depend on the order they are kept in
  const a = finiteCopy(values);
  const med = percentileInPlace(a, 50);
  if (Number.isNaN(med)) return Number.NaN;
  for (let i = 0; i < a.length; i++) a[i] = Math.abs((a[i] as number) - med);
  // 1.4826 = 1/Φ⁻¹(3/4): the MAD of a normal distribution is 0.6745 σ
  return 1.4826 * percentileInPlace(a, 50);
}
