import { cookies } from 'next/headers';
import { FirstVisitGuide } from '@/components/projects/first-visit-guide';
import { GUIDE_COOKIE } from '@/components/projects/guide-cookie';
import { CreateProjectForm } from '@/components/projects/project-forms';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { listProjectLatest, listProjects } from '@/db/queries/projects';
import { listProjectTargetStatus } from '@/db/queries/targets';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDate } from '@/lib/format';
import { formatMetricValue } from '@/lib/format';
import { revisionVerdictText, verdictSortKey } from '@/lib/targets/evaluate';

export const metadata = { title: 'Projects' };

export default async function ProjectsPage() {
  const actor = await requireActor();
  const [projects, status, latest] = await Promise.all([listProjects(actor.labId), listProjectTargetStatus(actor.labId), listProjectLatest(actor.labId)]);
  const targetCell = (id: string) => {
    const s = status.get(id);
    if (!s) return { text: 'no targets', sort: null };
    const words = revisionVerdictText(s.checks);
    // failing first when sorted: the projects that need a look
    return { text: s.revisionLabel ? `${s.revisionLabel} ${words}` : words, sort: verdictSortKey(s.checks) };
  };
  const rows = projects.map((p) => {
    const l = latest.get(p.id);
    return {
      id: p.id,
      href: `/projects/${p.id}`,
      cells: {
        name: { text: p.name },
        revisions: { text: String(p.revisionCount), sort: p.revisionCount },
        captures: { text: String(p.captureCount), sort: p.captureCount },
        last: { text: p.lastReadingAt ? formatDate(p.lastReadingAt) : '—', sort: p.lastReadingAt?.getTime() ?? null },
        newest: { text: l?.revisionLabel ?? '—', sort: l?.revisionLabel ?? null },
        acr: { text: formatMetricValue('ambientContrastRatio', l?.acr), sort: l?.acr ?? null },
        ghost: { text: formatMetricValue('ghostRatio', l?.ghost), sort: l?.ghost ?? null },
        targets: targetCell(p.id),
        updated: { text: formatDate(p.updatedAt), sort: p.updatedAt.getTime() },
      },
    };
  });
  // a lab with no projects yet gets the guide to the capture flow, until someone dismisses it
  const showGuide = projects.length === 0 && (await cookies()).get(GUIDE_COOKIE)?.value !== 'dismissed';
  return (
    <>
      <PageTitle kicker={actor.labName} title="Projects" />
      {showGuide ? <FirstVisitGuide canCreate={can(actor.role, 'project.write')} /> : null}
      <div className="grid gap-6 2xl:grid-cols-[minmax(0,1fr)_22rem]">
        <Panel title="All projects">
          <DataTable
            csvName="veilmeter-projects"
            columns={[
              { key: 'name', label: 'Project' },
              { key: 'revisions', label: 'Revisions', numeric: true },
              { key: 'captures', label: 'Capture sets', numeric: true },
              { key: 'last', label: 'Last reading' },
              { key: 'newest', label: 'Newest revision' },
              { key: 'acr', label: 'Contrast (mean)', numeric: true },
              { key: 'ghost', label: 'Ghost (mean)', numeric: true },
              { key: 'targets', label: 'Targets' },
              { key: 'updated', label: 'Updated' },
            ]}
            rows={rows}
            empty={<EmptyState title="No projects yet">{can(actor.role, 'project.write') ? 'Create the first one with the form beside this list.' : 'A lead or admin of this lab can create one.'}</EmptyState>}
          />
        </Panel>
        {can(actor.role, 'project.write') ? (
          <div id="new-project" className="scroll-mt-6">
            <Panel title="New project">
              <CreateProjectForm />
            </Panel>
          </div>
        ) : null}
      </div>
    </>
  );
}
