import clsx from 'clsx';
import { DEFAULT_TARGETS, DEFAULTS_CAVEAT } from '@/lib/targets/defaults';
import { comparatorWords, STATUS_WORDS, type TargetCheck, type TargetStatus } from '@/lib/targets/evaluate';
import { formatMetric, METRICS } from '@/lib/targets/metrics';
import { DataTable, type Column, type Row } from '@/components/ui/data-table';
import { AdoptDefaultButton, CreateTargetForm, EditTargetForm } from './target-forms';

const TONE: Record<TargetStatus, string> = { pass: 'border-pass/50 bg-pass/10 text-pass', fail: 'border-fail/50 bg-fail/10 text-fail', 'no-data': 'border-line text-muted' };

export function StatusBadge({ status }: { status: TargetStatus }) {
  return (
    <span className={clsx('inline-block rounded border px-1.5 py-0.5 text-xs font-semibold uppercase tracking-wide', TONE[status])} data-status={status}>
      {STATUS_WORDS[status]}
    </span>
  );
}

/** The targets judged on one revision: what each asks, the revision's mean, pass or fail; sorts and exports CSV. */
export function TargetChecks({ checks, scope }: { checks: TargetCheck[]; scope: string }) {
  const columns: Column[] = [
    { key: 'target', label: 'Target' },
    { key: 'condition', label: 'Condition' },
    { key: 'mean', label: `${scope} mean`, numeric: true },
    { key: 'n', label: 'n', numeric: true },
    { key: 'status', label: 'Status' },
  ];
  const rows: Row[] = checks.map((c) => {
    const asks = `${METRICS[c.target.metric].label} ${comparatorWords(c.target.comparator)} ${formatMetric(c.target.metric, c.target.value)}`;
    return {
      id: c.target.id,
      cells: {
        target: {
          text: c.target.isDefault ? `${asks} (default)` : asks,
          node: (
            <>
              {asks}
              {c.target.isDefault ? <span className="ml-2 rounded bg-raised px-1 text-xs text-muted">default</span> : null}
            </>
          ),
        },
        condition: { text: c.target.conditionNote, node: <span className="text-muted">{c.target.conditionNote || '—'}</span> },
        mean: { text: formatMetric(c.target.metric, c.mean), sort: c.mean },
        n: { text: String(c.n), sort: c.n },
        status: { text: STATUS_WORDS[c.status], node: <StatusBadge status={c.status} /> },
      },
    };
  });
  return <DataTable columns={columns} rows={rows} csvName={`targets-${scope}`} testId="target-checks" />;
}

/** Targets of a project: status on its latest measured revision, and editing for leads. */
export function TargetsPanel({ projectId, checks, scope, canEdit }: { projectId: string; checks: TargetCheck[]; scope: string | null; canEdit: boolean }) {
  const present = new Set(checks.map((c) => `${c.target.metric}${c.target.comparator}${c.target.value}`));
  const offers = DEFAULT_TARGETS.filter((d) => !present.has(`${d.metric}${d.comparator}${d.value}`));
  return (
    <div className="space-y-5" data-testid="targets-panel">
      {checks.length ? (
        <>
          {scope ? <p className="text-xs text-muted">Judged on {scope}, the latest revision with readings: the mean of each capture set’s newest reading.</p> : null}
          <TargetChecks checks={checks} scope={scope ?? 'Latest'} />
        </>
      ) : (
        <p className="text-sm text-muted">No targets yet. {canEdit ? 'Add your own below, or start from a default.' : 'A lead sets them.'}</p>
      )}
      {canEdit ? (
        <>
          {checks.length ? (
            <details className="rounded-md border border-line px-3 py-2">
              <summary className="cursor-pointer text-sm text-ink">Edit targets</summary>
              <div className="mt-3 space-y-4 divide-y divide-line">
                {checks.map((c) => (
                  <div key={c.target.id} className="pt-3 first:pt-0">
                    <EditTargetForm projectId={projectId} target={c.target} />
                  </div>
                ))}
              </div>
            </details>
          ) : null}
          <div>
            <h3 className="mb-2 text-sm font-semibold text-ink">New target</h3>
            <CreateTargetForm projectId={projectId} />
          </div>
          {offers.length ? (
            <div>
              <h3 className="mb-1 text-sm font-semibold text-ink">Defaults you can start from</h3>
              <p className="mb-2 text-xs text-muted">{DEFAULTS_CAVEAT}</p>
              <ul className="space-y-2">
                {offers.map((d) => {
                  const label = `${METRICS[d.metric].label} ${comparatorWords(d.comparator)} ${formatMetric(d.metric, d.value)}`;
                  return (
                    <li key={d.id} className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-dashed border-line px-3 py-2" data-testid={`default-${d.id}`}>
                      <div className="text-sm">
                        <p className="text-ink">
                          {label} <span className="text-muted">— {d.conditionNote}</span>
                        </p>
                        <p className="text-xs text-muted">
                          Default · <span className="font-medium">{d.status}</span> · {d.basis}
                        </p>
                      </div>
                      <AdoptDefaultButton projectId={projectId} defaultId={d.id} label={label} />
                    </li>
                  );
                })}
              </ul>
            </div>
          ) : null}
        </>
      ) : null}
    </div>
  );
}
