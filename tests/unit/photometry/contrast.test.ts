import { describe, expect, it } from 'vitest';
import { checkerboardContrast, contrastRatio, michelson, uniformity, weber } from '../../../lib/photometry';

describe('contrast definitions (published: lighting glossaries, NUREG-0700 rev. 3; see-through CR common practice)', () => {
  it('L_on 1200, L_off 1000 cd/m² → CR 1.200, Weber 0.200, Michelson 0.0909 (derived)', () => {
    expect(contrastRatio(1200, 1000)).toBeCloseTo(1.2, 12);
    expect(weber(1200, 1000)).toBeCloseTo(0.2, 12);
    expect(michelson(1200, 1000)).toBeCloseTo(0.0909, 4);
  });

  it.each([
    [1.2, 0.0909],
    [1.5, 0.2],
    [2, 0.3333],
    [3, 0.5],
  ])('CR %f ↔ Michelson %f (derived)', (cr, m) => {
    expect(michelson(cr, 1)).toBeCloseTo(m, 4);
  });

  it('gives Michelson 0 for two zeros and refuses NaN', () => {
    expect(michelson(0, 0)).toBe(0);
    expect(() => michelson(Number.NaN, 1)).toThrow(RangeError);
  });
});

describe('checkerboard contrast — ANSI/NAPM IT7.228-1997, ANSI/InfoComm 3M-2011 (published; example derived)', () => {
  const whites = [210, 205, 198, 202, 207, 200, 196, 203];
  const blacks = [0.52, 0.49, 0.55, 0.5, 0.48, 0.53, 0.51, 0.5];
  const board = (whiteParity: 0 | 1): number[] => {
    const cells: number[] = [];
    let w = 0;
    let b = 0;
    for (let k = 0; k < 16; k++) {
      const parity = ((k % 4) + Math.floor(k / 4)) % 2;
      cells.push(parity === whiteParity ? (whites[w++] as number) : (blacks[b++] as number));
    }
    return cells;
  };

  it('gives means 202.625 and 0.510 and CR 397.30 with white at the top-left', () => {
    const r = checkerboardContrast(board(0));
    expect(r.white).toBeCloseTo(202.625, 9);
    expect(r.black).toBeCloseTo(0.51, 9);
    expect(r.ansiContrast).toBeCloseTo(397.3, 2);
    expect(r.whiteParity).toBe(0);
  });

  it('finds the same CR when the other corner is white (parity by measured level)', () => {
    const r = checkerboardContrast(board(1));
    expect(r.ansiContrast).toBeCloseTo(397.3, 2);
    expect(r.whiteParity).toBe(1);
  });

  it('needs exactly 16 finite cells', () => {
    expect(() => checkerboardContrast([1, 2, 3])).toThrow(RangeError);
    expect(() => checkerboardContrast(Array.from({ length: 16 }, () => Number.NaN))).toThrow(RangeError);
  });
});

describe('uniformity over 9 points (published: panel data sheets; check derived)', () => {
  it('gives min/max 0.882353, max/min 1.133333, (max − min)/mean 0.124138', () => {
    const u = uniformity([100, 95, 90, 98, 102, 97, 93, 99, 96]);
    expect(u.minOverMax).toBeCloseTo(0.882353, 6);
    expect(u.maxOverMin).toBeCloseTo(1.133333, 6);
    expect(u.spread).toBeCloseTo(0.124138, 6);
    expect(u.cells).toHaveLength(9);
  });

  it('is 1 for a perfectly even grid and refuses an empty or NaN one', () => {
    expect(uniformity([5, 5, 5]).minOverMax).toBe(1);
    expect(() => uniformity([])).toThrow(RangeError);
    expect(() => uniformity([1, Number.NaN])).toThrow(RangeError);
  });
});
