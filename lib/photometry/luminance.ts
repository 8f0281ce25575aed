// Relative luminance weights: ITU-R BT.709 primaries, the Y row of the sRGB-to-XYZ matrix (IEC 61966-2-1).
export const LUMINANCE_WEIGHTS = Object.freeze({ r: 0.2126, g: 0.7152, b: 0.0722 });

/** Relative luminance of linear RGB (white = 1); never apply to encoded values (that is luma). */
export function relativeLuminance(r: number, g: number, b: number): number {
  // ITU-R BT.709: Y = 0.2126 R + 0.7152 G + 0.0722 B
  return LUMINANCE_WEIGHTS.r * r + LUMINANCE_WEIGHTS.g * g + LUMINANCE_WEIGHTS.b * b;
}
