import { CreateProjectForm } from '@/components/projects/project-forms';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { listProjects } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/auth/session';
import { formatDate } from '@/lib/format';

export const metadata = { title: 'Projects' };

export default async function ProjectsPage() {
  const actor = await requireActor();
  const projects = await listProjects(actor.labId);
  const rows = projects.map((p) => ({
    id: p.id,
    href: `/projects/${p.id}`,
    cells: {
      name: { text: p.name },
      revisions: { text: String(p.revisionCount), sort: p.revisionCount },
      captures: { text: String(p.captureCount), sort: p.captureCount },
      last: { text: p.lastReadingAt ? formatDate(p.lastReadingAt) : '—', sort: p.lastReadingAt?.getTime() ?? null },
      updated: { text: formatDate(p.updatedAt), sort: p.updatedAt.getTime() },
    },
  }));
  return (
    <>
      <PageTitle kicker={actor.labName} title="Projects" />
      <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
        <Panel title="All projects">
          <DataTable
            csvName="veilmeter-projects"
            columns={[
              { key: 'name', label: 'Project' },
              { key: 'revisions', label: 'Revisions', numeric: true },
              { key: 'captures', label: 'Capture sets', numeric: true },
              { key: 'last', label: 'Last reading' },
              { key: 'updated', label: 'Updated' },
            ]}
            rows={rows}
            empty={<EmptyState title="No projects yet">{can(actor.role, 'project.write') ? 'Create the first one with the form beside this list.' : 'A lead or admin of this lab can create one.'}</EmptyState>}
          />
        </Panel>
        {can(actor.role, 'project.write') ? (
          <Panel title="New project">
            <CreateProjectForm />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
