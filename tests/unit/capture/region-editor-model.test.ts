import { describe, expect, it } from 'vitest';
import { clampRect, dragRegion, ghostRect, handleSize, hitTest, nudgeRegion, photoToScreen, putRegion, screenToPhoto, strokeWidth, type Region } from '../../../components/capture/region-editor-model';

const W = 4000;
const H = 3000;
const screen: Region = { kind: 'screen', x: 1000, y: 800, w: 1600, h: 1200, source: 'marked' };
const background: Region = { kind: 'background', x: 100, y: 100, w: 500, h: 400, source: 'marked' };

describe('scaling between the screen and the photo', () => {
  // a 4000 × 3000 photo shown 800 × 600 at (50, 20): one screen pixel is five photo pixels
  const box = { left: 50, top: 20, width: 800, height: 600 };

  it('maps screen points to photo pixels and back', () => {
    expect(screenToPhoto(50, 20, box, W, H)).toEqual({ x: 0, y: 0 });
    expect(screenToPhoto(850, 620, box, W, H)).toEqual({ x: 4000, y: 3000 });
    expect(screenToPhoto(250, 170, box, W, H)).toEqual({ x: 1000, y: 750 });
    expect(photoToScreen({ x: 1000, y: 750 }, box, W, H)).toEqual({ x: 250, y: 170 });
  });

  it('keeps the scale when zoomed (the box grows, the photo does not)', () => {
    const zoomed = { left: -750, top: -580, width: 3200, height: 2400 };
    expect(screenToPhoto(50, 20, zoomed, W, H)).toEqual({ x: 1000, y: 750 });
  });

  it('answers the origin for a box with no size rather than dividing by zero', () => {
    expect(screenToPhoto(10, 10, { left: 0, top: 0, width: 0, height: 0 }, W, H)).toEqual({ x: 0, y: 0 });
  });

  it('sizes handles and strokes in photo pixels so they look the same on large photos', () => {
    expect(handleSize(800)).toBe(12);
    expect(handleSize(1600)).toBe(12);
    expect(handleSize(6400)).toBe(48);
    expect(strokeWidth(3200)).toBe(4);
  });
});

describe('clamping', () => {
  it('rounds to whole pixels and keeps the rectangle inside the photo', () => {
    expect(clampRect({ x: -20.4, y: 10.6, w: 100.4, h: 50.5 }, W, H)).toEqual({ x: 0, y: 11, w: 100, h: 51 });
    expect(clampRect({ x: 3950, y: 2990, w: 100, h: 100 }, W, H)).toEqual({ x: 3900, y: 2900, w: 100, h: 100 });
  });

  it('shrinks what is larger than the photo and never goes below 1 × 1', () => {
    expect(clampRect({ x: 5, y: 5, w: 9000, h: 0.2 }, W, H)).toEqual({ x: 0, y: 5, w: 4000, h: 1 });
  });

  it('keeps the other fields', () => {
    expect(clampRect(screen, W, H)).toEqual(screen);
  });
});

describe('hit testing', () => {
  const regions = [background, screen];
  const handle = handleSize(W);

  it('grabs a corner handle of the active region within half a handle', () => {
    expect(hitTest(regions, { x: 1000 + handle / 2, y: 800 - handle / 2 }, 'screen', handle)).toEqual({ mode: 'resize', kind: 'screen', corner: 'nw' });
    expect(hitTest(regions, { x: 2600, y: 2000 }, 'screen', handle)).toEqual({ mode: 'resize', kind: 'screen', corner: 'se' });
    expect(hitTest(regions, { x: 2600, y: 800 }, 'screen', handle).corner).toBe('ne');
    expect(hitTest(regions, { x: 1000, y: 2000 }, 'screen', handle).corner).toBe('sw');
  });

  it('offers no handles on a region that is not active', () => {
    expect(hitTest(regions, { x: 1000, y: 800 }, 'background', handle)).toEqual({ mode: 'move', kind: 'screen' });
  });

  it('moves the region under the pointer, the active one first where they overlap', () => {
    const ghost: Region = { kind: 'ghost', x: 1500, y: 1000, w: 1600, h: 1200, source: 'marked' };
    expect(hitTest([screen, ghost], { x: 2000, y: 1500 }, 'screen', handle)).toEqual({ mode: 'move', kind: 'screen' });
    expect(hitTest([screen, ghost], { x: 2000, y: 1500 }, 'background', handle)).toEqual({ mode: 'move', kind: 'ghost' });
  });

  it('draws the active kind on empty photo', () => {
    expect(hitTest(regions, { x: 3500, y: 2800 }, 'ghost', handle)).toEqual({ mode: 'draw', kind: 'ghost' });
    expect(hitTest([], { x: 10, y: 10 }, 'screen', handle)).toEqual({ mode: 'draw', kind: 'screen' });
  });
});

describe('dragging', () => {
  it('draws a rectangle spanning the press and the pointer, whichever way the drag goes', () => {
    const d = { mode: 'draw' as const, kind: 'background' as const, start: { x: 300, y: 400 }, orig: null };
    expect(dragRegion(d, { x: 100, y: 500 })).toEqual({ kind: 'background', x: 100, y: 400, w: 200, h: 100, source: 'marked' });
  });

  it('moves the original by the pointer travel and marks it by hand', () => {
    const d = { mode: 'move' as const, kind: 'screen' as const, start: { x: 1500, y: 1500 }, orig: { ...screen, source: 'detected' as const } };
    expect(dragRegion(d, { x: 1530, y: 1490 })).toEqual({ ...screen, x: 1030, y: 790, source: 'marked' });
  });

  it('resizes from a corner while the opposite corner stays', () => {
    const nw = dragRegion({ mode: 'resize', kind: 'screen', corner: 'nw', start: { x: 1000, y: 800 }, orig: screen }, { x: 900, y: 850 });
    expect(nw).toEqual({ ...screen, x: 900, y: 850, w: 1700, h: 1150 });
    const se = dragRegion({ mode: 'resize', kind: 'screen', corner: 'se', start: { x: 2600, y: 2000 }, orig: screen }, { x: 2700, y: 1900 });
    expect(se).toEqual({ ...screen, w: 1700, h: 1100 });
  });

  it('never turns a rectangle inside out: a corner dragged past its opposite stops 1 px short', () => {
    const r = dragRegion({ mode: 'resize', kind: 'screen', corner: 'nw', start: { x: 1000, y: 800 }, orig: screen }, { x: 5000, y: 5000 });
    expect(r).toMatchObject({ x: 2599, y: 1999, w: 1, h: 1 });
    const l = dragRegion({ mode: 'resize', kind: 'screen', corner: 'se', start: { x: 2600, y: 2000 }, orig: screen }, { x: 0, y: 0 });
    expect(l).toMatchObject({ x: 1000, y: 800, w: 1, h: 1 });
  });

  it('has nothing to move or resize without an original', () => {
    expect(dragRegion({ mode: 'move', kind: 'ghost', start: { x: 0, y: 0 }, orig: null }, { x: 5, y: 5 })).toBeNull();
  });

  it('replaces the region of its kind, clamped to the photo', () => {
    const out = putRegion([background, screen], { ...screen, x: 3000.4 }, W, H);
    expect(out).toEqual([background, { ...screen, x: 2400 }]);
  });
});

describe('keyboard nudges', () => {
  it('moves by 1 px, 10 with Shift, and sizes with Alt', () => {
    expect(nudgeRegion(screen, 'ArrowLeft', { shift: false, alt: false })).toMatchObject({ x: 999, y: 800, w: 1600 });
    expect(nudgeRegion(screen, 'ArrowDown', { shift: true, alt: false })).toMatchObject({ x: 1000, y: 810 });
    expect(nudgeRegion(screen, 'ArrowRight', { shift: true, alt: true })).toMatchObject({ x: 1000, w: 1610 });
    expect(nudgeRegion(screen, 'Enter', { shift: false, alt: false })).toBeNull();
  });
});

describe('the detected ghost on the photo', () => {
  it('is the screen translated by the ghost offset, fractional offsets kept', () => {
    expect(ghostRect(screen, { dx: 80, dy: -50 }, W, H)).toEqual({ x: 1080, y: 750, w: 1600, h: 1200 });
    expect(ghostRect(screen, { dx: 12.5, dy: 0.3 }, W, H)).toEqual({ x: 1012.5, y: 800.3, w: 1600, h: 1200 });
  });

  it('is cut to the photo, and null when it lies wholly outside', () => {
    expect(ghostRect(screen, { dx: 2000, dy: 0 }, W, H)).toEqual({ x: 3000, y: 800, w: 1000, h: 1200 });
    expect(ghostRect(screen, { dx: -2700, dy: 0 }, W, H)).toBeNull();
  });
});
