/** The measured quantities a team can trend, compare and set targets on. */
export const METRIC_KEYS = ['ambientContrastRatio', 'michelson', 'ansiContrast', 'uniformity', 'ghostRatio', 'transmission', 'tintDeltaE00'] as const;
export type MetricKey = (typeof METRIC_KEYS)[number];

export type MetricInfo = {
  key: MetricKey;
  /** Column of the readings table. */
  column: string;
  label: string;
  /** Short label for table headers and chart axes. */
  short: string;
  /** Unit shown after values; '' for pure numbers. */
  unit: string;
  /** Which way is better: it picks the comparator a new target starts with. */
  better: 'higher' | 'lower';
  /** Decimals that read well for this quantity. */
  digits: number;
  /** How the metric reads inside a sentence ("the ambient contrast ratio"). */
  phrase: string;
};

export const METRICS: Record<MetricKey, MetricInfo> = {
  ambientContrastRatio: { key: 'ambientContrastRatio', column: 'ambient_contrast_ratio', label: 'Ambient contrast ratio', short: 'ACR', unit: ':1', better: 'higher', digits: 3, phrase: 'the ambient contrast ratio' },
  michelson: { key: 'michelson', column: 'michelson', label: 'Michelson contrast', short: 'Michelson', unit: '', better: 'higher', digits: 4, phrase: 'the Michelson contrast' },
  ansiContrast: { key: 'ansiContrast', column: 'ansi_contrast', label: 'Checkerboard contrast', short: 'Checkerboard CR', unit: ':1', better: 'higher', digits: 2, phrase: 'the checkerboard contrast' },
  uniformity: { key: 'uniformity', column: 'uniformity', label: 'Uniformity (min/max)', short: 'Uniformity', unit: '', better: 'higher', digits: 3, phrase: 'the uniformity' },
  ghostRatio: { key: 'ghostRatio', column: 'ghost_ratio', label: 'Ghost ratio', short: 'Ghost', unit: '', better: 'lower', digits: 4, phrase: 'the ghost ratio' },
  transmission: { key: 'transmission', column: 'transmission', label: 'See-through transmission', short: 'Transmission', unit: '', better: 'higher', digits: 3, phrase: 'the see-through transmission' },
  tintDeltaE00: { key: 'tintDeltaE00', column: 'tint_delta_e00', label: 'See-through tint', short: 'Tint ΔE00', unit: 'ΔE00', better: 'lower', digits: 2, phrase: 'the tint' },
};

export const METRIC_LIST: MetricInfo[] = METRIC_KEYS.map((k) => METRICS[k]);

export function isMetricKey(v: unknown): v is MetricKey {
  return typeof v === 'string' && (METRIC_KEYS as readonly string[]).includes(v);
}

/** The metric's name with its unit in brackets ("Ghost ratio", "See-through tint (ΔE00)"); ratios ":1" go unnamed. */
export function metricLabelWithUnit(m: Pick<MetricInfo, 'label' | 'unit'>): string {
  return m.unit && m.unit !== ':1' ? `${m.label} (${m.unit})` : m.label;
}

/** A value with its metric's decimals and unit, "—" when missing. */
export function formatMetric(key: MetricKey, v: number | null | undefined, withUnit = true): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const m = METRICS[key];
  const s = v.toFixed(m.digits);
  if (!withUnit || !m.unit) return s;
  return m.unit === ':1' ? `${s}:1` : `${s} ${m.unit}`;
}

/** Column header with its unit for exports, e.g. "ambient_contrast_ratio (ratio, on/off)". */
export const EXPORT_UNITS: Record<MetricKey, string> = {
  ambientContrastRatio: 'ratio L_on/L_off',
  michelson: 'dimensionless 0..1',
  ansiContrast: 'ratio white/black',
  uniformity: 'min/max 0..1',
  ghostRatio: 'ghost/primary 0..1',
  transmission: 'L_off/L_ambient 0..1',
  tintDeltaE00: 'CIEDE2000',
};
