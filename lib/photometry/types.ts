/** A single-channel image: row-major, `data.length === width * height`. */
export interface Plane<T extends ArrayLike<number> = Float32Array> {
  data: T;
  width: number;
  height: number;
}

/** Decoded pixels as they came from the file (interleaved channels, no alpha). */
export interface PhotoRaster {
  data: Uint8Array | Uint16Array;
  width: number;
  height: number;
  channels: 1 | 3;
  bitDepth: 8 | 16;
  /** 'linear' only for 16-bit files declared linear by the user. */
  encoding: 'srgb' | 'linear';
}

/** An axis-aligned rectangle in pixels; x, y inclusive, w, h ≥ 1. */
export interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** A translation in pixels. */
export interface Offset {
  dx: number;
  dy: number;
}

/** Camera settings read from EXIF; any may be missing. */
export interface ExposureTags {
  exposureTime?: number;
  fNumber?: number;
  iso?: number;
  make?: string;
  model?: string;
  /** Lens focal length, mm. */
  focalLength?: number;
  /** The 35 mm equivalent focal length, mm. */
  focalLength35mm?: number;
  /** Sensor pixels per mm on the focal plane (EXIF FocalPlaneXResolution in mm). */
  focalPlanePxPerMm?: number;
  /** The longer side of the image the camera recorded, px (EXIF PixelXDimension/PixelYDimension). */
  exifLongSide?: number;
}

export type PhotoRole = 'on' | 'off' | 'ambient' | 'dark';
export type Pattern = 'full' | 'checkerboard' | 'slanted-edge' | 'orientation';
