'use client';

import clsx from 'clsx';
import { useMemo, useState } from 'react';
import { downloadCsv, ExportCsvBar } from '@/components/ui/csv-download';
import { ariaSortOf, SortButton } from '@/components/ui/sort-header';
import { formatMetricDifference, formatMetricMeanCi, metricHeading } from '@/lib/format';
import { formatChange, orderComparisons, testFigures, type ChangeTone, type ComparisonOrder, type MetricComparison } from '@/lib/targets/compare';
import { TONE_CLASS } from './comparison-chart';

// colour says whether the change is good for the team's targets, not only whether it is significant
function verdictTone(r: MetricComparison, tone: ChangeTone | undefined): string {
  if (r.level === 'too-few') return 'text-warn';
  return TONE_CLASS[tone ?? 'unclear'];
}

function differenceText(r: MetricComparison): string {
  const t = r.test;
  return t ? formatMetricDifference(r.metric, t.difference, t.ci.halfWidth) : '—';
}


const NUM = 'px-2 pt-2 whitespace-nowrap text-right font-mono tabular-nums';

/**
 * Per metric: each group's n and mean ± 95% CI, B − A with its CI, the change as a share of A,
 * Welch t, df, p and the verdict. Sorts by metric (the catalogue's order), by the size of the
 * change or by p; each verdict stays under its metric.
 */
export function ComparisonTable({ rows, aLabel, bLabel, csvName, tones = {} }: { rows: MetricComparison[]; aLabel: string; bLabel: string; csvName: string; tones?: Record<string, ChangeTone> }) {
  const [order, setOrder] = useState<ComparisonOrder>('metric');
  const [reverse, setReverse] = useState(false);
  const sorted = useMemo(() => orderComparisons(rows, order, reverse), [rows, order, reverse]);
  const sortBy = (o: ComparisonOrder) => () => {
    if (o === order) setReverse(!reverse);
    else {
      setOrder(o);
      setReverse(false);
    }
  };
  const exportCsv = () =>
    downloadCsv(
      csvName,
      ['Metric', 'n A', `A mean ± CI (${aLabel})`, 'n B', `B mean ± CI (${bLabel})`, 'B − A ± CI', 'Change', 'Welch t', 'df', 'p', 'Verdict'],
      sorted.map((r) => [metricHeading(r.metric), String(r.a.n), formatMetricMeanCi(r.metric, r.a), String(r.b.n), formatMetricMeanCi(r.metric, r.b), differenceText(r), formatChange(r), ...testFigures(r), r.verdict]),
    );
  const ariaSort = (o: ComparisonOrder) => ariaSortOf(o === order, reverse);
  return (
    <div>
      <ExportCsvBar onExport={exportCsv} />
      <div className="overflow-x-auto rounded-md border border-line">
        <table className="w-full text-sm" data-testid="comparison-table" data-order={order} data-reverse={reverse ? 'yes' : 'no'}>
          <thead className="whitespace-nowrap bg-raised text-left text-xs uppercase tracking-wider text-muted">
            <tr>
              <th scope="col" className="px-3 py-2" aria-sort={ariaSort('metric')}>
                <SortButton label="Metric" active={order === 'metric'} desc={reverse} onClick={sortBy('metric')} />
              </th>
              <th scope="col" className="px-2 py-2 text-right">n A</th>
              <th scope="col" className="px-2 py-2 text-right" title={aLabel}>A mean ± CI</th>
              <th scope="col" className="px-2 py-2 text-right">n B</th>
              <th scope="col" className="px-2 py-2 text-right" title={bLabel}>B mean ± CI</th>
              <th scope="col" className="px-2 py-2 text-right">B − A ± CI</th>
              <th scope="col" className="px-2 py-2 text-right" aria-sort={ariaSort('change')}>
                <SortButton label="Change" active={order === 'change'} desc={reverse} onClick={sortBy('change')} title="(B − A) as a share of A’s mean; sorts the largest change first" />
              </th>
              <th scope="col" className="px-2 py-2 text-right">Welch t</th>
              <th scope="col" className="px-2 py-2 text-right">df</th>
              <th scope="col" className="px-2 py-2 text-right" aria-sort={ariaSort('p')}>
                <SortButton label="p" active={order === 'p'} desc={reverse} onClick={sortBy('p')} title="Sorts the smallest p first" />
              </th>
            </tr>
          </thead>
          <tbody>
            {sorted.map((r) => {
              return [
                <tr key={r.metric} className="border-t border-line" data-metric={r.metric} data-tone={tones[r.metric] ?? 'unclear'}>
                  <th scope="row" className="px-3 pt-2 text-left font-medium text-ink">
                    {metricHeading(r.metric)}
                  </th>
                  <td className={NUM}>{r.a.n}</td>
                  <td className={NUM}>{formatMetricMeanCi(r.metric, r.a)}</td>
                  <td className={NUM}>{r.b.n}</td>
                  <td className={NUM}>{formatMetricMeanCi(r.metric, r.b)}</td>
                  <td className={clsx(NUM, r.test ? TONE_CLASS[tones[r.metric] ?? 'unclear'] : undefined)} data-testid={`difference-${r.metric}`}>
                    {differenceText(r)}
                  </td>
                  <td className={NUM} data-testid={`change-${r.metric}`}>
                    {formatChange(r)}
                  </td>
                  {testFigures(r).map((text, k) => (
                    <td key={k} className={NUM}>
                      {text}
                    </td>
                  ))}
                </tr>,
                <tr key={`${r.metric}-v`}>
                  <td colSpan={10} className={clsx('px-3 pb-2 text-xs', verdictTone(r, tones[r.metric]))} data-testid={`verdict-${r.metric}`}>
                    {r.verdict}
                  </td>
                </tr>,
              ];
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
