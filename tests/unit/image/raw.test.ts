// Camera raw photos: recognised by content, decoded by the libraw tools to linear 16-bit with one
// fixed white balance, and measured to the generator's linear truth. The DNG files are written by
// tests/fixtures/dng-writer.ts from rendered linear scenes.
import { readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { describe, expect, it } from 'vitest';
import { analyzeFiles, decodePhoto } from '../../../lib/image';
import { decodeRaw, identifyRaw, parseIdentify, parsePpm, sniffRaw } from '../../../lib/image/raw';
import { refuseUnsupported } from '../../../lib/image/sniff';
import { EngineInputError } from '../../../lib/photometry';
import { PHOTO_ACCEPT, PHOTO_ACCEPT_ATTRIBUTE, RAW_KINDS, RAW_TYPES } from '../../../lib/image/raw-formats';
import { photoEncoding } from '../../../lib/schemas/capture-set';
import { openApiDocument } from '../../../lib/server/api-v1/openapi';
import { encodeDng, FIXTURE_CAMERA, renderDngCapture } from '../../fixtures/dng-writer';
import { encodeTiff16 } from '../../fixtures/tiff16';

const rawFolders = (): string[] => readdirSync(tmpdir()).filter((f) => f.startsWith('veilmeter-raw-'));

/** A flat linear sRGB scene: left half grey, right half a saturated orange, as 16-bit codes. */
function patches(W = 64, H = 48): { data: Uint16Array; width: number; height: number } {
  const data = new Uint16Array(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const v = x < W / 2 ? [20000, 20000, 20000] : [40000, 10000, 5000];
      data.set(v, 3 * (y * W + x));
    }
  }
  return { data, width: W, height: H };
}

function at(raster: { data: Uint8Array | Uint16Array; width: number }, x: number, y: number): number[] {
  const i = 3 * (y * raster.width + x);
  return [raster.data[i] as number, raster.data[i + 1] as number, raster.data[i + 2] as number];
}

async function inputError(p: Promise<unknown>): Promise<EngineInputError> {
  const e = await p.then(() => null, (err: unknown) => err);
  expect(e).toBeInstanceOf(EngineInputError);
  expect((e as Error).message).not.toContain('\n');
  return e as EngineInputError;
}

// a TIFF structure of a maker with sensor data in a SubIFD (as NEF files hold it)
function makerTiff(make: string, cfa: boolean): Buffer {
  const b = Buffer.alloc(256);
  b.write('II', 0, 'latin1');
  b.writeUInt16LE(42, 2);
  b.writeUInt32LE(8, 4);
  // IFD0: Make (ASCII at 100), SubIFDs → 60
  b.writeUInt16LE(2, 8);
  b.writeUInt16LE(271, 10);
  b.writeUInt16LE(2, 12);
  b.writeUInt32LE(make.length + 1, 14);
  b.writeUInt32LE(100, 18);
  b.writeUInt16LE(330, 22);
  b.writeUInt16LE(4, 24);
  b.writeUInt32LE(1, 26);
  b.writeUInt32LE(60, 30);
  b.writeUInt32LE(0, 34);
  b.write(make, 100, 'latin1');
  // SubIFD: PhotometricInterpretation
  b.writeUInt16LE(1, 60);
  b.writeUInt16LE(262, 62);
  b.writeUInt16LE(3, 64);
  b.writeUInt32LE(1, 66);
  b.writeUInt16LE(cfa ? 32803 : 2, 70);
  return b;
}

describe('sniffRaw: raw formats by content', () => {
  it('knows each signature, and a plain TIFF or JPEG is no raw', () => {
    const pad = Buffer.alloc(64);
    expect(sniffRaw(encodeDng(patches()))).toBe('dng');
    expect(sniffRaw(encodeDng(patches(), { bigEndian: true }))).toBe('dng');
    expect(sniffRaw(Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypcrx '), pad]))).toBe('cr3');
    expect(sniffRaw(Buffer.concat([Buffer.from('FUJIFILMCCD-RAW 0201'), pad]))).toBe('raf');
    expect(sniffRaw(Buffer.concat([Buffer.from('IIRO'), Buffer.from([8, 0, 0, 0]), pad]))).toBe('orf');
    expect(sniffRaw(Buffer.concat([Buffer.from('IIU\0'), Buffer.from([8, 0, 0, 0]), pad]))).toBe('rw2');
    expect(sniffRaw(Buffer.concat([Buffer.from('II*\0'), Buffer.from([16, 0, 0, 0]), Buffer.from('CR'), pad]))).toBe('cr2');
    expect(sniffRaw(makerTiff('NIKON CORPORATION', true), 'DSC_0001.JPG')).toBe('nef');
    expect(sniffRaw(makerTiff('SONY', true))).toBe('arw');
    expect(sniffRaw(makerTiff('PENTAX Corporation', true))).toBe('pef');
    expect(sniffRaw(makerTiff('SAMSUNG', true))).toBe('srw');
    // a maker's TIFF without sensor data counts only under the maker's raw extension
    expect(sniffRaw(makerTiff('NIKON CORPORATION', false), 'scan.tif')).toBeNull();
    expect(sniffRaw(makerTiff('NIKON CORPORATION', false), 'DSC_0001.NEF')).toBe('nef');
    expect(sniffRaw(encodeTiff16(new Uint16Array(16 * 16 * 3), 16, 16), 'x.tif')).toBeNull();
    expect(sniffRaw(Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), pad]), 'photo.dng')).toBeNull();
  });

  it('walks hostile TIFF structures without throwing or looping (loops of IFDs, offsets past the end)', () => {
    let seed = 7;
    const rand = (): number => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let k = 0; k < 300; k++) {
      const b = Buffer.alloc(16 + Math.floor(rand() * 300));
      for (let i = 0; i < b.length; i++) b[i] = Math.floor(rand() * 256);
      b.write(k % 2 ? 'II*\0' : 'MM\0*', 0, 'latin1');
      // small offsets, so IFDs land inside the buffer and point at each other
      b.writeUInt32LE(8 + (k % 16), 4);
      expect(() => sniffRaw(b, 'x.nef')).not.toThrow();
    }
    // IFD0 naming itself as the next IFD and as its own SubIFD
    const loop = makerTiff('NIKON CORPORATION', false);
    loop.writeUInt32LE(8, 30);
    loop.writeUInt32LE(8, 34);
    expect(sniffRaw(loop, 'a.tif')).toBeNull();
  });

  it('refuses what it cannot read with what to do instead', () => {
    expect(() => refuseUnsupported(encodeDng(patches()), 'a.dng')).not.toThrow();
    expect(() => refuseUnsupported(Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(64)]), 'renamed.nef')).toThrow(/renamed\.nef is named \.nef but its content is not a Nikon NEF raw file/);
    expect(() => refuseUnsupported(Buffer.alloc(64), 'old.x3f')).toThrow(/camera raw \(\.x3f\) is not read here: convert it to DNG/);
    expect(() => refuseUnsupported(makerTiff('HASSELBLAD', true), 'h.3fr')).toThrow(/raw file of a format not read here/);
  });
});

describe('where the raw formats are offered', () => {
  it('the file pickers and the rig API document list every raw format', () => {
    for (const k of RAW_KINDS) {
      expect(PHOTO_ACCEPT_ATTRIBUTE.split(','), k).toContain(`.${RAW_TYPES[k].ext}`);
      expect(PHOTO_ACCEPT[RAW_TYPES[k].contentType], k).toEqual([`.${RAW_TYPES[k].ext}`]);
    }
    const doc = openApiDocument() as { paths: Record<string, Record<string, { requestBody?: { content: Record<string, unknown> } }>> };
    const upload = doc.paths['/captures/{captureId}/photos']?.post;
    const types = Object.keys(upload?.requestBody?.content ?? {});
    expect(types).toEqual(expect.arrayContaining(['image/jpeg', 'image/tiff', 'image/x-adobe-dng', 'image/x-canon-cr3', 'image/x-nikon-nef', 'image/x-fuji-raf', 'application/octet-stream']));
  });
});

describe('parseIdentify and parsePpm', () => {
  const listing = (extra: string): string =>
    `Camera: Fixture Cam\nISO speed: 400\nShutter: 1/125.0\nAperture: f/5.6\nFull size:   6048 x 4024\nImage size:  6000 x 4000\nOutput size: 6000 x 4000\n${extra}\nRaw colors: 3\nDerived D65 multipliers: 2.100000 1.000000 1.500000\nColor space (makernotes) : 0, Not Found\n`;

  it('reads exposure, size, orientation and the daylight multipliers', () => {
    const info = parseIdentify('nef', listing('Image flip: 0'), 'x.nef\tNIKON CORPORATION\tNIKON D850\t6000\t4000\n');
    expect(info).toMatchObject({ width: 6000, height: 4000, make: 'NIKON CORPORATION', model: 'NIKON D850', daylight: [2.1, 1, 1.5, 1] });
    expect(info?.exposure).toEqual({ exposureTime: 1 / 125, fNumber: 5.6, iso: 400, make: 'NIKON CORPORATION', model: 'NIKON D850' });
    // a camera held in portrait: libraw turns the output a quarter turn
    expect(parseIdentify('nef', listing('Image flip: 6'), '')).toMatchObject({ width: 4000, height: 6000 });
    expect(parseIdentify('nef', listing('Image flip: 3'), '')).toMatchObject({ width: 6000, height: 4000 });
    // a libraw that prints the output size already turned
    expect(parseIdentify('nef', listing('Image flip: 6').replace('Output size: 6000 x 4000', 'Output size: 4000 x 6000'), '')).toMatchObject({ width: 4000, height: 6000 });
  });

  it('long exposures, missing tags and missing colour data', () => {
    const info = parseIdentify('dng', 'ISO speed: 0\nShutter: 2.0 sec\nAperture: f/0.0\nOutput size: 640 x 480\nImage flip: 0\n', '');
    expect(info?.exposure).toEqual({ exposureTime: 2 });
    expect(info?.daylight).toBeNull();
    expect(parseIdentify('dng', 'nothing useful', '')).toBeNull();
  });

  it('PPM: 16-bit samples are big-endian (Netpbm), 8-bit as they are; short data is refused', () => {
    const p16 = Buffer.concat([Buffer.from('P6\n2 1\n65535\n'), Buffer.from([0x12, 0x34, 0, 1, 0xff, 0xff, 0, 0, 0, 0, 0x80, 0])]);
    expect(Array.from(parsePpm(p16)?.data ?? [])).toEqual([0x1234, 1, 65535, 0, 0, 0x8000]);
    const p8 = Buffer.concat([Buffer.from('P6 # comment\n1 1 255\n'), Buffer.from([1, 2, 3])]);
    expect(Array.from(parsePpm(p8)?.data ?? [])).toEqual([1, 2, 3]);
    expect(parsePpm(p16.subarray(0, p16.length - 1))).toBeNull();
  });
});

describe('how a stored raw photo is read', () => {
  it('as linear light whatever the set or the photo declares (a 16-bit TIFF follows them)', () => {
    const raw = { role: 'on' as const, originalName: 'on.nef', format: 'nef', bitDepth: 16, encodingFile: 'linear' as const, encodingReason: '', encodingDeclared: 'srgb' as const };
    for (const setting of ['auto', 'linear', 'srgb'] as const) expect(photoEncoding(setting, raw)).toEqual({ linear: true, by: 'file', conflict: null });
    expect(photoEncoding('srgb', { ...raw, format: 'tiff', encodingDeclared: null }).linear).toBe(false);
  });
});

describe('decoding a DNG with the libraw tools', () => {
  it('gives back the linear scene through the colour matrix and the daylight white balance, whatever the as-shot neutral says', async () => {
    const before = rawFolders().length;
    const scene = patches();
    // the camera's raw channels are not sRGB: only the ColorMatrix turns them back
    const dng = encodeDng(scene, { asShotNeutral: [0.35, 1, 0.95] });
    const d = await decodeRaw(dng, { name: 'patch.dng', kind: 'dng' });
    expect(d.raster).toMatchObject({ width: 64, height: 48, channels: 3, bitDepth: 16, encoding: 'linear' });
    // full scale of the scene is full scale of the output (the least sensitive channel's multiplier is 1)
    for (const [x, want] of [[10, [20000, 20000, 20000]], [50, [40000, 10000, 5000]]] as const) {
      const got = at(d.raster, x, 20);
      want.forEach((v, c) => expect(Math.abs((got[c] as number) - v) / v, `x ${x} channel ${c}`).toBeLessThan(0.002));
    }
    // the daylight multipliers are 1 / (the camera's response to white), normalised to green (derived)
    const white = FIXTURE_CAMERA.map((r) => r[0] + r[1] + r[2]);
    expect(d.whiteBalance.source).toBe('daylight');
    expect(d.whiteBalance.multipliers[0]).toBeCloseTo((white[1] as number) / (white[0] as number), 3);
    expect(d.whiteBalance.multipliers[2]).toBeCloseTo((white[1] as number) / (white[2] as number), 3);
    expect(d.exposure).toEqual({ exposureTime: 1 / 60, fNumber: 4, iso: 800, make: 'Veilmeter Fixture Optics', model: 'Bayer Mosaic DNG-1' });
    // the same mosaic with another as-shot neutral, big-endian: the same pixels
    const other = await decodeRaw(encodeDng(scene, { asShotNeutral: [0.9, 1, 0.3], bigEndian: true }), { name: 'patch-mm.dng', kind: 'dng' });
    expect(Array.from(other.raster.data)).toEqual(Array.from(d.raster.data));
    expect(rawFolders().length).toBe(before);
  });

  it('a photo whose data come near the white level is not rescaled to its own maximum', async () => {
    // a grey at 0.9 of full scale fills the camera's green to 0.9 of the white level, above the 0.75 of
    // full scale beyond which libraw by default takes a photo's own maximum as its white level
    const W = 64;
    const H = 48;
    const data = new Uint16Array(W * H * 3);
    for (let p = 0; p < W * H; p++) data.fill(p % W < W / 2 ? 58982 : 19661, 3 * p, 3 * p + 3);
    const d = await decodeRaw(encodeDng({ data, width: W, height: H }), { name: 'bright.dng', kind: 'dng' });
    for (const [x, want] of [[10, 58982], [50, 19661]] as const) {
      for (const v of at(d.raster, x, 20)) expect(Math.abs(v / want - 1), `x ${x}`).toBeLessThan(0.003);
    }
  });

  it('a camera held in portrait: the size from the header is the decoded size, turned a quarter turn', async () => {
    const dng = encodeDng(patches(64, 48), { orientation: 6 });
    const info = await identifyRaw(dng, 'portrait.dng', 'dng');
    const d = await decodeRaw(dng, { name: 'portrait.dng', kind: 'dng' });
    expect([info.width, info.height]).toEqual([48, 64]);
    expect([d.raster.width, d.raster.height]).toEqual([48, 64]);
  });

  it('a fixed white balance given for the set is the one used', async () => {
    const unity = await decodeRaw(encodeDng(patches()), { name: 'patch.dng', kind: 'dng', whiteBalance: { multipliers: [1, 1, 1, 1], source: 'unity' } });
    const grey = at(unity.raster, 10, 20);
    // without the daylight balance the grey patch is no longer neutral: green leads
    expect(grey[1]).toBeGreaterThan((grey[0] as number) * 1.3);
    expect(unity.whiteBalance).toEqual({ multipliers: [1, 1, 1, 1], source: 'unity' });
  });

  it('decodePhoto takes a raw file and reads it as linear whatever linear16 says', async () => {
    const d = await decodePhoto(encodeDng(patches()), { name: 'p.dng', linear16: false });
    expect(d.format).toBe('dng');
    expect(d.raster.encoding).toBe('linear');
    expect(d.exposure?.iso).toBe(800);
  });

  it('a damaged file, an implausible size and a fake signature each get one line, and nothing is left behind', async () => {
    const before = rawFolders().length;
    const dng = encodeDng(patches(256, 192));
    const cut = await inputError(decodeRaw(dng.subarray(0, dng.length - 40_000), { name: 'cut.dng', kind: 'dng' }));
    expect(cut.message).toMatch(/cut\.dng could not be decoded as DNG: its image data is damaged or cut short/);
    // a header claiming 20000 × 10000 pixels over a few kilobytes is refused before decoding
    const huge = encodeDng(patches(64, 48));
    const ifd = huge.readUInt32LE(4);
    for (let k = 0; k < huge.readUInt16LE(ifd); k++) {
      const e = ifd + 2 + 12 * k;
      if (huge.readUInt16LE(e) === 256) huge.writeUInt32LE(20000, e + 8);
      if (huge.readUInt16LE(e) === 257) huge.writeUInt32LE(10000, e + 8);
    }
    const big = await inputError(identifyRaw(huge, 'huge.dng', 'dng'));
    expect(big.code).toBe('too-large');
    expect(big.message).toMatch(/huge\.dng has 200 megapixels \(20000 × 10000\), more than 100/);
    const fake = await inputError(decodePhoto(Buffer.concat([Buffer.from('II*\0'), Buffer.from([16, 0, 0, 0]), Buffer.from('CR'), Buffer.alloc(200)]), { name: 'IMG_1.CR2' }));
    expect(fake.message).toMatch(/IMG_1\.CR2 has the signature of a Canon CR2 file, but libraw does not recognise it/);
    expect(rawFolders().length).toBe(before);
  });
});

describe('a DNG capture set measured to its linear truth', () => {
  it('recovers contrast and transmission within 0.5%, with one daylight white balance for every photo', async () => {
    // the camera's auto white balance drifted between shots: the as-shot neutrals differ per photo
    const cap = await renderDngCapture({ width: 720, height: 540, seed: 5, noise: { fullScaleElectrons: 20000, readElectrons: 3 } }, {}, { off: { asShotNeutral: [0.3, 1, 0.9] }, ambient: { asShotNeutral: [0.9, 1, 0.3] } });
    const photo = (role: 'on' | 'off' | 'ambient') => ({ name: `${role}.dng`, bytes: cap.photos[role] as Buffer });
    const { result, rawWhiteBalance } = await analyzeFiles({ on: photo('on'), off: photo('off'), ambient: photo('ambient'), screen: cap.truth.screen, background: cap.truth.background, artifacts: false });
    // 0.5%: the accuracy asked of a raw decode on a generated scene (the linear TIFF path's own bar)
    expect(Math.abs((result.ambientContrastRatio as number) / cap.truth.ambientContrastRatio - 1)).toBeLessThan(0.005);
    expect(Math.abs((result.transmission as number) / cap.truth.transmission - 1)).toBeLessThan(0.005);
    expect(rawWhiteBalance?.source).toBe('daylight');
    expect(result.exposure).toBeTruthy();
  }, 120_000);

  it('a bracket of raw photos (the on photo at two exposures) is merged on the exposure tags read from the raw files', async () => {
    const exposures = { on: [{ exposureTime: 1 / 60, fNumber: 4, iso: 800 }, { exposureTime: 1 / 250, fNumber: 4, iso: 800 }] };
    const cap = await renderDngCapture({ width: 480, height: 360, seed: 9, noise: null, exposures, displayLevel: 0.6 });
    const on = (cap.brackets.on as Buffer[]).map((bytes, i) => ({ name: `on-${i}.dng`, bytes }));
    expect(on).toHaveLength(2);
    const { result, rawWhiteBalance } = await analyzeFiles({ on, off: { name: 'off.dng', bytes: cap.photos.off as Buffer }, ambient: { name: 'ambient.dng', bytes: cap.photos.ambient as Buffer }, screen: cap.truth.screen, background: cap.truth.background, artifacts: false });
    expect(result.brackets?.on?.count).toBe(2);
    expect(Math.abs((result.ambientContrastRatio as number) / cap.truth.ambientContrastRatio - 1)).toBeLessThan(0.005);
    expect(Math.abs((result.transmission as number) / cap.truth.transmission - 1)).toBeLessThan(0.005);
    expect(rawWhiteBalance?.source).toBe('daylight');
  }, 120_000);
});
