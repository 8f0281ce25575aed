// How each measured quantity is shown, everywhere: pages, client-side CSV files, the export CSV's
// headers, the PDFs and the mails. Ghost and transmission are stored as fractions and shown as
// percentages; contrast ratios as "9.37 : 1"; the tint in ΔE00; MTF50 in cycles per pixel or per
// degree; colour distances in Δu′v′. Digits follow the figure's uncertainty when one is known,
// otherwise three significant digits.
import type { MetricKey } from '../targets/metrics';
import { DASH, decimalsForUncertainty, exact, fixed, isNum, MINUS, significant } from './numbers';

/** ratio: "9.37 : 1"; percent: a stored fraction shown ×100 with "%"; deltaE: "2.13 ΔE00"; plain: a bare number. */
export type MetricKind = 'ratio' | 'percent' | 'deltaE' | 'plain';

export type MetricFormat = {
  kind: MetricKind;
  /** Full name, e.g. "See-through tint". */
  label: string;
  /** Short name for chart buttons and narrow columns. */
  short: string;
  /** How the metric reads inside a sentence. */
  phrase: string;
  /** The unit as printed after a figure ('' for none). */
  unit: string;
  /** The export CSV's column header (values there stay as stored, units in the header). */
  csvHeader: string;
  /** What the number is, in one line (docs/method.md §5.8–5.12), shown beside it. */
  definition: string;
};

export const METRIC_FORMATS: Record<MetricKey, MetricFormat> = {
  ambientContrastRatio: { kind: 'ratio', label: 'Ambient contrast ratio', short: 'Contrast', phrase: 'the ambient contrast ratio', unit: ': 1', csvHeader: 'ambient_contrast_ratio (ratio L_on/L_off)', definition: 'Screen luminance with the display on over with it off: (display + background) / background.' },
  michelson: { kind: 'plain', label: 'Michelson contrast', short: 'Michelson', phrase: 'the Michelson contrast', unit: '', csvHeader: 'michelson (0..1)', definition: '(bright − dark) / (bright + dark) over the screen, from 0 (no contrast) to 1.' },
  ansiContrast: { kind: 'ratio', label: 'Checkerboard contrast', short: 'Checkerboard', phrase: 'the checkerboard contrast', unit: ': 1', csvHeader: 'checkerboard_contrast (ratio white/black)', definition: 'Mean of the 8 white cells over the mean of the 8 black cells of a 4 × 4 checkerboard.' },
  uniformity: { kind: 'plain', label: 'Uniformity (min/max)', short: 'Uniformity', phrase: 'the uniformity', unit: '', csvHeader: 'uniformity (min/max 0..1)', definition: "The dimmest over the brightest of the display's light in a 3 × 3 grid of the screen (1 is even)." },
  ghostRatio: { kind: 'percent', label: 'Ghost ratio', short: 'Ghost', phrase: 'the ghost ratio', unit: '%', csvHeader: 'ghost_ratio (ghost/primary 0..1)', definition: 'Light in the displaced copy of the image over the light in the image itself.' },
  transmission: { kind: 'percent', label: 'See-through transmission', short: 'Transmission', phrase: 'the see-through transmission', unit: '%', csvHeader: 'transmission (L_off/L_ambient 0..1)', definition: 'Luminance of the room seen through the optics over without them, stray light included.' },
  tintDeltaE00: { kind: 'deltaE', label: 'See-through tint', short: 'Tint', phrase: 'the see-through tint', unit: 'ΔE00', csvHeader: 'tint_delta_e00 (CIEDE2000)', definition: 'Colour shift of the room seen through the optics, at equal luminance (CIEDE2000).' },
  transmissionOptics: { kind: 'percent', label: 'Transmission of the optics', short: 'Optics T', phrase: "the optics' own transmission", unit: '%', csvHeader: 'transmission_optics (slope of off against ambient 0..1)', definition: "Share of the room's light the optics pass: the slope of off against ambient, their stray light left out." },
  veil: { kind: 'percent', label: 'Veil', short: 'Veil', phrase: 'the veil', unit: '%', csvHeader: 'veil (intercept of off against ambient / mean ambient 0..1)', definition: "Light the optics add over the see-through view (housing reflections, the display's glow), as a share of the room's mean luminance." },
  mtf50: { kind: 'plain', label: 'MTF50', short: 'MTF50', phrase: 'the MTF50', unit: 'cy/px', csvHeader: 'mtf50 (cycles per camera pixel)', definition: "Spatial frequency at which a slanted edge's contrast through the optics falls to half, per camera pixel." },
  mtf50PerDegree: { kind: 'plain', label: 'MTF50 per degree', short: 'MTF50/°', phrase: 'the MTF50 per degree', unit: 'cy/°', csvHeader: 'mtf50_per_degree (cycles per degree)', definition: 'The MTF50 in cycles per degree of the field of view.' },
  displayDuv: { kind: 'plain', label: 'Display white error', short: 'White Δu′v′', phrase: "the display white's distance from its reference", unit: 'Δu′v′', csvHeader: 'display_duv (Δu′v′ from the reference white)', definition: "Distance in CIE 1976 u′v′ of the display's white, seen through the optics, from the reference white." },
  colourUniformityDuv: { kind: 'plain', label: 'Colour uniformity', short: 'Colour Δu′v′', phrase: 'the colour non-uniformity', unit: 'Δu′v′', csvHeader: 'colour_uniformity_duv (largest Δu′v′ between cells)', definition: "Largest u′v′ distance between the display's colour in any two cells of a 3 × 3 grid of the screen." },
};

/**
 * The metrics a readings table shows, in this order, on every screen and in the PDFs (Michelson
 * and the checkerboard contrast only where all metrics are listed).
 */
export const TABLE_METRICS: readonly MetricKey[] = ['ambientContrastRatio', 'ghostRatio', 'transmission', 'uniformity', 'tintDeltaE00'];

const SIG = 3;

/** Stored value → the number shown (×100 for percentages). */
export function toShown(key: MetricKey, v: number): number {
  return METRIC_FORMATS[key].kind === 'percent' ? v * 100 : v;
}

/** The number typed in the shown unit → the stored value (÷100 for percentages). */
export function fromShown(key: MetricKey, v: number): number {
  return METRIC_FORMATS[key].kind === 'percent' ? v / 100 : v;
}

/** Attaches the metric's unit: "9.37 : 1", "20.2 %", "2.13 ΔE00", "0.873". */
export function withUnit(key: MetricKey, figure: string): string {
  const u = METRIC_FORMATS[key].unit;
  if (!u) return figure;
  return u === ': 1' ? `${figure} : 1` : `${figure} ${u}`;
}

/** "See-through tint (ΔE00)", "Ghost ratio (%)", "MTF50 (cy/px)"; ratios and unitless numbers keep their name alone. */
export function metricHeading(key: MetricKey, short = false): string {
  const f = METRIC_FORMATS[key];
  const name = short ? f.short : f.label;
  return f.kind === 'percent' || f.kind === 'deltaE' || (f.kind === 'plain' && f.unit !== '') ? `${name} (${f.unit})` : name;
}

/**
 * A value with its standard uncertainty, digits from the uncertainty, the unit once at the end:
 * "5.346 ± 0.016 : 1", "70.3 ± 0.1 %"; the value alone (three digits) without one.
 */
export function formatMetricWithU(key: MetricKey, v: number | null | undefined, u: number | null | undefined, o: { unit?: boolean } = {}): string {
  if (v === Number.POSITIVE_INFINITY || !isNum(v)) return formatMetricValue(key, v, o);
  if (!isNum(u) || !(u > 0)) return formatMetricValue(key, v, o);
  const d = decimalsForUncertainty(Math.abs(toShown(key, u)));
  if (d === null) return formatMetricValue(key, v, o);
  const figure = `${fixed(toShown(key, v), d)} ± ${fixed(Math.abs(toShown(key, u)), d)}`;
  return o.unit === false ? figure : withUnit(key, figure);
}

/** The unit a form asks the value in: "%", ": 1", "ΔE00" or ''. */
export function inputUnit(key: MetricKey): string {
  return METRIC_FORMATS[key].unit;
}

export type FormatOptions = {
  /** Print the unit (default true). */
  unit?: boolean;
  /** An uncertainty of the value (stored scale): digits then follow it. */
  uncertainty?: number | null;
  /** A figure someone typed (a target's limit): printed as typed, no padding. */
  exact?: boolean;
  /** Significant digits when there is no uncertainty (default 3). */
  sig?: number;
};

function figureOf(key: MetricKey, v: number, o: FormatOptions): string {
  const shown = toShown(key, v);
  if (o.exact) return exact(shown);
  const d = decimalsForUncertainty(isNum(o.uncertainty) ? Math.abs(toShown(key, o.uncertainty)) : null);
  if (d !== null) return fixed(shown, d);
  if (shown === Number.POSITIVE_INFINITY) return '∞';
  return significant(shown, o.sig ?? SIG);
}

/** One value of a metric with its unit: "9.37 : 1", "20.2 %", "—" when missing. */
export function formatMetricValue(key: MetricKey, v: number | null | undefined, o: FormatOptions = {}): string {
  if (v === Number.POSITIVE_INFINITY) return withUnit(key, '∞');
  if (!isNum(v)) return DASH;
  const s = figureOf(key, v, o);
  return o.unit === false ? s : withUnit(key, s);
}

/**
 * Mean ± 95% CI half-width, both to the half-width's second significant digit, the unit once at
 * the end: "2.66 ± 0.29 : 1", "20.2 ± 1.3 %". The mean alone (3 digits) without an interval.
 */
export function formatMetricMeanCi(key: MetricKey, s: { mean: number | null; halfWidth: number | null }, o: { unit?: boolean } = {}): string {
  if (!isNum(s.mean)) return DASH;
  const d = decimalsForUncertainty(isNum(s.halfWidth) ? toShown(key, s.halfWidth) : null);
  const figure = d === null ? figureOf(key, s.mean, {}) : `${fixed(toShown(key, s.mean), d)} ± ${fixed(toShown(key, s.halfWidth as number), d)}`;
  return o.unit === false ? figure : withUnit(key, figure);
}

/** A spread (SD) to two significant digits, with the unit (none for a ratio). */
export function formatMetricSpread(key: MetricKey, sd: number | null | undefined, o: { unit?: boolean } = {}): string {
  if (!isNum(sd)) return DASH;
  const s = significant(toShown(key, sd), 2);
  // a ratio's spread is a plain number, as its difference is ("0.038", not "0.038 : 1")
  if (o.unit === false || METRIC_FORMATS[key].kind === 'ratio') return s;
  return withUnit(key, s);
}

/** The unit of a difference: percentage points for percentages, nothing for a ratio's difference. */
export function differenceUnit(key: MetricKey, long = false): string {
  const k = METRIC_FORMATS[key].kind;
  if (k === 'percent') return long ? 'percentage points' : 'pp';
  if (k === 'deltaE') return 'ΔE00';
  return '';
}

/**
 * A signed difference with its CI: "+5.05 ± 0.29", "−31 ± 3 pp" (percentages differ in points).
 * `signed: false` leaves the sign off for sentences that say "raises" or "lowers".
 */
export function formatMetricDifference(key: MetricKey, d: number | null | undefined, halfWidth: number | null | undefined, o: { unit?: boolean; signed?: boolean; long?: boolean } = {}): string {
  if (!isNum(d)) return DASH;
  const shown = toShown(key, d);
  const dec = decimalsForUncertainty(isNum(halfWidth) ? toShown(key, halfWidth) : null);
  const body = dec === null ? significant(Math.abs(shown), SIG) : `${fixed(Math.abs(shown), dec)} ± ${fixed(toShown(key, halfWidth as number), dec)}`;
  const sign = o.signed === false ? '' : shown >= 0 ? '+' : MINUS;
  const u = differenceUnit(key, o.long);
  return `${sign}${body}${o.unit === false || !u ? '' : ` ${u}`}`;
}

/** An axis tick in the shown unit, without the unit (the axis title carries it). */
export function formatTick(key: MetricKey, v: number): string {
  const shown = toShown(key, v);
  return String(Number(shown.toPrecision(4)));
}

/** A target's limit as typed, with its unit: "1.2 : 1", "1 %". */
export function formatLimit(key: MetricKey, v: number): string {
  return formatMetricValue(key, v, { exact: true });
}
