import { describe, expect, it } from 'vitest';
import {
  checkerboardCell,
  GREY_STEP_LINEAR,
  GREY_STEPS,
  greyStepAt,
  orientationLayout,
  PATTERN_KINDS,
  PATTERN_PRESETS,
  renderPattern,
  uniformityPoint,
} from '@/lib/patterns';
import { equal, grey, mirrorX, mirrorY, px, rotate180, rotate90 } from './helpers';

describe('every pattern kind', () => {
  it('lists the eight kinds the route serves', () => {
    expect([...PATTERN_KINDS]).toEqual([
      'white',
      'black',
      'checkerboard',
      'checkerboard-inverse',
      'uniformity',
      'grey-steps',
      'orientation',
      'slanted-edge',
    ]);
  });
  for (const kind of PATTERN_KINDS) {
    it(`${kind} has exactly the requested size, odd sizes and extremes included, and grey pixels`, () => {
      for (const [w, h] of [
        [8, 8],
        [9, 13],
        [16, 16],
        [17, 31],
        [641, 401],
        [8192, 8],
        [8, 8192],
      ] as const) {
        const img = renderPattern(kind, w, h);
        expect(img.width).toBe(w);
        expect(img.height).toBe(h);
        expect(img.channels).toBe(3);
        expect(img.data).toBeInstanceOf(Uint8Array);
        expect(img.data.length).toBe(w * h * 3);
      }
      const img = renderPattern(kind, 97, 61);
      let coloured = 0;
      for (let i = 0; i < img.data.length; i += 3) {
        if (img.data[i + 1] !== img.data[i] || img.data[i + 2] !== img.data[i]) coloured++;
      }
      expect(coloured).toBe(0);
    });
    it(`${kind} refuses sizes under 8 or over 8192, fractions and NaN with a RangeError`, () => {
      for (const [w, h] of [
        [7, 100],
        [100, 7],
        [8193, 100],
        [100, 8193],
        [100.5, 100],
        [Number.NaN, 100],
        [0, 0],
        [-20, 100],
      ]) {
        expect(() => renderPattern(kind, w!, h!)).toThrow(RangeError);
      }
    });
  }
  it('refuses an unknown kind', () => {
    expect(() => renderPattern('zebra' as never, 64, 64)).toThrow(RangeError);
  });
});

describe('white and black', () => {
  it('are all 255 and all 0', () => {
    expect(renderPattern('white', 33, 17).data.every((v) => v === 255)).toBe(true);
    expect(renderPattern('black', 33, 17).data.every((v) => v === 0)).toBe(true);
  });
});

// 4 × 4 checkerboard (published: ANSI/NAPM IT7.228-1997, ANSI/InfoComm 3M-2011): 16 cells, 8 white, 8 black.
describe('checkerboard (published: ANSI/NAPM IT7.228-1997, ANSI/InfoComm 3M-2011, 4 × 4 cells)', () => {
  it('is white top-left and alternates with the parity of row + column', () => {
    for (const [w, h] of [
      [64, 64],
      [1281, 719],
      [17, 23],
    ] as const) {
      const img = renderPattern('checkerboard', w, h);
      let bad = 0;
      for (let y = 0; y < h; y += Math.max(1, Math.floor(h / 37))) {
        for (let x = 0; x < w; x += Math.max(1, Math.floor(w / 41))) {
          const { row, col } = checkerboardCell(x, y, w, h);
          if (grey(img, x, y) !== ((row + col) % 2 === 0 ? 255 : 0)) bad++;
        }
      }
      expect(bad).toBe(0);
      expect(px(img, 0, 0)).toEqual([255, 255, 255]);
      expect(px(img, w - 1, 0)).toEqual([0, 0, 0]);
      expect(px(img, w - 1, h - 1)).toEqual([255, 255, 255]);
    }
  });
  it('puts the cell edges at exact quarters (1280 × 720: columns at 320, 640, 960; rows at 180, 360, 540)', () => {
    const img = renderPattern('checkerboard', 1280, 720);
    for (const x of [320, 640, 960]) expect(grey(img, x - 1, 0)).not.toBe(grey(img, x, 0));
    for (const y of [180, 360, 540]) expect(grey(img, 0, y - 1)).not.toBe(grey(img, 0, y));
    expect(grey(img, 319, 0)).toBe(255);
    expect(grey(img, 320, 0)).toBe(0);
  });
  it('has 8 white and 8 black cells of whole-pixel sizes differing by at most one for odd sizes', () => {
    const w = 1001;
    const h = 601;
    const img = renderPattern('checkerboard', w, h);
    const widths = [0, 0, 0, 0];
    for (let x = 0; x < w; x++) widths[checkerboardCell(x, 0, w, h).col]!++;
    expect(Math.max(...widths) - Math.min(...widths)).toBeLessThanOrEqual(1);
    let white = 0;
    for (let r = 0; r < 4; r++)
      for (let c = 0; c < 4; c++) {
        const x = Math.floor(((c + 0.5) * w) / 4);
        const y = Math.floor(((r + 0.5) * h) / 4);
        if (grey(img, x, y) === 255) white++;
      }
    expect(white).toBe(8);
  });
  it('the inverse is the exact complement', () => {
    for (const [w, h] of [
      [64, 48],
      [333, 77],
    ] as const) {
      const a = renderPattern('checkerboard', w, h);
      const b = renderPattern('checkerboard-inverse', w, h);
      let wrong = 0;
      for (let i = 0; i < a.data.length; i++) if (a.data[i]! + b.data[i]! !== 255) wrong++;
      expect(wrong).toBe(0);
      expect(grey(b, 0, 0)).toBe(0);
    }
  });
});

describe('grey steps (equal linear luminance; sRGB coding per IEC 61966-2-1:1999, published, values derived)', () => {
  it('targets 0, 0.1, …, 1 with codes that decode close to the targets', () => {
    expect(GREY_STEPS.map((s) => s.target)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    expect(GREY_STEP_LINEAR).toHaveLength(11);
    expect(GREY_STEPS[0]?.code).toBe(0);
    expect(GREY_STEPS[10]?.code).toBe(255);
    expect(GREY_STEP_LINEAR[0]).toBe(0);
    expect(GREY_STEP_LINEAR[10]).toBe(1);
    for (const s of GREY_STEPS) expect(Math.abs(s.linear - s.target)).toBeLessThan(0.005);
    for (let i = 1; i < 11; i++) expect(GREY_STEPS[i]!.code).toBeGreaterThan(GREY_STEPS[i - 1]!.code);
  });
  it('encodes 50% linear as code 188, whose decoded value is 0.5028864580 (docs/references.md sRGB table; derived)', () => {
    const half = GREY_STEPS[5]!;
    expect(half.code).toBe(188);
    expect(half.linear).toBeCloseTo(0.502886458, 9);
  });
  it('draws eleven full-height bands left to right with those codes', () => {
    const w = 1100;
    const h = 20;
    const img = renderPattern('grey-steps', w, h);
    for (let i = 0; i < 11; i++) {
      const x = i * 100 + 50;
      expect(grey(img, x, 0)).toBe(GREY_STEPS[i]!.code);
      expect(grey(img, x, h - 1)).toBe(GREY_STEPS[i]!.code);
      expect(grey(img, i * 100, 5)).toBe(GREY_STEPS[i]!.code);
    }
    expect(greyStepAt(w - 1, w)).toBe(10);
    const odd = renderPattern('grey-steps', 37, 16);
    const seen = new Set<number>();
    for (let x = 0; x < 37; x++) seen.add(grey(odd, x, 0));
    expect(seen.size).toBe(11);
  });
});

describe('uniformity grid', () => {
  it('is a white field with grey marks and an open white centre at each of the nine points', () => {
    const w = 1920;
    const h = 1080;
    const img = renderPattern('uniformity', w, h);
    let marked = 0;
    let other = 0;
    for (let i = 0; i < img.data.length; i += 3) {
      const v = img.data[i]!;
      if (v === 128) marked++;
      else if (v !== 255) other++;
    }
    expect(other).toBe(0);
    expect(marked).toBeGreaterThan(0);
    expect(marked / (w * h)).toBeLessThan(0.01);
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++) {
        const p = uniformityPoint(r, c, w, h);
        expect(grey(img, Math.floor(p.x), Math.floor(p.y))).toBe(255);
      }
  });
  it('carries a mark near every one of the nine points', () => {
    const w = 900;
    const h = 600;
    const img = renderPattern('uniformity', w, h);
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++) {
        const p = uniformityPoint(r, c, w, h);
        let found = false;
        for (let dy = -40; dy <= 40 && !found; dy++)
          for (let dx = -40; dx <= 40 && !found; dx++)
            if (grey(img, Math.floor(p.x) + dx, Math.floor(p.y) + dy) === 128) found = true;
        expect(found).toBe(true);
      }
  });
  it('gives every cell the same pixel sum when the sides divide by three (marks do not bias ratios)', () => {
    for (const [w, h] of [
      [960, 540],
      [48, 48],
    ] as const) {
      const img = renderPattern('uniformity', w, h);
      const sums: number[] = [];
      for (let r = 0; r < 3; r++)
        for (let c = 0; c < 3; c++) {
          let s = 0;
          for (let y = (r * h) / 3; y < ((r + 1) * h) / 3; y++)
            for (let x = (c * w) / 3; x < ((c + 1) * w) / 3; x++) s += grey(img, x, y);
          sums.push(s);
        }
      expect(new Set(sums).size).toBe(1);
    }
  });
  it('refuses a grid index outside 0…2', () => {
    expect(() => uniformityPoint(3, 0, 100, 100)).toThrow(RangeError);
  });
});

describe('orientation marker', () => {
  const sizes = [
    [16, 16],
    [64, 64],
    [1280, 720],
    [321, 479],
  ] as const;
  for (const [w, h] of sizes) {
    it(`at ${w} × ${h} differs from its left-right mirror, its up-down mirror and its 180° and 90° turns`, () => {
      const img = renderPattern('orientation', w, h);
      expect(equal(img, mirrorX(img))).toBe(false);
      expect(equal(img, mirrorY(img))).toBe(false);
      expect(equal(img, rotate180(img))).toBe(false);
      if (w === h) {
        expect(equal(img, rotate90(img))).toBe(false);
        expect(equal(img, rotate90(rotate180(img)))).toBe(false);
        expect(equal(img, mirrorX(rotate90(img)))).toBe(false);
        expect(equal(img, mirrorY(rotate90(img)))).toBe(false);
      }
    });
  }
  it('has the notch in the top-left corner only, and the glyph\'s bars pointing right', () => {
    const w = 800;
    const h = 480;
    const img = renderPattern('orientation', w, h);
    const { glyph, notch } = orientationLayout(w, h);
    expect(grey(img, 0, 0)).toBe(255);
    expect(grey(img, notch.size - 1, notch.size - 1)).toBe(255);
    expect(grey(img, w - 1, 0)).toBe(0);
    expect(grey(img, 0, h - 1)).toBe(0);
    expect(grey(img, w - 1, h - 1)).toBe(0);
    // Stem on the left, top bar reaching right, nothing at the bottom right of the glyph box.
    expect(grey(img, glyph.x + 1, glyph.y + glyph.h - 2)).toBe(255);
    expect(grey(img, glyph.x + glyph.w - 2, glyph.y + 1)).toBe(255);
    expect(grey(img, glyph.x + glyph.w - 2, glyph.y + glyph.h - 2)).toBe(0);
    expect(glyph.x + glyph.w).toBeLessThanOrEqual(w);
    expect(glyph.y + glyph.h).toBeLessThanOrEqual(h);
  });
});

describe('presets', () => {
  it('include the common small-display resolutions, each renderable', () => {
    const ids = PATTERN_PRESETS.map((p) => `${p.width}x${p.height}`);
    for (const need of ['640x400', '1280x720', '1920x1080', '854x480', '1024x600', '800x480', '320x240', '1920x1200']) {
      expect(ids).toContain(need);
    }
    expect(new Set(PATTERN_PRESETS.map((p) => p.id)).size).toBe(PATTERN_PRESETS.length);
    for (const p of PATTERN_PRESETS) {
      expect(p.id).toBe(`${p.width}x${p.height}`);
      expect(() => renderPattern('checkerboard', p.width, p.height)).not.toThrow();
    }
  });
});
