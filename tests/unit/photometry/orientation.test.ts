import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { decodePhoto } from '../../../lib/image';
import { analyzeCapture, detectOrientation, preparePhoto, srgbDecode, srgbEncode } from '../../../lib/photometry';
import { renderPattern } from '../../../lib/patterns';
import { seededRandom } from '../../fixtures/capture-generator';

const W = 800;
const H = 560;
const SCREEN = { x: 160, y: 130, w: 480, h: 300 };

type Flip = 'none' | 'flop' | 'flip' | 'rotate';

/**
 * A generated photo through a see-through display showing the orientation pattern: textured
 * background seen through the combiner, the pattern's light added over the screen after the
 * optics flipped it as asked, scaled by 1.5, encoded as a camera JPEG.
 */
async function photo(flip: Flip | 'off', seed = 7, shift = 0): Promise<Buffer> {
  const p = renderPattern('orientation', 320, 200);
  const lit = flip !== 'off';
  let img = sharp(Buffer.from(p.data), { raw: { width: p.width, height: p.height, channels: 3 } });
  if (flip === 'flop') img = img.flop();
  if (flip === 'flip') img = img.flip();
  if (flip === 'rotate') img = img.rotate(180);
  const shown = await img.resize(SCREEN.w, SCREEN.h, { kernel: 'linear' }).raw().toBuffer();
  const rnd = seededRandom(seed);
  const out = Buffer.alloc(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const world = 0.25 * (0.6 + 0.4 * Math.sin((x + shift) / 23) * Math.cos(y / 31)) + 0.02 * rnd();
      const inside = lit && x >= SCREEN.x && x < SCREEN.x + SCREEN.w && y >= SCREEN.y && y < SCREEN.y + SCREEN.h;
      const display = inside ? 0.35 * srgbDecode(shown[((y - SCREEN.y) * SCREEN.w + (x - SCREEN.x)) * 3]! / 255) : 0;
      const v = Math.round(255 * srgbEncode(Math.min(1, world + display)));
      out[(y * W + x) * 3] = out[(y * W + x) * 3 + 1] = out[(y * W + x) * 3 + 2] = v;
    }
  }
  return sharp(out, { raw: { width: W, height: H, channels: 3 } }).jpeg({ quality: 90 }).toBuffer();
}

/** The same room with the screen lit plain white (no marker), noise of its own. */
async function flatScreenPhoto(): Promise<Buffer> {
  const rnd = seededRandom(13);
  const out = Buffer.alloc(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const world = 0.25 * (0.6 + 0.4 * Math.sin(x / 23) * Math.cos(y / 31)) + 0.02 * rnd();
      const inside = x >= SCREEN.x && x < SCREEN.x + SCREEN.w && y >= SCREEN.y && y < SCREEN.y + SCREEN.h;
      const v = Math.round(255 * srgbEncode(Math.min(1, world + (inside ? 0.35 : 0))));
      out[(y * W + x) * 3] = out[(y * W + x) * 3 + 1] = out[(y * W + x) * 3 + 2] = v;
    }
  }
  return sharp(out, { raw: { width: W, height: H, channels: 3 } }).jpeg({ quality: 90 }).toBuffer();
}

async function read(flip: Flip) {
  const decoded = await decodePhoto(await photo(flip));
  return detectOrientation(preparePhoto(decoded.raster), SCREEN);
}

describe('the whole analysis of an orientation capture set', () => {
  // on and off as a camera gives them: JPEG, its own noise in each, the off photo crept 0.4 px
  async function analyse(flip: Flip, screen: typeof SCREEN | null = SCREEN) {
    const on = await decodePhoto(await photo(flip, 11));
    const off = await decodePhoto(await photo('off', 12, 0.4));
    return analyzeCapture({ on: { raster: on.raster }, off: { raster: off.raster }, pattern: 'orientation', screen, ghostOffset: 'none' });
  }

  it.each([
    ['none', 'normal', false],
    ['flop', 'mirrored', true],
    ['rotate', 'rotated-180', false],
  ] as const)('reads the marker %s through the optics as %s (mirrored %s), clearly', async (flip, orientation, mirrored) => {
    const r = await analyse(flip);
    expect(r.orientation).toMatchObject({ orientation, mirrored });
    expect(r.orientation!.margin).toBeGreaterThan(0.1);
    expect(r.warnings.map((w) => w.code)).not.toContain('orientation-unclear');
  });

  it('says when the screen shows no marker, and gives no orientation for other patterns', async () => {
    const on = await decodePhoto(await photo('none', 11));
    const off = await decodePhoto(await photo('off', 12));
    // a set marked "orientation" whose screen showed plain white: nothing tells the transforms apart
    const white = await decodePhoto(await flatScreenPhoto());
    const blank = analyzeCapture({ on: { raster: white.raster }, off: { raster: off.raster }, pattern: 'orientation', screen: SCREEN, ghostOffset: 'none' });
    expect(blank.warnings.map((w) => w.code)).toContain('orientation-unclear');
    expect(blank.orientation === null || blank.orientation!.margin < 0.1).toBe(true);
    const full = analyzeCapture({ on: { raster: on.raster }, off: { raster: off.raster }, pattern: 'full', screen: SCREEN, ghostOffset: 'none' });
    expect(full.orientation).toBeUndefined();
  });
});

describe('detectOrientation on generated photos of the orientation pattern', () => {
  it('reports a normal image as normal', async () => {
    const r = await read('none');
    expect(r.orientation).toBe('normal');
    expect(r.mirrored).toBe(false);
    expect(r.margin).toBeGreaterThan(0.1);
  });

  it('reports a left-right mirrored image as mirrored', async () => {
    const r = await read('flop');
    expect(r.orientation).toBe('mirrored');
    expect(r.mirrored).toBe(true);
    expect(r.margin).toBeGreaterThan(0.1);
  });

  it('reports an upside-down mirror image as mirrored too', async () => {
    const r = await read('flip');
    expect(r.orientation).toBe('upside-down-mirrored');
    expect(r.mirrored).toBe(true);
  });

  it('reports a half turn as rotated, not mirrored (two reflections keep handedness)', async () => {
    const r = await read('rotate');
    expect(r.orientation).toBe('rotated-180');
    expect(r.mirrored).toBe(false);
  });

  it('refuses a screen too small to read and one outside the photo', () => {
    const plane = { data: new Float32Array(100 * 100), width: 100, height: 100 };
    expect(() => detectOrientation(plane, { x: 0, y: 0, w: 8, h: 8 })).toThrow(RangeError);
    expect(() => detectOrientation(plane, { x: 90, y: 90, w: 40, h: 40 })).toThrow(RangeError);
  });
});
