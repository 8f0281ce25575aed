import { getCaptureSet } from '../../../db/queries/capture-sets';
import { getLatestReading } from '../../../db/queries/readings';
import { notFound } from '../../errors';
import { formatLuminance, formatMetricWithU, metricHeading } from '../../format';
import { METRIC_KEYS } from '../../targets/metrics';
import { REPORT_CAUTIONS } from '../../reports/cautions';
import { ReportWriter } from '../../reports/pdf';
import type { ReportOptions } from './build';
import { captureFigures } from './figures';
import { opticsSection } from './optics-section';
import { PATTERN_NAMES } from '../../schemas/capture-set';

/**
 * The PDF of one capture set: its conditions, the newest reading's figures and warnings, the on
 * photo with the regions measured and both maps, the cautions. 404 for a set of another lab.
 */
export async function captureReport(labId: string, captureSetId: string, opts: ReportOptions): Promise<{ bytes: Buffer; name: string }> {
  const set = await getCaptureSet(labId, captureSetId);
  if (!set) throw notFound('No such capture set');
  const reading = await getLatestReading(labId, set.id);
  const now = opts.now ?? new Date();
  const c = set.conditions;
  const conditions = [
    set.variant ? `variant ${set.variant}` : null,
    c.ambientLux !== undefined ? `${c.ambientLux} lx ambient` : null,
    c.backgroundCdm2 !== undefined ? `${c.backgroundCdm2} cd/m² background` : null,
    c.displayLevel ? `display ${c.displayLevel}` : null,
    PATTERN_NAMES[set.pattern].phrase,
  ].filter(Boolean);

  const w = new ReportWriter(`${set.projectName} ${set.revisionLabel} ${set.label}`, { compress: opts.compress });
  w.title(`${opts.labName} · capture set report`, set.label, `${set.projectName} · ${set.revisionLabel} · ${conditions.join(' · ')} · generated ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`);
  if (set.notes) w.paragraph(set.notes, { muted: true });

  w.heading('Reading');
  if (!reading) w.paragraph('This capture set has not been analysed yet.', { muted: true });
  else {
    const abs = reading.result.absoluteLuminance;
    w.table(
      [
        { header: 'Quantity', width: 3 },
        { header: 'Value', width: 2, align: 'right' },
      ],
      [
        // the contrast figures always (a dash when not measured), the newer ones where measured; each ± its standard uncertainty
        ...METRIC_KEYS.filter((k) => METRIC_KEYS.indexOf(k) <= METRIC_KEYS.indexOf('tintDeltaE00') || reading[k] !== null).map((k) => ({ cells: [metricHeading(k), formatMetricWithU(k, reading[k], (reading.uncertainty as Partial<Record<string, number>>)[k])] })),
        ...(abs ? [{ cells: [abs.kind === 'calibrated' ? 'Display luminance (cd/m²)' : 'Display luminance, rough estimate (cd/m²)', formatLuminance(abs.on, { estimate: abs.kind !== 'calibrated' })] }] : []),
      ],
    );
    w.paragraph(`Engine ${reading.engineVersion}, analysed ${reading.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC; screen ${reading.result.screen.source}, ghost ${reading.result.ghost ? reading.result.ghost.source : 'not found'}.`, { muted: true, size: 8 });
    if (reading.result.warnings.length) {
      w.heading('Warnings');
      w.bullets(reading.result.warnings.map((x) => x.message));
    }
  }

  if (reading) await opticsSection(w, reading.result);

  w.heading('Photo and maps');
  const { figures, missing } = await captureFigures(labId, set, reading, { maps: ['logContrast', 'difference'], side: 480 });
  if (figures.length) w.figures(figures, 3);
  if (missing.length) w.paragraph(`Not shown: ${missing.join('; ')}.`, { muted: true, size: 8 });
  w.closingSection('Cautions', REPORT_CAUTIONS);
  const bytes = await w.finish(`Veilmeter · ${set.projectName} · ${set.revisionLabel} · ${set.label}`);
  return { bytes, name: `${set.projectName}-${set.revisionLabel}-${set.label}-report` };
}
