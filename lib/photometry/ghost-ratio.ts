/**
 * Ghost ratio g from the band mean B and the means S1, S2 of the band shifted back by one and two
 * offsets, solving B = g·S1 − g²·S2 (the smaller root; the first-order B/S1 when S2 is negligible).
 */
export function solveGhostRatio(b: number, s1: number, s2: number): number {
  for (const [name, v] of [['b', b], ['s1', s1], ['s2', s2]] as const) {
    if (!Number.isFinite(v)) throw new RangeError(`${name} must be finite, got ${v}`);
  }
  if (s1 <= 0) throw new RangeError('s1 must be positive: the screen carries no display light');
  // B = g·S1 − g²·S2 ⇒ S2·g² − S1·g + B = 0; the root that tends to B/S1 as S2 → 0
  const disc = s1 * s1 - 4 * s2 * b;
  if (Math.abs(s2 * b) < 1e-15 * s1 * s1 || disc < 0) return b / s1;
  // written as 2B/(S1 + √disc) to avoid cancellation for small g
  return (2 * b) / (s1 + Math.sqrt(disc));
}
