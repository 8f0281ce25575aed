import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { METRIC_FORMATS, formatMetricValue, formatMetricWithU, metricHeading } from '../../../lib/format';
import { CSV_HEADERS } from '../../../lib/server/reports/csv';
import { pdfText } from '../../../lib/reports/pdf';
import { METRIC_KEYS, formatMetric } from '../../../lib/targets/metrics';
import { formatMeanCi } from '../../../lib/targets/series';

const ROOT = join(__dirname, '../../..');

function files(dir: string): string[] {
  const abs = join(ROOT, dir);
  if (statSync(abs).isFile()) return [dir];
  return readdirSync(abs).flatMap((f) => files(join(dir, f)));
}

// The screens, the PDF and the CSV headers that show metrics; only lib/format turns numbers into text.
const SHOWN = [
  'app/(lab)/projects',
  'components/trends',
  'components/targets',
  'components/compare',
  'components/stack',
  'components/revisions',
  'components/charts',
  'lib/server/reports/build.ts',
  'lib/server/reports/capture.ts',
  'components/capture/readings-panel.tsx',
  'lib/reports/pdf.ts',
  'lib/server/reports/csv.ts',
  'lib/targets/compare.ts',
  'lib/targets/evaluate.ts',
  'lib/targets/series.ts',
  'lib/server/targets/notify.ts',
  'lib/targets/metrics.ts',
].flatMap(files).filter((f) => /\.(ts|tsx)$/.test(f));

describe('one way to show each number', () => {
  it('no screen, PDF or CSV module rounds a number itself: they all call lib/format', () => {
    expect(SHOWN.length).toBeGreaterThan(20);
    const offenders: string[] = [];
    for (const f of SHOWN) {
      const src = readFileSync(join(ROOT, f), 'utf8');
      src.split('\n').forEach((line, i) => {
        // tick positions are numbers for the chart library, not text
        if (/\.toFixed\(|\.toPrecision\(|toLocaleString\(/.test(line) && !/ticks\.push\(Number\(/.test(line)) offenders.push(`${f}:${i + 1}: ${line.trim()}`);
      });
    }
    expect(offenders).toEqual([]);
  });

  it('every metric has its entry in the one catalogue, and the CSV headers come from it', () => {
    for (const k of METRIC_KEYS) {
      expect(METRIC_FORMATS[k].label.length).toBeGreaterThan(0);
      expect(CSV_HEADERS).toContain(METRIC_FORMATS[k].csvHeader);
    }
  });

  it('the readings of engine 1.2.0 are in the catalogue with a unit, a one-line definition and their CSV column, and print ± their uncertainty', () => {
    for (const k of ['transmissionOptics', 'veil', 'mtf50', 'mtf50PerDegree', 'displayDuv', 'colourUniformityDuv'] as const) {
      expect(METRIC_KEYS).toContain(k);
      expect(CSV_HEADERS).toContain(METRIC_FORMATS[k].csvHeader);
    }
    for (const k of METRIC_KEYS) {
      const d = METRIC_FORMATS[k].definition;
      expect(d.length, k).toBeGreaterThan(20);
      expect(d, k).not.toMatch(/\n/);
    }
    expect(metricHeading('transmissionOptics')).toBe('Transmission of the optics (%)');
    expect(metricHeading('veil')).toBe('Veil (%)');
    expect(metricHeading('mtf50')).toBe('MTF50 (cy/px)');
    expect(metricHeading('mtf50PerDegree')).toBe('MTF50 per degree (cy/°)');
    expect(metricHeading('displayDuv')).toBe('Display white error (Δu′v′)');
    expect(formatMetricValue('mtf50', 0.3127)).toBe('0.313 cy/px');
    expect(formatMetricValue('colourUniformityDuv', 0.00412)).toBe('0.00412 Δu′v′');
    // digits follow the uncertainty's second significant digit (common practice)
    expect(formatMetricWithU('transmissionOptics', 0.70123, 0.00042)).toBe('70.123 ± 0.042 %');
    expect(formatMetricWithU('ambientContrastRatio', 5.34562, 0.0016)).toBe('5.3456 ± 0.0016 : 1');
    expect(formatMetricWithU('veil', 0.0297, null)).toBe(formatMetricValue('veil', 0.0297));
    for (const k of ['mtf50PerDegree', 'displayDuv'] as const) expect(pdfText(formatMetricValue(k, 0.5), true)).toBe(formatMetricValue(k, 0.5));
  });

  it('web and PDF print the same figure for every metric (the PDF with a Unicode font keeps ΔE00)', () => {
    for (const k of METRIC_KEYS) {
      const web = formatMetricValue(k, 0.2018);
      expect(formatMetric(k, 0.2018)).toBe(web);
      expect(pdfText(web, true)).toBe(web);
      expect(formatMeanCi(k, { n: 3, mean: 0.2018, sd: 0.01, low: 0.19, high: 0.21, halfWidth: 0.0123 })).toMatch(/ ± /);
    }
    expect(pdfText('See-through tint (ΔE00)', true)).toBe('See-through tint (ΔE00)');
    expect(pdfText('See-through tint (ΔE00)')).not.toMatch(/dE00/);
  });
});
