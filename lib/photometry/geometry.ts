import type { ExposureTags, Rect } from './types';

/**
 * Field of view and angular resolution of the virtual image (docs/method.md §5.11): a pinhole camera
 * whose principal point is the frame's centre, so a pixel at (u, v) from the centre looks along
 * (u, v, f) with f the focal length in pixels, and the angle between two such rays is what the eye
 * behind the optics sees between the two points.
 */

/** Bounds a camera profile's degrees per pixel must lie within (a fisheye to a long telephoto). */
export const DEGREES_PER_PIXEL_BOUNDS = [1e-4, 0.5] as const;
/** Diagonal of the 36 × 24 mm frame the 35 mm equivalent focal length refers to, mm. */
export const FULL_FRAME_DIAGONAL_MM = Math.hypot(36, 24);

export type GeometrySource = 'camera-profile' | 'exif-focal-sensor' | 'exif-35mm';

export interface FocalLength {
  /** Focal length in pixels of the analysed photo. */
  px: number;
  source: GeometrySource;
}

export interface ScreenGeometry {
  /** Angles the screen rectangle subtends across its middle (H, V) and corner to corner (D), degrees. */
  fovH: number;
  fovV: number;
  fovD: number;
  /** The angle one camera pixel subtends at the frame's centre, degrees. */
  degreesPerPixel: number;
  source: GeometrySource;
  /** Display pixels per degree along the screen's horizontal, when the display's resolution is known. */
  pixelsPerDegree: number | null;
}

const DEG = 180 / Math.PI;

function positive(v: number | undefined | null): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

/**
 * The camera's focal length in pixels of a `width` × `height` photo, from (best first) a camera
 * profile's degrees per pixel, the EXIF focal length and focal-plane resolution, or the EXIF 35 mm
 * equivalent; null when none is known. The EXIF figures assume the lens focused far away; focused at a
 * distance d, a thin lens's image lies a share f/(d − f) further and the angles read that much too large
 * (derived): 0.5% for a 5 mm phone lens at 1 m, 5% for a 50 mm lens (docs/method.md §5.11). A
 * profile measured at the same focus has no such error.
 */
export function focalLengthPx(width: number, height: number, opts: { degreesPerPixel?: number | null; exposure?: ExposureTags | null }): FocalLength | null {
  if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0)) throw new RangeError('width and height must be positive integers');
  const dpp = opts.degreesPerPixel;
  if (dpp !== undefined && dpp !== null) {
    if (!(Number.isFinite(dpp) && dpp >= DEGREES_PER_PIXEL_BOUNDS[0] && dpp <= DEGREES_PER_PIXEL_BOUNDS[1])) {
      throw new RangeError(`degrees per pixel must be from ${DEGREES_PER_PIXEL_BOUNDS[0]} to ${DEGREES_PER_PIXEL_BOUNDS[1]}, got ${dpp}`);
    }
    // one pixel at the centre subtends atan(1/f): f = 1/tan(dpp)
    return { px: 1 / Math.tan(dpp / DEG), source: 'camera-profile' };
  }
  const e = opts.exposure;
  if (!e) return null;
  const long = Math.max(width, height);
  if (positive(e.focalLength) && positive(e.focalPlanePxPerMm)) {
    // the recorded image's pixels per mm, rescaled when the analysed photo was resized (by the long side, whatever its turn)
    const pxPerMm = e.focalPlanePxPerMm * (positive(e.exifLongSide) ? long / e.exifLongSide : 1);
    return { px: e.focalLength * pxPerMm, source: 'exif-focal-sensor' };
  }
  if (positive(e.focalLength35mm)) {
    // the 35 mm equivalent maps the photo's diagonal onto the 36 × 24 mm frame's 43.27 mm (common practice; makers
    // that match widths instead differ by a few percent on 4:3 sensors)
    return { px: (e.focalLength35mm * Math.hypot(width, height)) / FULL_FRAME_DIAGONAL_MM, source: 'exif-35mm' };
  }
  return null;
}

/** Angle between the rays through two image points (pixel coordinates, the frame's centre at cx, cy), degrees. */
function rayAngle(f: number, cx: number, cy: number, x1: number, y1: number, x2: number, y2: number): number {
  const ax = x1 - cx;
  const ay = y1 - cy;
  const bx = x2 - cx;
  const by = y2 - cy;
  const dot = ax * bx + ay * by + f * f;
  const cross = Math.hypot(ay * f - f * by, f * bx - ax * f, ax * by - ay * bx);
  // atan2 of |a × b| and a · b keeps small angles exact where acos would round
  return Math.atan2(cross, dot) * DEG;
}

/**
 * The screen rectangle's field of view through a pinhole of focal length f px: horizontal across
 * its middle row, vertical across its middle column, diagonal corner to corner (for a rectangle
 * centred in the frame, 2·atan(s / 2f) each). Pixel x covers [x, x + 1), the frame's centre is
 * (width/2, height/2). Display pixels per degree: the display's pixels along the screen's longer
 * side (its wider one when the screen is wider than tall) over the field of view along it.
 */
export function screenGeometry(screen: Rect, image: { width: number; height: number }, focal: FocalLength, display?: { width: number; height: number } | null): ScreenGeometry {
  if (!(focal.px > 0) || !Number.isFinite(focal.px)) throw new RangeError('the focal length must be positive');
  const f = focal.px;
  const cx = image.width / 2;
  const cy = image.height / 2;
  const x0 = screen.x;
  const x1 = screen.x + screen.w;
  const y0 = screen.y;
  const y1 = screen.y + screen.h;
  const ym = (y0 + y1) / 2;
  const xm = (x0 + x1) / 2;
  const fovH = rayAngle(f, cx, cy, x0, ym, x1, ym);
  const fovV = rayAngle(f, cx, cy, xm, y0, xm, y1);
  const fovD = rayAngle(f, cx, cy, x0, y0, x1, y1);
  let pixelsPerDegree: number | null = null;
  if (display) {
    if (!(Number.isInteger(display.width) && Number.isInteger(display.height) && display.width > 0 && display.height > 0)) throw new RangeError('the display resolution must be positive whole pixels');
    // the display's side that lies along the screen's horizontal: matched by which side is longer
    const along = screen.w >= screen.h === display.width >= display.height ? display.width : display.height;
    pixelsPerDegree = fovH > 0 ? along / fovH : null;
  }
  return { fovH, fovV, fovD, degreesPerPixel: Math.atan(1 / f) * DEG, source: focal.source, pixelsPerDegree };
}
