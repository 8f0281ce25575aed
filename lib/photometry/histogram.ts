export interface LuminanceHistogram {
  /** Bin edges are 2^log2Min … 2^log2Max in equal log2 steps. */
  log2Min: number;
  log2Max: number;
  counts: number[];
  /** Values at or below zero (no light, or noise below black). */
  nonPositive: number;
  /** Values above the top edge. */
  above: number;
  total: number;
  /** Every step-th pixel was counted. */
  step: number;
}

/** Histogram of luminance in log2 bins (stops), the scale on which exposure and contrast read naturally. */
export function luminanceHistogram(values: ArrayLike<number>, bins = 96, log2Min = -14, log2Max = 2, step = 1): LuminanceHistogram {
  if (!Number.isInteger(step) || step < 1) throw new RangeError('step must be a positive integer');
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError('bins must be a positive integer');
  if (!(log2Max > log2Min)) throw new RangeError('log2Max must exceed log2Min');
  const counts = new Array<number>(bins).fill(0);
  let nonPositive = 0;
  let above = 0;
  let total = 0;
  const scale = bins / (log2Max - log2Min);
  for (let i = 0; i < values.length; i += step) {
    const v = values[i] as number;
    if (v !== v) continue;
    total++;
    if (v <= 0) { nonPositive++; continue; }
    const k = Math.floor((Math.log2(v) - log2Min) * scale);
    if (k >= bins) above++;
    else { const b = Math.max(0, k); counts[b] = (counts[b] as number) + 1; }
  }
  return { log2Min, log2Max, counts, nonPositive, above, total, step };
}
