import sharp from 'sharp';
import exifr from 'exifr';
import { deflateSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { decodePhoto, readExposureTags } from '../../../lib/image';
import { EngineInputError } from '../../../lib/photometry';
import { encodeTiff16 } from '../../fixtures/tiff16';

const W = 40;
const H = 24;

function gradient(channels: 3, sixteen = false): Uint8Array | Uint16Array {
  const max = sixteen ? 65535 : 255;
  const a = sixteen ? new Uint16Array(W * H * channels) : new Uint8Array(W * H * channels);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) for (let c = 0; c < channels; c++) a[(y * W + x) * channels + c] = Math.round((max * x) / (W - 1));
  return a;
}

async function expectInputError(p: Promise<unknown>, code: string, text: RegExp): Promise<void> {
  const e = await p.then(() => null, (err: unknown) => err);
  expect(e).toBeInstanceOf(EngineInputError);
  expect((e as EngineInputError).code).toBe(code);
  expect((e as EngineInputError).message).toMatch(text);
  expect((e as EngineInputError).message).not.toContain('\n');
}

// minimal PNG: the header claims the size, the pixels are never reached
function pngClaiming(width: number, height: number): Buffer {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    return c >>> 0;
  });
  const crc = (b: Buffer): number => {
    let c = 0xffffffff;
    for (const v of b) c = (crcTable[(c ^ v) & 0xff] as number) ^ (c >>> 8);
    return (c ^ 0xffffffff) >>> 0;
  };
  const chunk = (type: string, data: Buffer): Buffer => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const c = Buffer.alloc(4);
    c.writeUInt32BE(crc(body));
    return Buffer.concat([len, body, c]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 2, 0, 0, 0], 8);
  return Buffer.concat([Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(Buffer.alloc(10))), chunk('IEND', Buffer.alloc(0))]);
}

describe('decodePhoto', () => {
  it('decodes an 8-bit PNG to sRGB codes, three channels', async () => {
    const png = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).png().toBuffer();
    const d = await decodePhoto(png);
    expect(d.format).toBe('png');
    expect(d.raster).toMatchObject({ width: W, height: H, channels: 3, bitDepth: 8, encoding: 'srgb' });
    expect(d.raster.data[(W - 1) * 3]).toBe(255);
  });

  it('keeps 16 bits from a 16-bit TIFF and may declare it linear', async () => {
    const tif = encodeTiff16(gradient(3, true) as Uint16Array, W, H);
    const d = await decodePhoto(tif, { linear16: true });
    expect(d.raster.bitDepth).toBe(16);
    expect(d.raster.encoding).toBe('linear');
    expect(d.raster.data[(W - 1) * 3]).toBe(65535);
    expect(d.raster.data[3]).toBe(Math.round(65535 / (W - 1)));
  });

  it('refuses to declare an 8-bit JPEG linear', async () => {
    const jpg = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).jpeg().toBuffer();
    await expectInputError(decodePhoto(jpg, { linear16: true }), 'bad-argument', /16-bit TIFF/);
  });

  it('applies the EXIF orientation (6: rotate 90° clockwise)', async () => {
    const jpg = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).withMetadata({ orientation: 6 }).jpeg({ quality: 95 }).toBuffer();
    const d = await decodePhoto(jpg);
    expect([d.raster.width, d.raster.height]).toEqual([H, W]);
    // the dark left edge of the landscape image is now the top row
    expect(d.raster.data[0]).toBeLessThan(20);
    expect(d.raster.data[(W - 1) * H * 3]).toBeGreaterThan(235);
  });

  it('keeps 16 bits from a 16-bit PNG, sRGB-encoded by default', async () => {
    const png = await sharp(gradient(3, true), { raw: { width: W, height: H, channels: 3 } }).toColourspace('rgb16').png().toBuffer();
    const d = await decodePhoto(png);
    expect(d.raster).toMatchObject({ bitDepth: 16, encoding: 'srgb' });
    expect(d.raster.data[3]).toBe(Math.round(65535 / (W - 1)));
  });

  it('decodes WebP', async () => {
    const webp = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).webp({ lossless: true }).toBuffer();
    expect((await decodePhoto(webp)).format).toBe('webp');
  });

  it('reads exposure time, f-number, ISO, make and model written by sharp, and exifr agrees', async () => {
    const jpg = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } })
      .withExif({ IFD0: { Make: 'Acme', Model: 'M1' }, IFD2: { ExposureTime: '1/50', FNumber: '56/10', ISOSpeedRatings: '200' } })
      .jpeg()
      .toBuffer();
    const tags = await readExposureTags(jpg);
    expect(tags).toEqual({ exposureTime: 0.02, fNumber: 5.6, iso: 200, make: 'Acme', model: 'M1' });
    const direct = (await exifr.parse(jpg)) as Record<string, unknown>;
    expect(direct.ExposureTime).toBe(0.02);
    expect((await decodePhoto(jpg)).exposure?.iso).toBe(200);
  });

  it('returns null exposure when there is no EXIF', async () => {
    const png = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).png().toBuffer();
    expect((await decodePhoto(png)).exposure).toBeNull();
  });
});

describe('decodePhoto refusals say what to send instead', () => {
  it('HEIC', async () => {
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic'), Buffer.alloc(40)]);
    await expectInputError(decodePhoto(heic, { name: 'IMG_1.HEIC' }), 'unsupported-format', /HEIC is not supported: export the photo as 16-bit TIFF or JPEG/);
  });

  it('AVIF', async () => {
    const avif = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypavif'), Buffer.alloc(40)]);
    await expectInputError(decodePhoto(avif), 'unsupported-format', /AVIF is not supported/);
  });

  it('a raw name over other content, a raw format not read here, and a CR2 signature over no raw data', async () => {
    await expectInputError(decodePhoto(Buffer.alloc(64), { name: 'DSC_0001.NEF' }), 'not-an-image', /DSC_0001\.NEF is named \.nef but its content is not a Nikon NEF raw file/);
    await expectInputError(decodePhoto(Buffer.alloc(64), { name: 'IMG_1.X3F' }), 'unsupported-format', /camera raw \(\.x3f\) is not read here: convert it to DNG/);
    const cr2 = Buffer.concat([Buffer.from('II*\0'), Buffer.from([16, 0, 0, 0]), Buffer.from('CR'), Buffer.alloc(40)]);
    await expectInputError(decodePhoto(cr2), 'not-an-image', /signature of a Canon CR2 file/);
  });

  it('more than 100 megapixels, before decoding a pixel', async () => {
    await expectInputError(decodePhoto(pngClaiming(12000, 9000)), 'too-large', /more than 100/);
  });

  it('not an image, and GIF', async () => {
    await expectInputError(decodePhoto(Buffer.from('hello, this is text')), 'not-an-image', /JPEG, PNG, TIFF or WebP/);
    const gif = await sharp(gradient(3), { raw: { width: W, height: H, channels: 3 } }).gif().toBuffer();
    await expectInputError(decodePhoto(gif), 'unsupported-format', /GIF is not supported/);
  });
});
