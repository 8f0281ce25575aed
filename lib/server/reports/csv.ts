import type { ExportRow } from '../../../db/queries/exports';
import { METRIC_FORMATS } from '../../format/metrics';
import { UNCERTAIN_METRICS } from '../../photometry/result';
import { METRICS } from '../../targets/metrics';

type Col = { header: string; get: (r: ExportRow) => string | number | null };

// Numbers are written with JavaScript's shortest round-trip form, so a parser gets back exactly
// the stored doubles; units live in the headers, never in the cells.
const COLUMNS: Col[] = [
  { header: 'project', get: (r) => r.projectName },
  { header: 'revision', get: (r) => r.revisionLabel },
  { header: 'revision_order', get: (r) => r.revisionPosition },
  { header: 'capture_set', get: (r) => r.captureLabel },
  { header: 'variant', get: (r) => r.variant },
  { header: 'pattern', get: (r) => r.pattern },
  { header: 'ambient_illuminance (lx)', get: (r) => r.ambientLux },
  { header: 'background_luminance (cd/m²)', get: (r) => r.backgroundCdm2 },
  { header: METRIC_FORMATS.ambientContrastRatio.csvHeader, get: (r) => r.ambientContrastRatio },
  { header: METRIC_FORMATS.michelson.csvHeader, get: (r) => r.michelson },
  { header: METRIC_FORMATS.ansiContrast.csvHeader, get: (r) => r.ansiContrast },
  { header: METRIC_FORMATS.uniformity.csvHeader, get: (r) => r.uniformity },
  { header: METRIC_FORMATS.ghostRatio.csvHeader, get: (r) => r.ghostRatio },
  { header: METRIC_FORMATS.transmission.csvHeader, get: (r) => r.transmission },
  { header: METRIC_FORMATS.tintDeltaE00.csvHeader, get: (r) => r.tintDeltaE00 },
  { header: METRIC_FORMATS.transmissionOptics.csvHeader, get: (r) => r.transmissionOptics },
  { header: METRIC_FORMATS.veil.csvHeader, get: (r) => r.veil },
  { header: 'veil_calibrated (cd/m²)', get: (r) => r.veilCdm2 },
  { header: METRIC_FORMATS.mtf50.csvHeader, get: (r) => r.mtf50 },
  { header: METRIC_FORMATS.mtf50PerDegree.csvHeader, get: (r) => r.mtf50PerDegree },
  { header: METRIC_FORMATS.displayDuv.csvHeader, get: (r) => r.displayDuv },
  { header: METRIC_FORMATS.colourUniformityDuv.csvHeader, get: (r) => r.colourUniformityDuv },
  // the standard uncertainty (k = 1) of each figure that has one, on the figure's own scale
  ...UNCERTAIN_METRICS.map((k) => ({ header: `u_${METRICS[k].column} (standard uncertainty k = 1; stored scale)`, get: (r: ExportRow) => r.uncertainty[k] ?? null })),
  { header: 'luminance_on (relative, on-photo scale)', get: (r) => r.luminanceOn },
  { header: 'luminance_off (relative, on-photo scale)', get: (r) => r.luminanceOff },
  { header: 'luminance_ambient (relative, on-photo scale)', get: (r) => r.luminanceAmbient },
  { header: 'luminance_on_calibrated (cd/m²)', get: (r) => r.luminanceOnCdm2 },
  { header: 'clipped_fraction (share of pixels 0..1)', get: (r) => r.clippedFraction },
  { header: 'warnings (count)', get: (r) => r.warningCount },
  { header: 'engine_version', get: (r) => r.engineVersion },
  { header: 'measured_at (UTC)', get: (r) => r.createdAt.toISOString() },
  { header: 'capture_set_id', get: (r) => r.captureSetId },
  { header: 'reading_id', get: (r) => r.readingId },
];

export const CSV_HEADERS = COLUMNS.map((c) => c.header);

function cell(v: string | number | null): string {
  if (v === null) return '';
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : v;
  // a leading = + - @ would run as a formula in a spreadsheet; a quote keeps it text
  const safe = typeof v === 'string' && /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** RFC 4180 CSV (CRLF, quoted where needed) of readings; a group column first when given. */
export function readingsCsv(rows: readonly ExportRow[], group?: (r: ExportRow) => string): string {
  const headers = group ? ['group', ...CSV_HEADERS] : CSV_HEADERS;
  const lines = [headers.map(cell).join(',')];
  for (const r of rows) {
    const cells = COLUMNS.map((c) => cell(c.get(r)));
    lines.push((group ? [cell(group(r)), ...cells] : cells).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** A file name made of safe characters. */
export function fileSlug(...parts: string[]): string {
  return parts.join('-').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/-+/g, '-').replace(/^-|-$/g, '').slice(0, 100) || 'veilmeter';
}

export const csvHeaders = (name: string): Record<string, string> => ({ 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${name}.csv"`, 'cache-control': 'private, no-store' });

export function csvResponse(body: string, name: string): Response {
  return new Response(`\uFEFF${body}`, { status: 200, headers: csvHeaders(name) });
}

/** The bytes csvResponse sends (a BOM so spreadsheets read UTF-8), for keeping them ready. */
export function csvBytes(body: string): Uint8Array<ArrayBuffer> {
  return Buffer.from(`\uFEFF${body}`, 'utf8');
}
