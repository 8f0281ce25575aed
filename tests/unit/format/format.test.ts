import { describe, expect, it } from 'vitest';
import {
  decimalsForUncertainty,
  exact,
  formatIlluminance,
  formatLimit,
  formatLuminance,
  formatMetricDifference,
  formatMetricMeanCi,
  formatMetricSpread,
  formatMetricValue,
  formatPercent,
  formatRatio,
  formatTick,
  fromShown,
  metricHeading,
  METRIC_FORMATS,
  significant,
  TABLE_METRICS,
} from '../../../lib/format';
import { formatMetric, METRIC_KEYS } from '../../../lib/targets/metrics';
import { formatMeanCi } from '../../../lib/targets/series';

describe('number rules', () => {
  it('keep two significant digits of an uncertainty (JCGM 100:2008 GUM §7.2.6: at most two)', () => {
    expect(decimalsForUncertainty(0.2934)).toBe(2);
    expect(decimalsForUncertainty(0.0995)).toBe(2); // rounds to 0.10, still two digits
    expect(decimalsForUncertainty(3.1)).toBe(1);
    expect(decimalsForUncertainty(31)).toBe(0);
    expect(decimalsForUncertainty(0)).toBeNull();
    expect(decimalsForUncertainty(null)).toBeNull();
  });

  it('rounds to significant digits without exponent notation', () => {
    expect(significant(729.7, 2)).toBe('730');
    expect(significant(9.3672, 3)).toBe('9.37');
    expect(significant(0.0024, 3)).toBe('0.00240');
    expect(significant(123456, 3)).toBe('123,000');
    expect(significant(-0.5, 2)).toBe('−0.50');
  });

  it('prints a typed figure as typed', () => {
    expect(exact(1.2)).toBe('1.2');
    expect(exact(30)).toBe('30');
    expect(exact(0.1 + 0.2)).toBe('0.3');
    expect(exact(34260)).toBe('34,260');
  });
});

describe('metric figures', () => {
  it('show ghost and transmission as percentages, contrast as "x : 1", the tint in ΔE00', () => {
    expect(formatMetricValue('ghostRatio', 0.2018)).toBe('20.2 %');
    expect(formatMetricValue('ghostRatio', 0.0024)).toBe('0.240 %');
    expect(formatMetricValue('transmission', 0.758)).toBe('75.8 %');
    expect(formatMetricValue('ambientContrastRatio', 9.3672)).toBe('9.37 : 1');
    expect(formatMetricValue('ambientContrastRatio', 12.345)).toBe('12.3 : 1');
    expect(formatMetricValue('tintDeltaE00', 2.134)).toBe('2.13 ΔE00');
    expect(formatMetricValue('uniformity', 0.8734)).toBe('0.873');
    expect(formatMetricValue('ghostRatio', null)).toBe('—');
    expect(formatMetricValue('ghostRatio', 0.2018, { unit: false })).toBe('20.2');
  });

  it('take their digits from the uncertainty when one is given', () => {
    expect(formatMetricValue('ambientContrastRatio', 2.6571, { uncertainty: 0.2934 })).toBe('2.66 : 1');
    expect(formatMetricMeanCi('ambientContrastRatio', { mean: 2.6571, halfWidth: 0.2934 })).toBe('2.66 ± 0.29 : 1');
    expect(formatMetricMeanCi('transmission', { mean: 0.41234, halfWidth: 0.0312 })).toBe('41.2 ± 3.1 %');
    expect(formatMetricMeanCi('transmission', { mean: 0.41234, halfWidth: null })).toBe('41.2 %');
    expect(formatMetricMeanCi('ghostRatio', { mean: null, halfWidth: null })).toBe('—');
    expect(formatMeanCi('tintDeltaE00', { n: 3, mean: 1.234, sd: 0.1, low: 1, high: 1.5, halfWidth: 0.25 })).toBe('1.23 ± 0.25 ΔE00');
  });

  it('give differences of percentages in points', () => {
    expect(formatMetricDifference('transmission', -0.3104, 0.0291)).toBe('−31.0 ± 2.9 pp');
    expect(formatMetricDifference('transmission', -0.3104, 0.0291, { long: true, signed: false })).toBe('31.0 ± 2.9 percentage points');
    expect(formatMetricDifference('ambientContrastRatio', 5.0512, 0.2871)).toBe('+5.05 ± 0.29');
    expect(formatMetricDifference('ambientContrastRatio', 5.0512, null)).toBe('+5.05');
  });

  it('keep spreads to two digits and limits as typed', () => {
    expect(formatMetricSpread('ghostRatio', 0.001234)).toBe('0.12 %');
    expect(formatLimit('ghostRatio', 0.01)).toBe('1 %');
    expect(formatLimit('ambientContrastRatio', 1.2)).toBe('1.2 : 1');
    expect(fromShown('ghostRatio', 2)).toBeCloseTo(0.02, 12);
  });

  it('head every column with the unit, never "dE00"', () => {
    expect(metricHeading('tintDeltaE00')).toBe('See-through tint (ΔE00)');
    expect(metricHeading('ghostRatio')).toBe('Ghost ratio (%)');
    expect(metricHeading('ambientContrastRatio')).toBe('Ambient contrast ratio');
    for (const k of METRIC_KEYS) expect(metricHeading(k)).not.toMatch(/dE00/);
  });

  it('one catalogue covers every metric, and the old names print the same as the module', () => {
    for (const k of METRIC_KEYS) {
      expect(METRIC_FORMATS[k]).toBeDefined();
      expect(formatMetric(k, 0.123456)).toBe(formatMetricValue(k, 0.123456));
    }
    expect(TABLE_METRICS.every((k) => METRIC_KEYS.includes(k))).toBe(true);
  });

  it('ticks an axis in the shown unit', () => {
    expect(formatTick('transmission', 0.3)).toBe('30');
    expect(formatTick('ambientContrastRatio', 2.5)).toBe('2.5');
  });
});

describe('quantities', () => {
  it('mark a rough luminance estimate and keep only the digits it has', () => {
    expect(formatLuminance(729.7, { estimate: true })).toBe('≈730 cd/m²');
    expect(formatLuminance(729.7)).toBe('730 cd/m²');
    expect(formatLuminance(12000)).toBe('12,000 cd/m²');
    expect(formatLuminance(85.34)).toBe('85.3 cd/m²');
    expect(formatIlluminance(500)).toBe('500 lx');
  });

  it('fold the two contrast formats into "9.37 : 1"', () => {
    expect(formatRatio(9.3672)).toBe('9.37 : 1');
    expect(formatRatio(12.345)).toBe('12.3 : 1');
    expect(formatRatio(1234.4)).toBe('1,230 : 1');
    expect(formatRatio(Number.POSITIVE_INFINITY)).toBe('∞ : 1');
    expect(formatRatio(2.6571, { uncertainty: 0.2934 })).toBe('2.66 : 1');
  });

  it('show planner fractions as percentages to three digits', () => {
    expect(formatPercent(0.1152)).toBe('11.5 %');
    expect(formatPercent(0.0024)).toBe('0.240 %');
    expect(formatPercent(0)).toBe('0 %');
  });
});
