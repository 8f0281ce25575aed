/** An 8-bit RGB image, row-major, three bytes per pixel, no padding. */
export interface RgbImage {
  data: Uint8Array;
  width: number;
  height: number;
  channels: 3;
}

/** Smallest and largest side of a generated pattern, in pixels. */
export const PATTERN_MIN_SIZE = 8;
export const PATTERN_MAX_SIZE = 8192;
