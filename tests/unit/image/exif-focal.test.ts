import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { focalPlaneUnitMm, readExposureTags } from '../../../lib/image/exif';

const jpeg = (exif: Record<string, string>) =>
  sharp({ create: { width: 64, height: 48, channels: 3, background: '#808080' } })
    .jpeg()
    .withExif({ IFD0: { Make: 'Invented', Model: 'Bench 1' }, IFD2: { ExposureTime: '1/100', ...exif } })
    .toBuffer();

describe('focal length and focal plane from EXIF', () => {
  it('reads the focal length, its 35 mm equivalent and the focal plane pixels per mm', async () => {
    // 5080 px per inch = 200 px per mm (EXIF FocalPlaneResolutionUnit 2 = inch)
    const tags = await readExposureTags(await jpeg({ FocalLength: '24/1', FocalLengthIn35mmFilm: '36', FocalPlaneXResolution: '5080/1', FocalPlaneResolutionUnit: '2' }));
    // the encoder writes the image's own size as PixelXDimension/PixelYDimension
    expect(tags).toMatchObject({ focalLength: 24, focalLength35mm: 36, exifLongSide: 64 });
    expect(tags?.focalPlanePxPerMm).toBeCloseTo(200, 9);
    const cm = await readExposureTags(await jpeg({ FocalLength: '50/1', FocalPlaneXResolution: '2000/1', FocalPlaneResolutionUnit: '3' }));
    expect(cm?.focalPlanePxPerMm).toBeCloseTo(200, 9);
  });

  it('drops values no camera writes and a unit it cannot convert', async () => {
    const tags = await readExposureTags(await jpeg({ FocalLength: '0/1', FocalPlaneXResolution: '5/1', FocalPlaneResolutionUnit: '2' }));
    expect(tags?.focalLength).toBeUndefined();
    expect(tags?.focalPlanePxPerMm).toBeUndefined();
    expect(focalPlaneUnitMm('None')).toBeNull();
    expect(focalPlaneUnitMm(undefined)).toBe(25.4);
    expect(focalPlaneUnitMm(4)).toBe(1);
  });
});
