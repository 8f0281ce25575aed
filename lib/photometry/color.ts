export interface Xyz {
  x: number;
  y: number;
  z: number;
}

export interface Lab {
  l: number;
  a: number;
  b: number;
}

/** D65 white chromaticity (ITU-R BT.709): x = 0.3127, y = 0.3290. */
export const D65_XY = Object.freeze({ x: 0.3127, y: 0.329 });

/** D65 white as XYZ with Y = 1, derived from its chromaticity so that neutral greys have a* = b* = 0. */
export const D65_WHITE: Readonly<Xyz> = Object.freeze({
  x: D65_XY.x / D65_XY.y,
  y: 1,
  z: (1 - D65_XY.x - D65_XY.y) / D65_XY.y,
});

/** CIE XYZ (D65) of linear sRGB values. */
export function linearRgbToXyz(r: number, g: number, b: number): Xyz {
  // IEC 61966-2-1 sRGB → XYZ matrix, 4 decimals as printed in the standard
  return {
    x: 0.4124 * r + 0.3576 * g + 0.1805 * b,
    y: 0.2126 * r + 0.7152 * g + 0.0722 * b,
    z: 0.0193 * r + 0.1192 * g + 0.9505 * b,
  };
}

/** CIE 1931 chromaticity (x, y) of an XYZ colour; NaN for black. */
export function chromaticity(c: Xyz): { x: number; y: number } {
  const sum = c.x + c.y + c.z;
  // CIE 1931: x = X/(X+Y+Z), y = Y/(X+Y+Z)
  return sum === 0 ? { x: Number.NaN, y: Number.NaN } : { x: c.x / sum, y: c.y / sum };
}

/** CIE 1976 L*a*b* of XYZ relative to a white (D65 with Y = 1 unless given). */
export function xyzToLab(c: Xyz, white: Xyz = D65_WHITE): Lab {
  for (const v of [c.x, c.y, c.z, white.x, white.y, white.z]) if (!Number.isFinite(v)) throw new RangeError('XYZ must be finite');
  if (white.x <= 0 || white.y <= 0 || white.z <= 0) throw new RangeError('white must be positive');
  const e = 216 / 24389;
  const k = 24389 / 27;
  // CIE 15: f(t) = t^(1/3) above (6/29)³, else the linear segment (k·t + 16)/116
  const f = (t: number): number => (t > e ? Math.cbrt(t) : (k * t + 16) / 116);
  const fx = f(c.x / white.x);
  const fy = f(c.y / white.y);
  const fz = f(c.z / white.z);
  return { l: 116 * fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz) };
}
