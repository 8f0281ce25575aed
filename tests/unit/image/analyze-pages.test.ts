import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { analyzeFiles } from '../../../lib/image/analyze-files';
import { renderCapture } from '../../fixtures/capture-generator';
import { encodeTiff16Tagged } from '../../fixtures/tiff16-tagged';

/** The generator's 16-bit TIFF with a blank second page after it. */
async function twoPages(tiff: Buffer): Promise<Buffer> {
  const { data, info } = await sharp(tiff).toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true });
  const first = new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2);
  return encodeTiff16Tagged([
    { data: first, width: info.width, height: info.height },
    { data: new Uint16Array(first.length), width: info.width, height: info.height },
  ]);
}

describe('a TIFF of several pages', () => {
  it('is measured on its first page and the reading says so; the same photos in one page each read the same', async () => {
    const c = await renderCapture({ width: 240, height: 180, seed: 77, format: 'tiff16', ghost: null, exposures: { on: null, off: null, ambient: null } });
    const t = c.truth;
    const regions = { screen: t.screen, background: t.background, ghostOffset: 'none' as const, artifacts: false };
    const single = await analyzeFiles({ on: { name: 'on.tif', bytes: c.on }, off: { name: 'off.tif', bytes: c.off }, ...regions });
    const paged = await analyzeFiles({ on: { name: 'on.tif', bytes: await twoPages(c.on) }, off: { name: 'off.tif', bytes: c.off }, ...regions });
    expect(single.result.warnings.map((w) => w.code)).not.toContain('multi-page');
    const w = paged.result.warnings.find((x) => x.code === 'multi-page');
    expect(w?.message).toMatch(/on photo.* 2 pages; page 1 was measured/);
    expect(paged.result.ambientContrastRatio).toBe(single.result.ambientContrastRatio);
  });
});
