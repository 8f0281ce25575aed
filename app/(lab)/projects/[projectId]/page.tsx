import Link from 'next/link';
import { notFound } from 'next/navigation';
import { DeleteProjectForm, RenameProjectForm } from '@/components/projects/project-forms';
import { CreateRevisionForm } from '@/components/revisions/revision-forms';
import { TargetsPanel } from '@/components/targets/targets-panel';
import { TrendChart } from '@/components/trends/trend-chart';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { getProject } from '@/db/queries/projects';
import { listRevisions } from '@/db/queries/revisions';
import { listProjectVariants, listTargets } from '@/db/queries/targets';
import { getProjectTrend } from '@/db/queries/trends';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { uuidSchema } from '@/lib/schemas/common';
import { checkTargetsOn } from '@/lib/targets/evaluate';
import { isMetricKey } from '@/lib/targets/metrics';

const LINK = 'rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60';

export default async function ProjectPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { projectId } = await params;
  const { metric } = await searchParams;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(projectId).success) notFound();
  const project = await getProject(actor.labId, projectId);
  if (!project) notFound();
  const [revisions, trend, targets, variants] = await Promise.all([
    listRevisions(actor.labId, project.id),
    getProjectTrend(actor.labId, project.id),
    listTargets(actor.labId, project.id),
    listProjectVariants(actor.labId, project.id),
  ]);
  // the project's target status is its latest measured build's
  const latest = trend ? [...trend.revisions].reverse().find((r) => trend.readings.some((g) => g.revisionId === r.id)) : undefined;
  const latestReadings = latest && trend ? trend.readings.filter((g) => g.revisionId === latest.id) : [];
  // each target judged per variant, on the capture sets whose stated conditions meet it
  const checks = checkTargetsOn(targets, latestReadings);

  return (
    <>
      <PageTitle kicker="Project" title={<span data-testid="project-name">{project.name}</span>}>
        {can(actor.role, 'compare.read') ? (
          <Link href={`/projects/${project.id}/compare`} className={LINK}>
            Compare
          </Link>
        ) : null}
        {can(actor.role, 'export.create') ? (
          <>
            <a href={`/api/projects/${project.id}/readings.csv`} className={LINK}>
              Readings CSV
            </a>
            <a href={`/api/projects/${project.id}/report.pdf`} className={LINK}>
              PDF report
            </a>
          </>
        ) : null}
      </PageTitle>
      {project.description ? <p className="-mt-4 mb-6 max-w-3xl text-sm text-muted">{project.description}</p> : null}
      <div className="space-y-6">
        <Panel title="Revisions">
          <DataTable
            csvName={`${project.name}-revisions`}
            columns={[
              { key: 'label', label: 'Revision' },
              { key: 'position', label: 'Order', numeric: true },
              { key: 'builtOn', label: 'Built' },
              { key: 'status', label: 'Status' },
              { key: 'captures', label: 'Capture sets', numeric: true },
            ]}
            rows={revisions.map((r) => ({
              id: r.id,
              href: `/projects/${project.id}/revisions/${r.id}`,
              cells: {
                label: { text: r.label },
                position: { text: String(r.position), sort: r.position },
                builtOn: { text: r.builtOn ?? '—', sort: r.builtOn },
                status: { text: r.status },
                captures: { text: String(r.captureCount), sort: r.captureCount },
              },
            }))}
            empty={<EmptyState title="No revisions yet">Revisions are the builds of this optical stack, in order.</EmptyState>}
          />
        </Panel>
        {trend ? (
          <Panel title="Trends across revisions">
            <TrendChart projectId={project.id} trends={trend.trends} targets={targets} initialMetric={isMetricKey(metric) ? metric : undefined} />
          </Panel>
        ) : null}
        <Panel title="Targets">
          <TargetsPanel projectId={project.id} checks={checks} targets={targets} scope={latest?.label ?? null} canEdit={can(actor.role, 'target.write')} variants={variants} />
        </Panel>
        {can(actor.role, 'revision.write') ? (
          <Panel title="New revision">
            <CreateRevisionForm projectId={project.id} />
          </Panel>
        ) : null}
        {can(actor.role, 'project.write') || can(actor.role, 'project.delete') ? (
          <Panel title="Project settings">
            <div className="space-y-6">
              {can(actor.role, 'project.write') ? <RenameProjectForm id={project.id} name={project.name} /> : null}
              {can(actor.role, 'project.delete') ? <DeleteProjectForm id={project.id} name={project.name} /> : null}
            </div>
          </Panel>
        ) : null}
      </div>
    </>
  );
}
