import type { Column, Row } from '@/components/ui/data-table';
import { formatLuminance, formatPercent, formatRatio } from '@/lib/format';
import { storedElements, type MeasuredPoint } from './planner-model';
import { predictedAgainstMeasuredByVariant, readVariantStacks, type PredictedMeasured } from './workbench-model';

type RevisionInput = { revisionId: string; label: string; position: number; stack: unknown; variantStacks?: unknown };
type ReadingInput = MeasuredPoint & { revisionId: string };

export const COMPARISON_COLUMNS: Column[] = [
  { key: 'revision', label: 'Revision' },
  { key: 'variant', label: 'Variant' },
  { key: 'readings', label: 'Readings', numeric: true },
  { key: 'background', label: 'Median background', numeric: true },
  { key: 'acrPredicted', label: 'Contrast predicted', numeric: true },
  { key: 'acrMeasured', label: 'Contrast measured (mean)', numeric: true },
  { key: 'ghostPredicted', label: 'Ghost predicted', numeric: true },
  { key: 'ghostMeasured', label: 'Ghost measured', numeric: true },
  { key: 'tauPredicted', label: 'Transmission predicted', numeric: true },
  { key: 'tauMeasured', label: 'Transmission measured', numeric: true },
];

const cell = (v: number | null, fmt: (x: number | null) => string) => ({ text: fmt(v), sort: v });

/** The cells of one predicted-against-measured row (shared by the per-revision table and the workbench). */
export function predictedMeasuredCells(p: PredictedMeasured) {
  return {
    variant: { text: p.variant || '—', sort: p.variant },
    readings: { text: String(p.readings), sort: p.readings },
    background: { text: p.background === null ? '—' : `${formatLuminance(p.background, { estimate: p.backgroundSource === 'estimate' })}${p.backgroundSource === 'estimate' ? ' (EXIF estimate)' : ''}`, sort: p.background },
    acrPredicted: cell(p.acrPredicted, (x) => formatRatio(x)),
    acrMeasured: cell(p.acrMeasured, (x) => formatRatio(x)),
    ghostPredicted: cell(p.ghostPredicted, (x) => formatPercent(x)),
    ghostMeasured: cell(p.ghostMeasured, (x) => formatPercent(x)),
    tauPredicted: cell(p.tauPredicted, (x) => formatPercent(x)),
    tauMeasured: cell(p.tauMeasured, (x) => formatPercent(x)),
  };
}

/**
 * One row per revision and variant: the variant's own stack (the base stack changed as the variant
 * says) against that variant's newest readings only. The predicted contrast is taken at the
 * median background of those readings (typed, else from the photos, estimates marked).
 */
export function buildComparisonRows(revisions: RevisionInput[], readings: ReadingInput[]): Row[] {
  return revisions.flatMap((rev) => {
    const mine = readings.filter((r) => r.revisionId === rev.revisionId);
    const { elements, complete } = storedElements(rev.stack);
    const base = complete ? { elements } : null;
    const per = predictedAgainstMeasuredByVariant(base, readVariantStacks(rev.variantStacks), mine);
    const rows = per.length ? per : predictedAgainstMeasuredByVariant(base, {}, [{ captureSetId: '', variant: '', backgroundCdm2: null, ambientContrastRatio: null, ghostRatio: null, transmission: null }]).map((p) => ({ ...p, readings: 0, acrMeasured: null, ghostMeasured: null, tauMeasured: null }));
    return rows.map((p) => ({
      id: `${rev.revisionId}:${p.variant}`,
      cells: {
        revision: { text: base ? rev.label : `${rev.label} (no stack)`, sort: rev.position },
        ...predictedMeasuredCells(p),
      },
    }));
  });
}
