export interface Uniformity {
  /** min/max of the cell means; 1.0 is perfect. */
  minOverMax: number;
  maxOverMin: number;
  /** (max − min)/mean. */
  spread: number;
  cells: number[];
}

/** Uniformity figures of a grid of cell means (the 3 × 3 grid gives nine). */
export function uniformity(cells: ArrayLike<number>): Uniformity {
  if (cells.length === 0) throw new RangeError('uniformity needs at least one cell');
  const values = Array.from(cells);
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError('uniformity cells must be finite');
  const min = Math.min(...values);
  const max = Math.max(...values);
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  // panel data sheets: uniformity = min/max over the 9 points (alternatively max/min, or (max − min)/mean)
  return {
    minOverMax: max === 0 ? Number.NaN : min / max,
    maxOverMin: min === 0 ? Infinity : max / min,
    spread: mean === 0 ? Number.NaN : (max - min) / mean,
    cells: values,
  };
}
