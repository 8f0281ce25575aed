import { differenceCiede2000, filterDeficiencyDeuter, filterDeficiencyProt, filterDeficiencyTrit, parse, type Color } from 'culori';
import { describe, expect, it } from 'vitest';
import {
  applyDrag,
  checkDraft,
  clampRect,
  cropRect,
  cursorFor,
  dashArray,
  draftChanged,
  draftOf,
  dragHint,
  dragRegion,
  drawingUnits,
  ghostRect,
  handleSize,
  hitTest,
  KEY_HINT,
  keyAction,
  keyStep,
  nudgeRegion,
  photoToScreen,
  putRegion,
  REGION_STYLE,
  sameRegions,
  screenToPhoto,
  strokeWidth,
  type Drag,
  type Region,
} from '../../../components/capture/region-editor-model';

const W = 4000;
const H = 3000;
const screen: Region = { kind: 'screen', x: 1000, y: 800, w: 1600, h: 1200, source: 'marked' };
const background: Region = { kind: 'background', x: 100, y: 100, w: 500, h: 400, source: 'marked' };
// a ghost is the screen's faint copy a few pixels away: the two overlap almost everywhere
const ghost: Region = { kind: 'ghost', x: 1040, y: 830, w: 1600, h: 1200, source: 'marked' };

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

  it('once the drawing is measured, sizes handles, strokes and labels for the width it is shown at', () => {
    // a 6000 px wide photo shown 375 px wide on a phone: one screen pixel is 16 photo pixels
    expect(drawingUnits(6000, 375)).toEqual({ handle: 224, stroke: 32, font: 192 });
    // the same photo zoomed 8× on a 1200 px panel: 0.625 photo pixels a screen pixel
    expect(drawingUnits(6000, 9600)).toEqual({ handle: 8.75, stroke: 1.25, font: 7.5 });
    expect(drawingUnits(800, 0)).toEqual({ handle: 12, stroke: 2, font: 12 });
  });
});

describe('fitting to the photo', () => {
  it('a move rounds to whole pixels and slides the whole rectangle inside the photo', () => {
    expect(clampRect({ x: -20.4, y: 10.6, w: 100.4, h: 50.5 }, W, H)).toEqual({ x: 0, y: 11, w: 100, h: 51 });
    expect(clampRect({ x: 3950, y: 2990, w: 100, h: 100 }, W, H)).toEqual({ x: 3900, y: 2900, w: 100, h: 100 });
  });

  it('a move shrinks what is larger than the photo and never goes below 1 × 1', () => {
    expect(clampRect({ x: 5, y: 5, w: 9000, h: 0.2 }, W, H)).toEqual({ x: 0, y: 5, w: 4000, h: 1 });
  });

  it('keeps the other fields', () => {
    expect(clampRect(screen, W, H)).toEqual(screen);
    expect(cropRect(screen, W, H)).toEqual(screen);
  });

  it('a drawing or resize is cut at the border and its far edge stays put', () => {
    // dragged 50 px past the left edge: the right edge stays at 1650, not pushed to 1700
    expect(cropRect({ x: -50, y: 100, w: 1700, h: 200 }, W, H)).toEqual({ x: 0, y: 100, w: 1650, h: 200 });
    expect(cropRect({ x: 3900, y: 2950.4, w: 300, h: 100 }, W, H)).toEqual({ x: 3900, y: 2950, w: 100, h: 50 });
    expect(cropRect({ x: 4200, y: -9, w: 0, h: 0 }, W, H)).toEqual({ x: 3999, y: 0, w: 1, h: 1 });
  });
});

describe('what a press does with the chosen tool', () => {
  const regions = [background, screen, ghost];
  const handle = handleSize(W);
  const inScreenOnly = { x: 1010, y: 810 };
  const inBoth = { x: 2000, y: 1500 };

  it('the ghost tool draws a new ghost from a press inside the screen, and never grabs the screen', () => {
    expect(hitTest([background, screen], inBoth, 'ghost', handle)).toEqual({ mode: 'draw', kind: 'ghost' });
    expect(hitTest(regions, inScreenOnly, 'ghost', handle)).toEqual({ mode: 'draw', kind: 'ghost' });
    // the screen's corner handle is not the ghost tool's
    expect(hitTest(regions, { x: 1000, y: 800 }, 'ghost', handle)).toEqual({ mode: 'draw', kind: 'ghost' });
  });

  it('the background tool draws a background over the screen', () => {
    expect(hitTest(regions, inScreenOnly, 'background', handle)).toEqual({ mode: 'draw', kind: 'background' });
  });

  it('a kind’s tool moves and resizes only its own rectangle, also where another lies on top', () => {
    expect(hitTest(regions, inBoth, 'screen', handle)).toEqual({ mode: 'move', kind: 'screen' });
    expect(hitTest(regions, inBoth, 'ghost', handle)).toEqual({ mode: 'move', kind: 'ghost' });
    expect(hitTest(regions, { x: 1000 + handle / 2, y: 800 - handle / 2 }, 'screen', handle)).toEqual({ mode: 'resize', kind: 'screen', corner: 'nw' });
    expect(hitTest(regions, { x: 2600, y: 2000 }, 'screen', handle)).toMatchObject({ mode: 'resize', corner: 'se' });
    expect(hitTest(regions, { x: 2600, y: 800 }, 'screen', handle)).toMatchObject({ mode: 'resize', corner: 'ne' });
    expect(hitTest(regions, { x: 1000, y: 2000 }, 'screen', handle)).toMatchObject({ mode: 'resize', corner: 'sw' });
  });

  it('a kind’s tool draws on empty photo, marked or not', () => {
    expect(hitTest(regions, { x: 3500, y: 2800 }, 'screen', handle)).toEqual({ mode: 'draw', kind: 'screen' });
    expect(hitTest([], { x: 10, y: 10 }, 'ghost', handle)).toEqual({ mode: 'draw', kind: 'ghost' });
  });

  it('Select moves the selected rectangle first, then the topmost under the pointer, and never draws', () => {
    expect(hitTest(regions, inBoth, 'select', handle, 'screen')).toEqual({ mode: 'move', kind: 'screen' });
    expect(hitTest(regions, inBoth, 'select', handle, null)).toEqual({ mode: 'move', kind: 'ghost' });
    expect(hitTest(regions, inScreenOnly, 'select', handle, 'background')).toEqual({ mode: 'move', kind: 'screen' });
    expect(hitTest(regions, { x: 2600, y: 2000 }, 'select', handle, 'screen')).toMatchObject({ mode: 'resize', kind: 'screen', corner: 'se' });
    expect(hitTest(regions, { x: 3500, y: 2800 }, 'select', handle, 'screen')).toEqual({ mode: 'none', kind: null });
  });

  it('says what a drag will do, and shows it in the pointer', () => {
    expect(dragHint(hitTest(regions, inScreenOnly, 'ghost', handle), regions)).toBe('Drag to draw a new ghost rectangle (it replaces the marked ghost).');
    expect(dragHint(hitTest([screen], inScreenOnly, 'ghost', handle), [screen])).toBe('Drag to draw the ghost rectangle.');
    expect(dragHint(hitTest(regions, inBoth, 'screen', handle), regions)).toBe('Drag to move the screen.');
    expect(dragHint(hitTest(regions, { x: 2600, y: 2000 }, 'screen', handle), regions)).toBe('Drag to resize the screen from its bottom-right corner.');
    expect(dragHint({ mode: 'none', kind: null }, regions)).toMatch(/pick Screen, Background or Ghost/);
    expect(cursorFor({ mode: 'draw', kind: 'ghost' })).toBe('crosshair');
    expect(cursorFor({ mode: 'move', kind: 'ghost' })).toBe('move');
    expect(cursorFor({ mode: 'resize', kind: 'ghost', corner: 'ne' })).toBe('nesw-resize');
    expect(cursorFor({ mode: 'resize', kind: 'ghost', corner: 'se' })).toBe('nwse-resize');
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
    expect(dragRegion({ mode: 'none', kind: null, start: { x: 0, y: 0 }, orig: null }, { x: 5, y: 5 })).toBeNull();
  });

  it('a drawing under the minimum travel makes nothing (a click does not replace a rectangle with a speck)', () => {
    const d = { mode: 'draw' as const, kind: 'ghost' as const, start: { x: 300, y: 400 }, orig: ghost };
    expect(dragRegion(d, { x: 303, y: 398 }, 5)).toBeNull();
    expect(dragRegion(d, { x: 306, y: 400 }, 5)).toMatchObject({ x: 300, w: 6, h: 0 });
  });

  it('a ghost drawn from inside the screen leaves the screen where it was', () => {
    const regions = [background, screen];
    const hit = hitTest(regions, { x: 1200, y: 1000 }, 'ghost', handleSize(W));
    const d: Drag = { ...hit, start: { x: 1200, y: 1000 }, orig: null };
    const out = applyDrag(regions, d, { x: 2000.6, y: 1600.2 }, W, H, 5);
    expect(out.find((r) => r.kind === 'screen')).toEqual(screen);
    expect(out.find((r) => r.kind === 'background')).toEqual(background);
    expect(out.find((r) => r.kind === 'ghost')).toEqual({ kind: 'ghost', x: 1200, y: 1000, w: 801, h: 600, source: 'marked' });
  });

  it('a drawing that comes back under the minimum restores the rectangle it was replacing', () => {
    const d: Drag = { mode: 'draw', kind: 'ghost', start: { x: 100, y: 100 }, orig: ghost };
    const mid = applyDrag([screen, ghost], d, { x: 400, y: 400 }, W, H, 5);
    expect(mid.find((r) => r.kind === 'ghost')).toMatchObject({ x: 100, y: 100, w: 300, h: 300 });
    expect(applyDrag(mid, d, { x: 101, y: 101 }, W, H, 5)).toEqual([screen, ghost]);
    // with nothing before it, the kind stays unmarked
    expect(applyDrag([screen], { ...d, orig: null }, { x: 101, y: 101 }, W, H, 5)).toEqual([screen]);
  });

  it('a move past the border slides in whole; a resize past it stops at the border', () => {
    const moved = applyDrag([screen], { mode: 'move', kind: 'screen', start: { x: 1500, y: 1500 }, orig: screen }, { x: -2000, y: 1500 }, W, H);
    expect(moved).toEqual([{ ...screen, x: 0 }]);
    const resized = applyDrag([screen], { mode: 'resize', kind: 'screen', corner: 'nw', start: { x: 1000, y: 800 }, orig: screen }, { x: -300, y: 800 }, W, H);
    expect(resized).toEqual([{ ...screen, x: 0, w: 2600 }]);
  });

  it('replaces the region of its kind, fitted to the photo', () => {
    expect(putRegion([background, screen], { ...screen, x: 3000.4 }, W, H)).toEqual([background, { ...screen, x: 2400 }]);
    expect(putRegion([background, screen], { ...screen, x: 3000 }, W, H, 'crop')).toEqual([background, { ...screen, x: 3000, w: 1000 }]);
  });
});

describe('keyboard steps for camera-size photos', () => {
  const none = { shift: false, alt: false };
  const key = (k: string, m: Partial<{ shiftKey: boolean; altKey: boolean; ctrlKey: boolean; metaKey: boolean }> = {}) => ({ key: k, shiftKey: false, altKey: false, ctrlKey: false, metaKey: false, ...m });

  it('steps 1 px, 10 with Shift, 100 with Alt', () => {
    expect(keyStep(none)).toBe(1);
    expect(keyStep({ shift: true, alt: false })).toBe(10);
    expect(keyStep({ shift: false, alt: true })).toBe(100);
    expect(nudgeRegion(screen, 'ArrowLeft', none)).toMatchObject({ x: 999, y: 800, w: 1600 });
    expect(nudgeRegion(screen, 'ArrowDown', { shift: true, alt: false })).toMatchObject({ x: 1000, y: 810 });
    expect(nudgeRegion(screen, 'ArrowRight', { shift: false, alt: true })).toMatchObject({ x: 1100, y: 800, w: 1600 });
    expect(nudgeRegion(screen, 'Enter', none)).toBeNull();
  });

  it('resizes from the right and bottom edges in resize mode, never under 1 px', () => {
    expect(nudgeRegion(screen, 'ArrowRight', { shift: false, alt: true }, 'resize')).toMatchObject({ x: 1000, y: 800, w: 1700, h: 1200 });
    expect(nudgeRegion(screen, 'ArrowUp', { shift: true, alt: false }, 'resize')).toMatchObject({ x: 1000, y: 800, w: 1600, h: 1190 });
    expect(nudgeRegion({ ...screen, w: 50 }, 'ArrowLeft', { shift: false, alt: true }, 'resize')).toMatchObject({ w: 1 });
  });

  it('keeps a moved rectangle whole at the border and stops a grown one at it', () => {
    const nearRight = { ...screen, x: 2350 };
    expect(keyAction(key('ArrowRight', { altKey: true }), nearRight, 'move', W, H)).toEqual({ type: 'nudge', region: { ...screen, x: 2400 } });
    expect(keyAction(key('ArrowRight', { altKey: true }), nearRight, 'resize', W, H)).toEqual({ type: 'nudge', region: { ...screen, x: 2350, w: 1650 } });
  });

  it('R switches moving and resizing, Escape cancels, Ctrl and ⌘ are the browser’s', () => {
    expect(keyAction(key('r'), screen, 'move', W, H)).toEqual({ type: 'toggle-mode' });
    expect(keyAction(key('R', { shiftKey: true }), null, 'move', W, H)).toEqual({ type: 'toggle-mode' });
    expect(keyAction(key('Escape'), null, 'move', W, H)).toEqual({ type: 'cancel' });
    expect(keyAction(key('ArrowLeft', { ctrlKey: true }), screen, 'move', W, H)).toBeNull();
    expect(keyAction(key('ArrowLeft', { metaKey: true }), screen, 'move', W, H)).toBeNull();
    expect(keyAction(key('ArrowLeft'), null, 'move', W, H)).toBeNull();
  });

  it('the on-screen hint names each step and modifier the keys use', () => {
    for (const m of [none, { shift: true, alt: false }, { shift: false, alt: true }]) expect(KEY_HINT).toContain(`${keyStep(m)} px`);
    expect(KEY_HINT).toContain('Shift');
    expect(KEY_HINT).toContain('Alt');
    expect(KEY_HINT).toMatch(/R switches/);
  });
});

describe('typed x, y, w and h', () => {
  it('accepts whole pixels inside the photo', () => {
    expect(checkDraft({ x: '1000', y: ' 800 ', w: '1600', h: '1200' }, W, H)).toEqual({ ok: true, rect: { x: 1000, y: 800, w: 1600, h: 1200 } });
    expect(checkDraft({ x: '0', y: '0', w: '4000', h: '3000' }, W, H).ok).toBe(true);
    expect(checkDraft({ x: '3999', y: '2999', w: '1', h: '1' }, W, H).ok).toBe(true);
  });

  it('refuses what is not a whole number, each field with its own message', () => {
    const out = checkDraft({ x: '', y: '12.5', w: 'abc', h: '0x10' }, W, H);
    expect(out).toEqual({
      ok: false,
      errors: { x: 'Enter a number of pixels', y: 'Whole pixels only: 12.5 is not a whole number', w: '“abc” is not a number of pixels', h: '“0x10” is not a number of pixels' },
    });
  });

  it('keeps the corner inside the photo and names the range', () => {
    const out = checkDraft({ x: '-1', y: '3000', w: '10', h: '10' }, W, H);
    expect(out).toEqual({ ok: false, errors: { x: 'x runs from 0 to 3999 (the photo is 4000 px wide)', y: 'y runs from 0 to 2999 (the photo is 3000 px tall)' } });
  });

  it('keeps the far edges inside the photo and says the largest size that fits', () => {
    const out = checkDraft({ x: '3000', y: '2000', w: '1200', h: '1001' }, W, H);
    expect(out).toEqual({
      ok: false,
      errors: {
        w: 'x + w is 4200 px, past the photo’s right edge at 4000 px: at most 1000 px at x 3000',
        h: 'y + h is 3001 px, past the photo’s bottom edge at 3000 px: at most 1000 px at y 2000',
      },
    });
    expect(checkDraft({ x: '5', y: '5', w: '0', h: '-2' }, W, H)).toEqual({ ok: false, errors: { w: 'The width is at least 1 px', h: 'The height is at least 1 px' } });
    expect(checkDraft({ x: 'a', y: '5', w: '4001', h: '5' }, W, H)).toMatchObject({ ok: false, errors: { w: 'The width is at most 4000 px' } });
  });

  it('tells a typed edit from the values it was made from', () => {
    expect(draftOf(screen)).toEqual({ x: '1000', y: '800', w: '1600', h: '1200' });
    expect(draftOf(null)).toEqual({ x: '', y: '', w: '', h: '' });
    expect(draftChanged({ x: '1000', y: '800 ', w: '1600', h: '1200' }, screen)).toBe(false);
    expect(draftChanged({ x: '1001', y: '800', w: '1600', h: '1200' }, screen)).toBe(true);
    expect(draftChanged({ x: '', y: '', w: '', h: '' }, null)).toBe(false);
  });
});

describe('saved or not', () => {
  it('compares kinds, places, sizes and sources in any order', () => {
    expect(sameRegions([screen, background], [background, screen])).toBe(true);
    expect(sameRegions([screen], [{ ...screen, x: 1001 }])).toBe(false);
    expect(sameRegions([screen], [{ ...screen, source: 'detected' }])).toBe(false);
    expect(sameRegions([screen], [screen, ghost])).toBe(false);
    expect(sameRegions([screen, background], [screen, ghost])).toBe(false);
  });
});

describe('colours, dashes and labels of the three kinds', () => {
  // Okabe & Ito, "Color Universal Design" (2008): the palette's eight colours (common practice)
  const OKABE_ITO = ['#000000', '#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];
  const styles = Object.values(REGION_STYLE);

  it('uses colours of the Okabe–Ito palette, a different dash pattern and a different name for each kind', () => {
    for (const s of styles) expect(OKABE_ITO).toContain(s.colour);
    expect(new Set(styles.map((s) => s.colour)).size).toBe(3);
    expect(new Set(styles.map((s) => s.pattern)).size).toBe(3);
    expect(new Set(styles.map((s) => s.name)).size).toBe(3);
    expect(new Set(styles.map((s) => dashArray(s.pattern, 2))).size).toBe(3);
    expect(dashArray('solid', 2)).toBeUndefined();
    expect(dashArray('dashed', 2)).toBe('12 6');
  });

  // oracle: culori's colour-vision-deficiency filters (Machado, Oliveira & Fernandes 2009) and its
  // CIEDE2000; 20 units is far above the 2–5 units of a just-noticeable difference (common practice)
  type View = (c: Color) => Color;
  const colour = (s: string): Color => {
    const c = parse(s);
    if (!c) throw new Error(`not a colour: ${s}`);
    return c;
  };
  const de = differenceCiede2000();
  const views: Record<string, View> = { normal: (c) => c, protan: filterDeficiencyProt(1) as View, deutan: filterDeficiencyDeuter(1) as View, tritan: filterDeficiencyTrit(1) as View };
  const apart = (view: View, a: string, b: string) => de(view(colour(a)), view(colour(b)));

  it('keeps the three colours apart under simulated protan, deutan and tritan vision', () => {
    for (const [name, view] of Object.entries(views)) {
      for (let a = 0; a < styles.length; a++) {
        for (let b = a + 1; b < styles.length; b++) {
          const p = styles[a] as (typeof styles)[number];
          const q = styles[b] as (typeof styles)[number];
          expect(apart(view, p.colour, q.colour), `${name}: ${p.name} against ${q.name}`).toBeGreaterThan(20);
        }
      }
    }
  });

  it('the same check refuses the theme’s teal and green the screen and background had before', () => {
    // dark theme --beam rgb(94 214 196) and --pass rgb(92 201 129): about 6 units apart under tritan vision
    expect(apart(views.tritan as View, 'rgb(94, 214, 196)', 'rgb(92, 201, 129)')).toBeLessThan(20);
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
