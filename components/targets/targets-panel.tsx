import clsx from 'clsx';
import { DEFAULT_TARGETS, DEFAULTS_CAVEAT } from '@/lib/targets/defaults';
import { formatLimit, formatMetricValue } from '@/lib/format';
import { describeCondition } from '@/lib/targets/conditions';
import { comparatorWords, revisionVerdictText, STATUS_WORDS, type Target, type TargetCheck, type TargetStatus } from '@/lib/targets/evaluate';
import { METRICS } from '@/lib/targets/metrics';
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

/** What a target asks, in words: "Ghost ratio at most 1 %". */
export function targetAsks(t: Pick<Target, 'metric' | 'comparator' | 'value'>): string {
  return `${METRICS[t.metric].label} ${comparatorWords(t.comparator)} ${formatLimit(t.metric, t.value)}`;
}

/** The structured condition and the note, for a table cell. */
export function conditionText(t: Pick<Target, 'condition' | 'conditionNote'>): string {
  return [describeCondition(t.condition ?? {}), t.conditionNote ? `note: ${t.conditionNote}` : ''].filter(Boolean).join(' · ');
}

/**
 * The targets judged on one revision, variant by variant: what each asks, its condition, the
 * variant's mean over the capture sets that meet the condition, pass or fail; sorts and exports CSV.
 */
export function TargetChecks({ checks, scope }: { checks: TargetCheck[]; scope: string }) {
  const columns: Column[] = [
    { key: 'variant', label: 'Variant' },
    { key: 'target', label: 'Target' },
    { key: 'condition', label: 'Condition' },
    { key: 'mean', label: `${scope} mean`, numeric: true },
    { key: 'n', label: 'n', numeric: true },
    { key: 'status', label: 'Status' },
  ];
  const rows: Row[] = checks.map((c, i) => {
    const asks = targetAsks(c.target);
    const variant = c.variant === undefined ? 'all' : c.variant || 'no variant label';
    const left = c.excluded ? `${c.excluded} left out: ${(c.excludedWhy ?? []).join(', ')}` : '';
    return {
      id: `${c.target.id}:${c.variant ?? '*'}`,
      cells: {
        variant: { text: variant, sort: i },
        target: {
          text: c.target.isDefault ? `${asks} (default)` : asks,
          node: (
            <>
              {asks}
              {c.target.isDefault ? <span className="ml-2 rounded bg-raised px-1 text-xs text-muted">default</span> : null}
            </>
          ),
        },
        condition: { text: conditionText(c.target), node: <span className="text-muted">{conditionText(c.target) || 'any'}</span> },
        mean: { text: formatMetricValue(c.target.metric, c.mean), sort: c.mean },
        n: { text: left ? `${c.n} (${left})` : String(c.n), sort: c.n, node: left ? <span title={left}>{c.n} <span className="text-xs text-muted">(+{c.excluded} left out)</span></span> : undefined },
        status: { text: STATUS_WORDS[c.status], node: <StatusBadge status={c.status} /> },
      },
    };
  });
  return <DataTable columns={columns} rows={rows} csvName={`targets-${scope}`} testId="target-checks" />;
}

/** Targets of a project: status on its latest measured revision, and editing for leads. */
export function TargetsPanel({ projectId, checks, targets, scope, canEdit, variants = [] }: { projectId: string; checks: TargetCheck[]; targets?: Target[]; scope: string | null; canEdit: boolean; variants?: string[] }) {
  const list = targets ?? [...new Map(checks.map((c) => [c.target.id, c.target])).values()];
  const present = new Set(list.map((t) => `${t.metric}${t.comparator}${t.value}`));
  const offers = DEFAULT_TARGETS.filter((d) => !present.has(`${d.metric}${d.comparator}${d.value}`));
  return (
    <div className="space-y-5" data-testid="targets-panel">
      {list.length ? (
        <>
          {scope ? (
            <p className="text-xs text-muted" data-testid="targets-verdict">
              {scope} {revisionVerdictText(checks)}. Judged on {scope}, the latest revision with readings, variant by variant: the mean of the newest reading of each capture set whose
              stated conditions meet the target’s.
            </p>
          ) : null}
          <TargetChecks checks={checks} scope={scope ?? 'Latest'} />
        </>
      ) : (
        <p className="text-sm text-muted">No targets yet. {canEdit ? 'Add your own below, or start from a default.' : 'A lead sets them.'}</p>
      )}
      {canEdit ? (
        <>
          {list.length ? (
            <details className="rounded-md border border-line px-3 py-2">
              <summary className="cursor-pointer text-sm text-ink">Edit targets</summary>
              <div className="mt-3 space-y-4 divide-y divide-line">
                {list.map((t) => (
                  <div key={t.id} className="pt-3 first:pt-0">
                    <EditTargetForm projectId={projectId} target={t} variants={variants} />
                  </div>
                ))}
              </div>
            </details>
          ) : null}
          <div>
            <h3 className="mb-2 text-sm font-semibold text-ink">New target</h3>
            <CreateTargetForm projectId={projectId} variants={variants} />
          </div>
          {offers.length ? (
            <div>
              <h3 className="mb-1 text-sm font-semibold text-ink">Defaults you can start from</h3>
              <p className="mb-2 text-xs text-muted">{DEFAULTS_CAVEAT}</p>
              <ul className="space-y-2">
                {offers.map((d) => {
                  const label = targetAsks(d);
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
