import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound, redirect } from 'next/navigation';
import { ComparisonChart, TONE_CLASS } from '@/components/compare/comparison-chart';
import { ComparisonTable } from '@/components/compare/comparison-table';
import { GroupPicker } from '@/components/compare/group-picker';
import { PreviewStrip } from '@/components/compare/preview-strip';
import { EmptyState, Notice, PageTitle, Panel } from '@/components/ui/panel';
import { getComparisonGroup, listGroupOptions, type GroupOption } from '@/db/queries/comparisons';
import { getProject } from '@/db/queries/projects';
import { listTargets } from '@/db/queries/targets';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { projectTitle } from '@/lib/server/page-titles';
import { uuidSchema } from '@/lib/schemas/common';
import { changeTone, compareGroups, decodeGroup, encodeGroup, summariseComparison, type ChangeTone } from '@/lib/targets/compare';
import { METRIC_KEYS, METRICS } from '@/lib/targets/metrics';
import { values } from '@/lib/targets/series';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }): Promise<Metadata> {
  return projectTitle((await params).projectId, 'Compare');
}

// With nothing chosen yet: the two variants of the newest revision that has them (the A/B the
// team built), else the two newest revisions with readings.
function defaultPair(options: GroupOption[]): [string, string] | null {
  const variants = options.filter((o) => o.variant !== null);
  for (let i = variants.length - 1; i > 0; i--) {
    const b = variants[i];
    const a = variants[i - 1];
    if (a && b && a.revisionId === b.revisionId) return [a.key, b.key];
  }
  const whole = options.filter((o) => o.variant === null);
  const a = whole[whole.length - 2];
  const b = whole[whole.length - 1];
  return a && b ? [a.key, b.key] : null;
}

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function ComparePage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { projectId } = await params;
  const q = await searchParams;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(projectId).success) notFound();
  const project = await getProject(actor.labId, projectId);
  if (!project) notFound();
  const options = await listGroupOptions(actor.labId, project.id);
  const base = `/projects/${project.id}/compare`;
  const rawA = one(q.a);
  const rawB = one(q.b);
  if (!rawA && !rawB) {
    const pair = defaultPair(options);
    if (pair) redirect(`${base}?a=${encodeURIComponent(pair[0])}&b=${encodeURIComponent(pair[1])}`);
  }
  const keyA = decodeGroup(rawA);
  const keyB = decodeGroup(rawB);
  const [ga, gb] = await Promise.all([keyA ? getComparisonGroup(actor.labId, project.id, keyA) : null, keyB ? getComparisonGroup(actor.labId, project.id, keyB) : null]);
  const rows = ga && gb ? compareGroups(ga, gb) : null;
  // which way is good comes from the team's targets (else each metric's own direction)
  const targets = rows ? await listTargets(actor.labId, project.id) : [];
  const tones: Record<string, ChangeTone> = Object.fromEntries((rows ?? []).map((r) => [r.metric, changeTone(r, targets)]));
  const summary = ga && gb && rows ? summariseComparison(ga.label, gb.label, rows, targets) : null;
  const points = ga && gb ? Object.fromEntries(METRIC_KEYS.map((k) => [k, { a: values(ga.readings, k), b: values(gb.readings, k) }])) : {};
  const query = ga && gb ? `a=${encodeURIComponent(encodeGroup(ga))}&b=${encodeURIComponent(encodeGroup(gb))}` : '';

  return (
    <>
      <PageTitle
        kicker={
          <Link href={`/projects/${project.id}`} className="hover:text-beam">
            {project.name} · compare
          </Link>
        }
        title={ga && gb ? <span data-testid="compare-title">{`${gb.label} against ${ga.label}`}</span> : 'Compare two groups'}
      >
        {rows && can(actor.role, 'export.create') ? (
          <>
            <a href={`/api/projects/${project.id}/compare/readings.csv?${query}`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
              CSV
            </a>
            <a href={`/api/projects/${project.id}/compare/report.pdf?${query}`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
              PDF report
            </a>
          </>
        ) : null}
      </PageTitle>
      <div className="space-y-6">
        <Panel title="Groups">
          {options.length ? (
            <GroupPicker action={base} options={options} a={rawA ?? null} b={rawB ?? null} />
          ) : (
            <EmptyState title="Nothing measured yet">Analyse capture sets in two revisions (or two variants of one) to compare them.</EmptyState>
          )}
          {options.length === 1 && !rawA && !rawB ? (
            <div className="mt-3" data-testid="compare-one-group">
              <EmptyState title="Only one group has readings so far">
                {options[0]?.label}, {options[0]?.captures} capture {options[0]?.captures === 1 ? 'set' : 'sets'}. To compare two groups, analyse capture sets in a second revision, or
                give the capture sets of one revision variant labels (say, with and without polarizer) on their capture set pages.
              </EmptyState>
            </div>
          ) : null}
          {(rawA && !ga) || (rawB && !gb) ? (
            <div className="mt-3">
              <Notice tone="fail">{rawA && !ga ? 'Group A' : 'Group B'} is not a revision of this project. Pick it again from the list.</Notice>
            </div>
          ) : null}
        </Panel>
        {ga && gb && rows ? (
          <>
            {summary ? (
              <Panel title="In plain words">
                <p className="text-sm text-ink" data-testid="headline-verdict">
                  {summary.text}
                </p>
                {summary.gains.length || summary.losses.length ? (
                  <ul className="mt-2 flex flex-wrap gap-2 text-xs" data-testid="summary-moves">
                    {[...summary.gains.map((k) => ['good', k] as const), ...summary.losses.map((k) => ['bad', k] as const)].map(([tone, k]) => (
                      <li key={k} className={`rounded border border-current px-1.5 py-0.5 ${TONE_CLASS[tone]}`} data-tone={tone}>
                        {tone === 'good' ? '▲ gain' : '▼ loss'}: {METRICS[k].label.toLowerCase()}
                      </li>
                    ))}
                  </ul>
                ) : null}
                <p className="mt-2 text-xs text-muted">
                  Each capture set counts once, with its newest reading. Welch’s t test (unequal variances, Welch–Satterthwaite df), two-sided, 95% intervals; below 3 captures in a group
                  Veilmeter does not call a difference.
                </p>
              </Panel>
            ) : null}
            <Panel title="Chart">
              <ComparisonChart rows={rows} points={points} tones={tones} aLabel={ga.label} bLabel={gb.label} />
            </Panel>
            <Panel title="Per metric">
              <ComparisonTable rows={rows} aLabel={ga.label} bLabel={gb.label} csvName={`${project.name}-${gb.label}-vs-${ga.label}-per-metric`} tones={tones} />
            </Panel>
            <Panel title="Captures side by side">
              <div className="grid gap-6 md:grid-cols-2">
                <PreviewStrip title={`A · ${ga.label}`} previews={ga.previews} total={ga.readings.length} />
                <PreviewStrip title={`B · ${gb.label}`} previews={gb.previews} total={gb.readings.length} />
              </div>
            </Panel>
          </>
        ) : null}
      </div>
    </>
  );
}
