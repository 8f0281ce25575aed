import { describe, expect, it } from 'vitest';
import { compareVerdict, formatPValue, levelFromP } from '@/lib/stats';

describe('plain-words verdict', () => {
  it('reads like "raises … by x ± y; 5 vs 5 captures; unlikely to be noise, p = …"', () => {
    const v = compareVerdict({
      baseline: { n: 5, mean: 1.5, sd: 0.08 },
      variant: { n: 5, mean: 1.81, sd: 0.08 },
      subject: 'the polariser',
      metric: 'the ambient contrast ratio',
    });
    expect(v.level).toBe('unlikely-noise');
    expect(v.text).toMatch(/^The polariser raises the ambient contrast ratio by 0\.31 ± 0\.12; 5 vs 5 captures; unlikely to be noise, p (=|<) 0\.00\d/);
    expect(v.comparison?.difference).toBeCloseTo(0.31, 12);
  });
  it('says "lowers" for a drop and adds the unit', () => {
    const v = compareVerdict({ baseline: [10, 11, 12, 10.5], variant: [7, 8, 7.5, 8.2], metric: 'the luminance', unit: 'cd/m²' });
    expect(v.text).toMatch(/^The variant lowers the luminance by [\d.]+ ± [\d.]+ cd\/m²; 4 vs 4 captures;/);
  });
  it('calls a weak difference possible noise', () => {
    const v = compareVerdict({ baseline: [1, 2, 3, 4], variant: [1.5, 2.5, 3.5, 4.2] });
    expect(v.level).toBe('could-be-noise');
    expect(v.text).toMatch(/could be noise, p = 0\.\d\d\.$/);
  });
  it('cannot tell with fewer than 3 captures in either group', () => {
    const v = compareVerdict({ baseline: [1, 2], variant: [5, 6, 7], subject: 'the AR coat', metric: 'the ghost ratio' });
    expect(v.level).toBe('too-few');
    expect(v.comparison).toBeNull();
    expect(v.text).toBe(
      'Too few captures to tell whether the AR coat changes the ghost ratio: 3 vs 2 captures, and at least 3 in each group are needed.',
    );
    expect(compareVerdict({ baseline: [1], variant: [1] }).text).toMatch(/1 vs 1 capture,/);
  });
  it('says "unchanged" for equal groups', () => {
    const v = compareVerdict({ baseline: [1, 2, 3], variant: [1, 2, 3] });
    expect(v.text).toMatch(/leaves the value unchanged/);
    expect(v.text).toMatch(/p = 1\.00/);
  });
  it('words the levels at p < 0.01, < 0.05 and otherwise', () => {
    expect(levelFromP(0.009)).toBe('unlikely-noise');
    expect(levelFromP(0.01)).toBe('probably-real');
    expect(levelFromP(0.049)).toBe('probably-real');
    expect(levelFromP(0.05)).toBe('could-be-noise');
    expect(formatPValue(0.0004)).toBe('p < 0.001');
    expect(formatPValue(0.002)).toBe('p = 0.002');
    expect(formatPValue(0.2345)).toBe('p = 0.23');
    expect(() => formatPValue(Number.NaN)).toThrow(RangeError);
  });
  it('refuses NaN readings', () => {
    expect(() => compareVerdict({ baseline: [1, Number.NaN, 3], variant: [1, 2, 3] })).toThrow(RangeError);
  });
});
