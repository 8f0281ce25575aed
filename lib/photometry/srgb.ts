// sRGB transfer functions: IEC 61966-2-1:1999 (threshold 0.04045, slope 12.92, power 2.4, offset 0.055).

/** Decodes one sRGB-encoded value in 0..1 to linear light. */
export function srgbDecode(v: number): number {
  // IEC 61966-2-1: V ≤ 0.04045 → V/12.92, else ((V + 0.055)/1.055)^2.4
  return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
}

/** Encodes one linear value in 0..1 to sRGB. */
export function srgbEncode(l: number): number {
  // IEC 61966-2-1: L ≤ 0.0031308 → 12.92·L, else 1.055·L^(1/2.4) − 0.055
  return l <= 0.0031308 ? 12.92 * l : 1.055 * Math.pow(l, 1 / 2.4) - 0.055;
}

let table8: Float64Array | null = null;

/** Linear value of every 8-bit sRGB code (256 entries), computed once. */
export function srgb8Table(): Float64Array {
  if (table8 === null) {
    const t = new Float64Array(256);
    for (let v = 0; v < 256; v++) t[v] = srgbDecode(v / 255);
    table8 = t;
  }
  return table8;
}

/** Linear values of 0..maxCode for codes of the given bit depth; 8-bit uses the table, 16-bit the formula. */
export function linearTable(bitDepth: 8 | 16, encoding: 'srgb' | 'linear'): Float64Array {
  if (bitDepth !== 8 && bitDepth !== 16) throw new RangeError(`bitDepth must be 8 or 16, got ${String(bitDepth)}`);
  const max = bitDepth === 8 ? 255 : 65535;
  if (bitDepth === 8 && encoding === 'srgb') return srgb8Table();
  const t = new Float64Array(max + 1);
  for (let v = 0; v <= max; v++) t[v] = encoding === 'srgb' ? srgbDecode(v / max) : v / max;
  return t;
}
