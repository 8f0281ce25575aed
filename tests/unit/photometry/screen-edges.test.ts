import { describe, expect, it } from 'vitest';
import { refineGhostOffset, refineScreenEdges } from '../../../lib/photometry/screen-edges';
import type { PhotoRaster, Rect } from '../../../lib/photometry/types';

// Grey 8-bit photos drawn by hand: a room at code 60, a screen at code 200 on the on photo, and
// optionally a faint copy of the screen (code 90 over the room) displaced by a ghost offset.
function photos(width: number, height: number, screen: Rect, ghost: { dx: number; dy: number } | null): { on: PhotoRaster; off: PhotoRaster } {
  const on = new Uint8Array(width * height).fill(60);
  const off = new Uint8Array(width * height).fill(60);
  const inside = (x: number, y: number, r: Rect) => x >= r.x && x < r.x + r.w && y >= r.y && y < r.y + r.h;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      if (inside(x, y, screen)) on[y * width + x] = 200;
      else if (ghost && inside(x, y, { ...screen, x: screen.x + ghost.dx, y: screen.y + ghost.dy })) on[y * width + x] = 90;
    }
  }
  const raster = (data: Uint8Array): PhotoRaster => ({ data, width, height, channels: 1, bitDepth: 8, encoding: 'srgb' });
  return { on: raster(on), off: raster(off) };
}
const src = (raster: PhotoRaster) => ({ raster, offset: { dx: 0, dy: 0 }, scale: 1 });

describe('screen edges put to the pixel after block-wise detection', () => {
  const truth: Rect = { x: 203, y: 131, w: 397, h: 251 };
  const { on, off } = photos(800, 520, truth, null);

  it('moves each edge of a guess up to a block off onto the true edge', () => {
    for (const factor of [3, 6, 8]) {
      const guess = { x: truth.x + factor - 1, y: truth.y - factor + 1, w: truth.w - 2 * factor + 3, h: truth.h + factor };
      expect(refineScreenEdges(guess, src(on), src(off), factor), `factor ${factor}`).toEqual(truth);
    }
  });

  it('leaves the guess alone without downsampling, and where no step is seen', () => {
    const guess = { x: 210, y: 140, w: 380, h: 240 };
    expect(refineScreenEdges(guess, src(on), src(off), 1)).toEqual(guess);
    const flat = photos(800, 520, { x: 0, y: 0, w: 1, h: 1 }, null);
    expect(refineScreenEdges(guess, src(flat.off), src(flat.off), 4)).toEqual(guess);
  });

  it('keeps an edge whose strip would leave the image', () => {
    const edge = photos(400, 300, { x: 0, y: 40, w: 200, h: 100 }, null);
    const r = refineScreenEdges({ x: 0, y: 44, w: 204, h: 92 }, src(edge.on), src(edge.off), 4);
    expect(r).toEqual({ x: 0, y: 40, w: 200, h: 100 });
  });
});

describe('ghost offset put to the pixel from the ghost’s own edges', () => {
  const screen: Rect = { x: 300, y: 200, w: 400, h: 260 };
  for (const ghost of [{ dx: 47, dy: 29 }, { dx: -53, dy: -31 }, { dx: 41, dy: -37 }]) {
    it(`finds ${ghost.dx},${ghost.dy} from a guess a few pixels off`, () => {
      const { on, off } = photos(1000, 700, screen, ghost);
      const guess = { dx: ghost.dx + 3, dy: ghost.dy - 4 };
      expect(refineGhostOffset(screen, guess, src(on), src(off), 6)).toEqual(ghost);
    });
  }

  it('reads a component too close to the screen beside it, where the ghost stands alone', () => {
    // dx = 5 is within the strip's reach of the screen's right edge; below the screen the ghost's right edge is clear
    const { on, off } = photos(1000, 700, screen, { dx: 5, dy: 40 });
    const r = refineGhostOffset(screen, { dx: 6, dy: 42 }, src(on), src(off), 4);
    expect(r).toEqual({ dx: 5, dy: 40 });
  });
});
