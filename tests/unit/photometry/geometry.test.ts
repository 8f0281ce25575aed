import { describe, expect, it } from 'vitest';
import { focalLengthPx, screenGeometry, FULL_FRAME_DIAGONAL_MM } from '../../../lib/photometry/geometry';

const DEG = 180 / Math.PI;
// pinhole camera: a size s centred on the axis at focal length f subtends 2·atan(s / 2f) (derived)
const pinhole = (s: number, f: number): number => 2 * Math.atan(s / (2 * f)) * DEG;

describe('field of view of the screen (docs/method.md §5.11)', () => {
  it('gives 2·atan(s / 2f) for a screen centred in the frame, in each direction', () => {
    const f = { px: 3000, source: 'exif-focal-sensor' as const };
    const g = screenGeometry({ x: 1000, y: 700, w: 2000, h: 1000 }, { width: 4000, height: 2400 }, f);
    expect(g.fovH).toBeCloseTo(pinhole(2000, 3000), 9);
    expect(g.fovV).toBeCloseTo(pinhole(1000, 3000), 9);
    expect(g.fovD).toBeCloseTo(pinhole(Math.hypot(2000, 1000), 3000), 9);
    expect(g.degreesPerPixel).toBeCloseTo(Math.atan(1 / 3000) * DEG, 12);
    expect(g.pixelsPerDegree).toBeNull();
  });

  it('measures an off-centre screen by the angle between its edges’ rays, less than the same size on the axis', () => {
    const f = { px: 1000, source: 'exif-35mm' as const };
    const g = screenGeometry({ x: 1500, y: 900, w: 400, h: 200 }, { width: 2000, height: 1200 }, f);
    // horizontal: from atan(500/f) to atan(900/f) at a row 400 px below the centre: rays (500, 400, f) and (900, 400, f)
    const a = [500, 400, 1000];
    const b = [900, 400, 1000];
    const dot = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
    const expected = Math.acos(dot / (Math.hypot(...a) * Math.hypot(...b))) * DEG;
    expect(g.fovH).toBeCloseTo(expected, 9);
    expect(g.fovH).toBeLessThan(pinhole(400, 1000));
  });

  it('counts display pixels per degree along the screen’s horizontal, matching a display turned on its side', () => {
    const f = { px: 3000, source: 'camera-profile' as const };
    const screen = { x: 1000, y: 700, w: 2000, h: 1000 };
    const g = screenGeometry(screen, { width: 4000, height: 2400 }, f, { width: 1920, height: 1080 });
    expect(g.pixelsPerDegree).toBeCloseTo(1920 / pinhole(2000, 3000), 9);
    const turned = screenGeometry(screen, { width: 4000, height: 2400 }, f, { width: 1080, height: 1920 });
    expect(turned.pixelsPerDegree).toBeCloseTo(1920 / pinhole(2000, 3000), 9);
  });

  it('takes the focal length from a camera profile first, then focal length and sensor, then the 35 mm equivalent', () => {
    const exposure = { focalLength: 24, focalPlanePxPerMm: 250, exifLongSide: 6000, focalLength35mm: 36 };
    // profile: one pixel at the centre subtends the profile's angle
    const p = focalLengthPx(6000, 4000, { degreesPerPixel: 0.01, exposure });
    expect(p?.source).toBe('camera-profile');
    expect(Math.atan(1 / (p?.px as number)) * DEG).toBeCloseTo(0.01, 12);
    // EXIF: 24 mm × 250 px/mm = 6000 px; a photo resized to half keeps the angles (3000 px)
    expect(focalLengthPx(6000, 4000, { exposure })).toEqual({ px: 6000, source: 'exif-focal-sensor' });
    expect(focalLengthPx(3000, 2000, { exposure })).toEqual({ px: 3000, source: 'exif-focal-sensor' });
    expect(focalLengthPx(2000, 3000, { exposure })).toEqual({ px: 3000, source: 'exif-focal-sensor' });
    // 35 mm equivalent: the photo's diagonal over 43.27 mm
    const e35 = focalLengthPx(6000, 4000, { exposure: { focalLength35mm: 36 } });
    expect(e35?.source).toBe('exif-35mm');
    expect(e35?.px).toBeCloseTo((36 * Math.hypot(6000, 4000)) / FULL_FRAME_DIAGONAL_MM, 9);
    // a full-frame 36 mm wide sensor with a 36 mm lens sees 2·atan(18/36) across: the same from either EXIF route
    const full = screenGeometry({ x: 0, y: 0, w: 6000, h: 4000 }, { width: 6000, height: 4000 }, e35 as { px: number; source: 'exif-35mm' });
    expect(full.fovH).toBeCloseTo(pinhole(36, 36), 9);
    expect(focalLengthPx(6000, 4000, { exposure: { focalLength: 24 } })).toBeNull();
    expect(focalLengthPx(6000, 4000, {})).toBeNull();
  });

  it('refuses a profile angle outside the bounds and a bad display resolution', () => {
    expect(() => focalLengthPx(100, 100, { degreesPerPixel: 2 })).toThrow(RangeError);
    expect(() => focalLengthPx(100, 100, { degreesPerPixel: 0 })).toThrow(RangeError);
    expect(() => screenGeometry({ x: 0, y: 0, w: 10, h: 10 }, { width: 100, height: 100 }, { px: 100, source: 'camera-profile' }, { width: 0, height: 10 })).toThrow(RangeError);
  });
});
