import type { Column, Row } from '@/components/ui/data-table';
import { predictedContrastRatio } from '@/lib/optics';
import { formatLuminance, formatPercent, formatRatio } from './format';
import { mean, median, safePredict, storedElements } from './planner-model';

type RevisionInput = { revisionId: string; label: string; position: number; stack: unknown };
type ReadingInput = {
  revisionId: string;
  backgroundCdm2: number | null;
  ambientContrastRatio: number | null;
  ghostRatio: number | null;
  transmission: number | null;
};

export const COMPARISON_COLUMNS: Column[] = [
  { key: 'revision', label: 'Revision' },
  { key: 'readings', label: 'Readings', numeric: true },
  { key: 'background', label: 'Median background', numeric: true },
  { key: 'acrPredicted', label: 'ACR predicted', numeric: true },
  { key: 'acrMeasured', label: 'ACR measured (mean)', numeric: true },
  { key: 'ghostPredicted', label: 'Ghost predicted', numeric: true },
  { key: 'ghostMeasured', label: 'Ghost measured', numeric: true },
  { key: 'tauPredicted', label: 'Transmission predicted', numeric: true },
  { key: 'tauMeasured', label: 'Transmission measured', numeric: true },
];

const finite = (xs: (number | null)[]): number[] => xs.filter((x): x is number => x !== null && Number.isFinite(x));

const cell = (v: number | null, fmt: (x: number | null) => string) => ({ text: fmt(v), sort: v });

/**
 * One row per revision: what its stored stack predicts beside the mean of its newest readings.
 * The predicted contrast is taken at the revision's median measured background, where the two
 * can be compared fairly; without a known background it is left blank.
 */
export function buildComparisonRows(revisions: RevisionInput[], readings: ReadingInput[]): Row[] {
  return revisions.map((rev) => {
    const mine = readings.filter((r) => r.revisionId === rev.revisionId);
    const { elements, complete } = storedElements(rev.stack);
    const prediction = complete ? safePredict({ elements }) : null;
    const display = elements[0];
    const bg = median(finite(mine.map((r) => r.backgroundCdm2)).filter((x) => x > 0));
    const acrPredicted =
      prediction && bg !== null && display?.kind === 'display'
        ? predictedContrastRatio(prediction.eta, display.luminance, prediction.tau, bg)
        : null;
    const label = prediction ? rev.label : `${rev.label} (no stack)`;
    return {
      id: rev.revisionId,
      cells: {
        revision: { text: label, sort: rev.position },
        readings: { text: String(mine.length), sort: mine.length },
        background: cell(bg, formatLuminance),
        acrPredicted: cell(acrPredicted, formatRatio),
        acrMeasured: cell(mean(finite(mine.map((r) => r.ambientContrastRatio))), formatRatio),
        ghostPredicted: cell(prediction?.ghost?.unpolarised ?? null, formatPercent),
        ghostMeasured: cell(mean(finite(mine.map((r) => r.ghostRatio))), formatPercent),
        tauPredicted: cell(prediction?.tau ?? null, formatPercent),
        tauMeasured: cell(mean(finite(mine.map((r) => r.transmission))), formatPercent),
      },
    };
  });
}
