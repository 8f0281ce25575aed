// The capture page's readings panel: each figure with its unit, its one-line definition and ± its
// standard uncertainty, the optics' own transmission and the veil among them. Invented values.
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { metrics, ReadingsPanel } from '../../../components/capture/readings-panel';
import type { Reading } from '../../../db/queries/readings';
import { METRIC_FORMATS } from '../../../lib/format/metrics';
import type { CaptureResult } from '../../../lib/photometry/result';

const result = {
  engineVersion: '1.2.0',
  image: { width: 640, height: 480 },
  pattern: 'full',
  registration: { off: { dx: 0, dy: 0 }, ambient: { dx: 0, dy: 0 }, dark: null },
  screen: { x: 200, y: 160, w: 240, h: 168, source: 'marked' },
  background: null,
  luminance: { on: 0.52, off: 0.0952, ambient: 0.1274, dark: null },
  absoluteLuminance: null,
  ambientContrastRatio: 5.4705,
  michelson: 0.6905,
  ansiContrast: null,
  checkerboard: null,
  uniformity: 0.9112,
  uniformityCells: null,
  ghost: { ratio: 0.0401, dx: 60.3, dy: 40.6, source: 'detected', firstOrder: 0.04, snr: 250 },
  variants: { onMinusOff: { ghost: null, uniformity: null, uniformityCells: null }, dark: null },
  transmission: 0.7297,
  tint: { dx: 0.001, dy: -0.002, deltaE00: 0.41, off: { x: 0.31, y: 0.33 }, ambient: { x: 0.31, y: 0.33 } },
  clippedFraction: 0,
  clippedByPhoto: {},
  exposure: { known: false, scales: {} },
  warnings: [],
  transmissionOptics: 0.70123,
  veil: { relative: 0.0296, cdm2: 1.84, channels: { r: { t: 0.62, veil: 0.03 }, g: { t: 0.7, veil: 0.029 }, b: { t: 0.55, veil: 0.031 } }, rangeRatio: 2.23, source: 'background' },
  uncertainty: { ambientContrastRatio: 0.0011, michelson: 0.00005, uniformity: 0.0004, ghostRatio: 0.00016, transmission: 0.00017, transmissionOptics: 0.00104, veil: 0.00106 },
} as unknown as CaptureResult;

const reading = {
  id: 'r', analysisId: 'a', captureSetId: 'c', revisionId: 'v', projectId: 'p', variant: '', engineVersion: '1.2.0',
  ambientContrastRatio: 5.4705, michelson: 0.6905, ansiContrast: null, uniformity: 0.9112, ghostRatio: 0.0401, transmission: 0.7297, tintDeltaE00: 0.41,
  transmissionOptics: 0.70123, veil: 0.0296, veilCdm2: 1.84, mtf50: null, mtf50PerDegree: null, displayDuv: null, colourUniformityDuv: null,
  uncertainty: result.uncertainty ?? {}, clippedFraction: 0, warningCount: 0, result, artifacts: {}, createdAt: new Date('2026-12-05T12:00:00Z'),
} as Reading;

describe('readings panel', () => {
  const rows = metrics(reading);
  const row = (key: string) => rows.find((r) => r.key === key);

  it('shows the optics\' own transmission and the veil with their unit, definition and ± uncertainty', () => {
    expect(row('transmissionOptics')).toMatchObject({ label: 'Transmission of the optics', value: '70.12 ± 0.10', definition: METRIC_FORMATS.transmissionOptics.definition });
    expect(row('transmissionOptics')?.unit).toMatch(/^% · R 62\.0 · G 70\.0 · B 55\.0 %$/);
    expect(row('veil')).toMatchObject({ label: 'Veil', value: '2.96 ± 0.11', definition: METRIC_FORMATS.veil.definition });
    expect(row('veil')?.unit).toContain('cd/m²');
    expect(row('veil')?.unit).toContain('room range 2.2 : 1');
  });

  it('gives every catalogued figure ± its uncertainty, with its unit', () => {
    expect(row('acr')).toMatchObject({ value: '5.4705 ± 0.0011', unit: 'ratio' });
    expect(row('ghost')?.value).toBe('4.010 ± 0.016');
    expect(row('ghost')?.unit).toBe('% · at (60.3, 40.6) px');
    expect(row('uniformity')?.value).toBe('0.91120 ± 0.00040');
    expect(row('transmission')?.value).toBe('72.970 ± 0.017');
    // no uncertainty for the tint: three significant digits
    expect(row('tint')?.value).toBe('0.410');
    for (const r of rows.filter((x) => ['acr', 'michelson', 'uniformity', 'ghost', 'transmission', 'transmissionOptics', 'veil'].includes(x.key))) expect(r.definition.length).toBeGreaterThan(20);
  });

  it('leaves the two rows out for readings of older engines, and renders', () => {
    const old = { ...reading, result: { ...result, transmissionOptics: undefined, veil: undefined, uncertainty: undefined } } as Reading;
    const keys = metrics(old).map((r) => r.key);
    expect(keys).not.toContain('transmissionOptics');
    expect(keys).not.toContain('veil');
    expect(metrics(old).find((r) => r.key === 'acr')?.value).toBe('5.47');
    const html = renderToStaticMarkup(createElement(ReadingsPanel, { reading, analyses: [], captureSetId: 'c', selectedId: null }));
    expect(html).toContain('data-metric="veil"');
    expect(html).toContain('data-testid="acr-uncertainty"');
  });
});
