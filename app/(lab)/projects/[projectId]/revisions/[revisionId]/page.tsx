import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CreateCaptureSetForm } from '@/components/capture/capture-set-form';
import { QueryProvider } from '@/components/capture/query-provider';
import { ReanalysePanel } from '@/components/capture/reanalyse-panel';
import { TargetChecks } from '@/components/targets/targets-panel';
import { EditRevisionForm } from '@/components/revisions/revision-forms';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { listCaptureSets } from '@/db/queries/capture-sets';
import { batchView, findRecentBatch, listOutdatedSets } from '@/db/queries/reanalyses';
import { getRevision } from '@/db/queries/revision-edits';
import { listTargets } from '@/db/queries/targets';
import { listNewestReadings } from '@/db/queries/trends';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { ENGINE_VERSION } from '@/lib/photometry/version';
import { uuidSchema } from '@/lib/schemas/common';
import { formatIlluminance, formatMetricMeanCi, formatMetricSpread, formatMetricValue, metricHeading, TABLE_METRICS } from '@/lib/format';
import { checkTargetsOn, revisionVerdictText } from '@/lib/targets/evaluate';
import { METRICS, type MetricKey } from '@/lib/targets/metrics';
import { revisionStatistics } from '@/lib/targets/series';
import { PATTERN_NAMES } from '@/lib/schemas/capture-set';

const STATUS_TEXT: Record<string, string> = { queued: 'Queued', running: 'Running', done: 'Measured', failed: 'Failed' };

export default async function RevisionPage({ params }: { params: Promise<{ projectId: string; revisionId: string }> }) {
  const { projectId, revisionId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(revisionId).success) notFound();
  const revision = await getRevision(actor.labId, revisionId);
  if (!revision || revision.projectId !== projectId) notFound();
  // one read of the newest readings serves both the target checks and the statistics
  const [sets, targets, readings] = await Promise.all([
    listCaptureSets(actor.labId, revision.id),
    listTargets(actor.labId, revision.projectId),
    listNewestReadings(actor.labId, { projectId: revision.projectId, revisionId: revision.id }),
  ]);
  // readings an older engine made, and a re-analysis of this revision or the project running or just ended
  const [outdatedSets, recentBatch] = await Promise.all([listOutdatedSets(actor.labId, { projectId: revision.projectId }, ENGINE_VERSION), findRecentBatch(actor.labId, revision.projectId, revision.id)]);
  const outdated = {
    revision: outdatedSets.filter((s) => s.revisionId === revision.id).length,
    project: outdatedSets.length,
    versions: [...new Set(outdatedSets.map((s) => s.engineVersion))].sort(),
  };
  const checks = checkTargetsOn(targets, readings);
  const statistics = revisionStatistics(readings);
  const variants = [...new Set(sets.filter((s) => s.latestAcr !== null || s.latestStatus === 'done').map((s) => s.variant))];
  const knownVariants = [...new Set(sets.map((s) => s.variant).filter(Boolean))].sort((a, b) => a.localeCompare(b));
  const latestOf: Partial<Record<MetricKey, (s: (typeof sets)[number]) => number | null>> = {
    ambientContrastRatio: (s) => s.latestAcr,
    ghostRatio: (s) => s.latestGhost,
    transmission: (s) => s.latestTransmission,
    uniformity: (s) => s.latestUniformity,
  };
  const latest = (k: MetricKey, s: (typeof sets)[number]) => latestOf[k]?.(s) ?? null;
  // the one metric list, less what the capture set summary does not carry
  const setMetrics = TABLE_METRICS.filter((k) => latestOf[k] !== undefined);

  return (
    <>
      <PageTitle
        kicker={
          <Link href={`/projects/${projectId}`} className="hover:text-beam">
            {revision.projectName} · revision
          </Link>
        }
        title={<span data-testid="revision-label">{revision.label}</span>}
      >
        <Link href={`/projects/${projectId}/revisions/${revision.id}/stack`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
          Stack &amp; planner
        </Link>
        {can(actor.role, 'compare.read') && variants.length > 1 ? (
          <Link
            href={`/projects/${projectId}/compare?a=${encodeURIComponent(`${revision.id}:${variants[0]}`)}&b=${encodeURIComponent(`${revision.id}:${variants[1]}`)}`}
            className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60"
          >
            Compare variants
          </Link>
        ) : null}
        {can(actor.role, 'export.create') ? (
          <>
            <a href={`/api/revisions/${revision.id}/readings.csv`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
              Readings CSV
            </a>
            <a href={`/api/revisions/${revision.id}/report.pdf`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
              PDF report
            </a>
          </>
        ) : null}
      </PageTitle>
      <p className="-mt-4 mb-6 text-sm text-muted">
        #{revision.position} · {revision.status} · built {revision.builtOn ?? 'not yet'}
        {revision.notes ? ` · ${revision.notes}` : ''}
      </p>
      <div className="space-y-6">
        {checks.length ? (
          <Panel title={<span data-testid="revision-target-summary">Targets · {revision.label} {revisionVerdictText(checks)}</span>}>
            <TargetChecks checks={checks} scope={revision.label} />
          </Panel>
        ) : null}
        <Panel title="Statistics">
          <DataTable
            csvName={`${revision.label}-statistics`}
            testId="revision-statistics"
            columns={[
              { key: 'metric', label: 'Metric' },
              { key: 'group', label: 'Captures' },
              { key: 'n', label: 'n', numeric: true },
              { key: 'mean', label: 'Mean ± 95% CI', numeric: true },
              { key: 'sd', label: 'SD', numeric: true },
            ]}
            rows={statistics.rows.map((r, i) => ({
              id: `${r.metric}-${r.variant ?? '*'}`,
              cells: {
                metric: { text: metricHeading(r.metric), sort: i },
                group: { text: r.variant === null ? 'all' : r.variant || 'no variant label', sort: r.variant === null ? '' : `~${r.variant}` },
                n: { text: String(r.stats.n), sort: r.stats.n },
                mean: { text: formatMetricMeanCi(r.metric, r.stats), sort: r.stats.mean },
                sd: { text: formatMetricSpread(r.metric, r.stats.sd), sort: r.stats.sd },
              },
            }))}
            empty={<EmptyState title="No readings yet">Analyse a capture set of this revision to see n, mean, SD and the 95% interval of each metric.</EmptyState>}
          />
          {statistics.rows.length ? (
            <p className="mt-2 text-xs text-muted" data-testid="revision-statistics-note">
              Each capture set counts once, with its newest reading; 95% intervals with Student’s t (none below 2 captures).
              {statistics.unmeasured.length ? ` No readings yet of: ${statistics.unmeasured.map((k) => METRICS[k].label.toLowerCase()).join(', ')}.` : ''}
            </p>
          ) : null}
        </Panel>
        {outdated.project > 0 || recentBatch ? (
          <Panel title="Engine version">
            <QueryProvider>
              <ReanalysePanel
                projectId={revision.projectId}
                revisionId={revision.id}
                currentEngine={ENGINE_VERSION}
                outdated={outdated}
                canRun={can(actor.role, 'analysis.run')}
                openBatch={recentBatch ? batchView(recentBatch) : null}
              />
            </QueryProvider>
          </Panel>
        ) : null}
        <Panel title="Capture sets">
          <DataTable
            csvName={`${revision.label}-capture-sets`}
            columns={[
              { key: 'label', label: 'Capture set' },
              { key: 'variant', label: 'Variant' },
              { key: 'pattern', label: 'Pattern' },
              { key: 'photos', label: 'Photos', numeric: true },
              { key: 'lux', label: 'Ambient', numeric: true },
              { key: 'status', label: 'Analysis' },
              ...setMetrics.map((k) => ({ key: k, label: metricHeading(k), numeric: true })),
            ]}
            rows={sets.map((s) => ({
              id: s.id,
              href: `/captures/${s.id}`,
              cells: {
                label: { text: s.label },
                variant: { text: s.variant || '—', sort: s.variant },
                pattern: { text: PATTERN_NAMES[s.pattern].short },
                photos: { text: `${s.photoCount} (${s.roles.join(', ') || 'none'})`, sort: s.photoCount },
                lux: { text: formatIlluminance(s.conditions.ambientLux), sort: s.conditions.ambientLux ?? null },
                status: { text: s.latestStatus ? (STATUS_TEXT[s.latestStatus] ?? s.latestStatus) : 'not analysed', sort: s.latestStatus },
                ...Object.fromEntries(setMetrics.map((k) => [k, { text: formatMetricValue(k, latest(k, s)), sort: latest(k, s) }])),
              },
            }))}
            empty={<EmptyState title="No capture sets yet">A capture set is one shot of the eyepiece view: on, off and ambient photos under stated conditions.</EmptyState>}
          />
        </Panel>
        {can(actor.role, 'capture.write') ? (
          <Panel title="New capture set">
            <CreateCaptureSetForm revisionId={revision.id} variants={knownVariants} />
          </Panel>
        ) : null}
        {can(actor.role, 'revision.write') ? (
          <Panel title="Revision details">
            <EditRevisionForm revision={{ id: revision.id, label: revision.label, builtOn: revision.builtOn, position: revision.position, notes: revision.notes, status: revision.status }} />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
