import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { encodingFromFile, iccEncoding, tiffTransferEncoding } from '../../../lib/image/encoding';
import { decodePhoto } from '../../../lib/image/decode';
import { probePhoto } from '../../../lib/image/probe';
import { encodeTiff16 } from '../../fixtures/tiff16';
import { encodeTiff16Tagged, iccProfile } from '../../fixtures/tiff16-tagged';

const W = 32;
const H = 20;
const ramp = (scale = 1): Uint16Array => {
  const a = new Uint16Array(W * H * 3);
  for (let i = 0; i < W * H; i++) for (let c = 0; c < 3; c++) a[3 * i + c] = Math.round((scale * 65535 * (i % W)) / (W - 1));
  return a;
};

// sRGB's tone curve as an ICC parametric curve of type 3: IEC 61966-2-1 (published) parameters
const SRGB_PARA = { kind: 'para', type: 3, params: [2.4, 1 / 1.055, 0.055 / 1.055, 1 / 12.92, 0.04045] } as const;

describe('ICC tone curves decide linear or gamma-encoded', () => {
  it('reads straight curves as linear: identity curv, gamma 1.0, a straight table, para gamma 1', () => {
    expect(iccEncoding(iccProfile({ kind: 'curv-identity' }, 'Linear test'))?.encoding).toBe('linear');
    expect(iccEncoding(iccProfile({ kind: 'curv-gamma', gamma: 1 }, 'Linear test'))?.encoding).toBe('linear');
    expect(iccEncoding(iccProfile({ kind: 'curv-table', table: Array.from({ length: 256 }, (_, k) => Math.round((65535 * k) / 255)) }, 'Linear table'))?.encoding).toBe('linear');
    expect(iccEncoding(iccProfile({ kind: 'para', type: 0, params: [1] }, 'Linear para'))?.encoding).toBe('linear');
  });

  it('reads sRGB, gamma 2.2 and gamma 1.8 curves as gamma-encoded, naming the profile', () => {
    const srgb = iccEncoding(iccProfile(SRGB_PARA, 'sRGB test profile'));
    expect(srgb).toEqual({ encoding: 'srgb', reason: 'colour profile “sRGB test profile” with a gamma tone curve' });
    expect(iccEncoding(iccProfile({ kind: 'curv-gamma', gamma: 2.2 }, 'Wide gamut'))?.encoding).toBe('srgb');
    expect(iccEncoding(iccProfile({ kind: 'curv-gamma', gamma: 1.8 }, 'Wide gamut'))?.encoding).toBe('srgb');
  });

  it('gives no answer for bytes that are not a profile', () => {
    expect(iccEncoding(Buffer.alloc(200))).toBeNull();
    expect(iccEncoding(Buffer.from('not a profile'))).toBeNull();
  });
});

describe('the file rule', () => {
  it('takes a 16-bit TIFF without profile or transfer function as linear, and any 8-bit photo as sRGB', () => {
    const tif = encodeTiff16(ramp(), W, H);
    expect(encodingFromFile({ format: 'tiff', sixteen: true, bytes: tif }).encoding).toBe('linear');
    expect(encodingFromFile({ format: 'tiff', sixteen: false, bytes: tif }).encoding).toBe('srgb');
    expect(encodingFromFile({ format: 'png', sixteen: true, bytes: tif }).encoding).toBe('srgb');
  });

  it('follows a TIFF transfer function: straight is linear, a 2.2 power is gamma', () => {
    const straight = Uint16Array.from({ length: 65536 }, (_, k) => k);
    const gamma = Uint16Array.from({ length: 65536 }, (_, k) => Math.round(65535 * (k / 65535) ** 2.2));
    expect(tiffTransferEncoding(encodeTiff16Tagged([{ data: ramp(), width: W, height: H }], { transfer: straight }))?.encoding).toBe('linear');
    expect(tiffTransferEncoding(encodeTiff16Tagged([{ data: ramp(), width: W, height: H }], { transfer: gamma }))?.encoding).toBe('srgb');
    expect(tiffTransferEncoding(encodeTiff16(ramp(), W, H))).toBeNull();
  });
});

describe('probePhoto reports the encoding and the pages a file holds', () => {
  it('a bare 16-bit TIFF: linear, one page', async () => {
    const p = await probePhoto(encodeTiff16(ramp(), W, H), 'linear.tif');
    expect(p).toMatchObject({ format: 'tiff', bitDepth: 16, pages: 1 });
    expect(p.encoding.encoding).toBe('linear');
    expect(p.encoding.reason).toMatch(/no colour profile/);
  });

  it('a 16-bit TIFF with an embedded sRGB profile: gamma-encoded; with a linear profile: linear', async () => {
    const srgb = await probePhoto(encodeTiff16Tagged([{ data: ramp(), width: W, height: H }], { icc: iccProfile(SRGB_PARA, 'sRGB test profile') }), 'srgb.tif');
    expect(srgb.encoding).toEqual({ encoding: 'srgb', reason: 'colour profile “sRGB test profile” with a gamma tone curve' });
    const lin = await probePhoto(encodeTiff16Tagged([{ data: ramp(), width: W, height: H }], { icc: iccProfile({ kind: 'curv-gamma', gamma: 1 }, 'Linear Rec. 709 test') }), 'lin.tif');
    expect(lin.encoding.encoding).toBe('linear');
  });

  it('a JPEG: sRGB', async () => {
    const jpg = await sharp({ create: { width: W, height: H, channels: 3, background: '#808080' } }).jpeg().toBuffer();
    expect((await probePhoto(jpg, 'x.jpg')).encoding).toEqual({ encoding: 'srgb', reason: '8-bit photo' });
  });

  it('a TIFF of two pages: pages 2, and the first page is the one decoded', async () => {
    const first = ramp(1);
    const second = ramp(0.25);
    const tif = encodeTiff16Tagged([{ data: first, width: W, height: H }, { data: second, width: W, height: H }]);
    expect((await probePhoto(tif, 'pages.tif')).pages).toBe(2);
    const d = await decodePhoto(tif, { linear16: true });
    expect(d.pages).toBe(2);
    expect(d.raster.data[3 * (W - 1)]).toBe(65535);
  });
});
