import { formatMetricValue, metricHeading, METRIC_FORMATS } from '../format/metrics';

/** The measured quantities a team can trend, compare and set targets on. */
export const METRIC_KEYS = [
  'ambientContrastRatio',
  'michelson',
  'ansiContrast',
  'uniformity',
  'ghostRatio',
  'transmission',
  'tintDeltaE00',
  'transmissionOptics',
  'veil',
  'mtf50',
  'mtf50PerDegree',
  'displayDuv',
  'colourUniformityDuv',
] as const;
export type MetricKey = (typeof METRIC_KEYS)[number];

export type MetricInfo = {
  key: MetricKey;
  /** Column of the readings table. */
  column: string;
  label: string;
  /** Short label for chart buttons and narrow columns. */
  short: string;
  /** Unit shown after values ('' for pure numbers); how values print is lib/format's business. */
  unit: string;
  /** Which way is better: it picks the comparator a new target starts with and colours changes. */
  better: 'higher' | 'lower';
  /** How the metric reads inside a sentence ("the ambient contrast ratio"). */
  phrase: string;
  /** What it is, in one line. */
  definition: string;
};

const info = (key: MetricKey, column: string, better: 'higher' | 'lower'): MetricInfo => {
  const f = METRIC_FORMATS[key];
  return { key, column, label: f.label, short: f.short, unit: f.unit, better, phrase: f.phrase, definition: f.definition };
};

export const METRICS: Record<MetricKey, MetricInfo> = {
  ambientContrastRatio: info('ambientContrastRatio', 'ambient_contrast_ratio', 'higher'),
  michelson: info('michelson', 'michelson', 'higher'),
  ansiContrast: info('ansiContrast', 'ansi_contrast', 'higher'),
  uniformity: info('uniformity', 'uniformity', 'higher'),
  ghostRatio: info('ghostRatio', 'ghost_ratio', 'lower'),
  transmission: info('transmission', 'transmission', 'higher'),
  tintDeltaE00: info('tintDeltaE00', 'tint_delta_e00', 'lower'),
  transmissionOptics: info('transmissionOptics', 'transmission_optics', 'higher'),
  veil: info('veil', 'veil', 'lower'),
  mtf50: info('mtf50', 'mtf50', 'higher'),
  mtf50PerDegree: info('mtf50PerDegree', 'mtf50_per_degree', 'higher'),
  displayDuv: info('displayDuv', 'display_duv', 'lower'),
  colourUniformityDuv: info('colourUniformityDuv', 'colour_uniformity_duv', 'lower'),
};

export const METRIC_LIST: MetricInfo[] = METRIC_KEYS.map((k) => METRICS[k]);

export function isMetricKey(v: unknown): v is MetricKey {
  return typeof v === 'string' && (METRIC_KEYS as readonly string[]).includes(v);
}

/** @deprecated Use metricHeading (lib/format): "See-through tint (ΔE00)", "Ghost ratio (%)". */
export function metricLabelWithUnit(m: Pick<MetricInfo, 'key'> | Pick<MetricInfo, 'label' | 'unit'>): string {
  if ('key' in m) return metricHeading(m.key);
  return m.unit && m.unit !== ': 1' ? `${m.label} (${m.unit})` : m.label;
}

/** @deprecated Use formatMetricValue (lib/format). A value with its unit, "—" when missing. */
export function formatMetric(key: MetricKey, v: number | null | undefined, withUnit = true): string {
  return formatMetricValue(key, v, { unit: withUnit });
}

