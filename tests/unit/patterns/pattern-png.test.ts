import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { patternPng } from '@/lib/image/pattern-png';
import { renderPattern } from '@/lib/patterns';

describe('pattern PNG', () => {
  it('decodes back to exactly the requested size and the exact pixel values', async () => {
    for (const [kind, w, h] of [
      ['checkerboard', 1281, 719],
      ['grey-steps', 64, 17],
      ['orientation', 320, 240],
    ] as const) {
      const png = await patternPng(kind, w, h);
      expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
      const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
      expect(info.width).toBe(w);
      expect(info.height).toBe(h);
      expect(info.channels).toBe(3);
      expect(Buffer.compare(data, Buffer.from(renderPattern(kind, w, h).data))).toBe(0);
    }
  });
  it('rejects a size under 8 or over 8192 with a RangeError', async () => {
    await expect(patternPng('white', 7, 8)).rejects.toThrow(RangeError);
    await expect(patternPng('white', 8, 7)).rejects.toThrow(RangeError);
    await expect(patternPng('white', 9000, 100)).rejects.toThrow(RangeError);
  });
});
