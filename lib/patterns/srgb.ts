// Kept local so the pattern generator has no dependency on the photometry engine.

/** sRGB encoding of a linear value 0…1. */
export function encodeSrgb(linear: number): number {
  // Source: IEC 61966-2-1:1999 encoding function.
  return linear <= 0.0031308 ? 12.92 * linear : 1.055 * linear ** (1 / 2.4) - 0.055;
}

/** Linear value 0…1 of an sRGB-encoded value 0…1. */
export function decodeSrgb(encoded: number): number {
  // Source: IEC 61966-2-1:1999 decoding function.
  return encoded <= 0.04045 ? encoded / 12.92 : ((encoded + 0.055) / 1.055) ** 2.4;
}
