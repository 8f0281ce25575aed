function finite(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new RangeError(`${name} must be finite, got ${v}`);
}

/** Michelson contrast of two luminances; 0 when both are zero. */
export function michelson(lMax: number, lMin: number): number {
  finite('lMax', lMax);
  finite('lMin', lMin);
  const sum = lMax + lMin;
  // Michelson: C = (Lmax − Lmin)/(Lmax + Lmin)
  return sum === 0 ? 0 : (lMax - lMin) / sum;
}

/** Contrast ratio L1/L2 (Infinity when L2 is zero and L1 positive). */
export function contrastRatio(l1: number, l2: number): number {
  finite('l1', l1);
  finite('l2', l2);
  // ratio CR = Lmax/Lmin; see-through CR = (L_display + L_background)/L_background = L_on/L_off
  if (l2 === 0) return l1 === 0 ? Number.NaN : Infinity;
  return l1 / l2;
}

/** Weber contrast (L − Lb)/Lb. */
export function weber(l: number, lb: number): number {
  finite('l', l);
  finite('lb', lb);
  // Weber: C = (L − Lb)/Lb
  return (l - lb) / lb;
}
