import { notFound } from 'next/navigation';
import { DeleteProjectForm, RenameProjectForm } from '@/components/projects/project-forms';
import { CreateRevisionForm } from '@/components/revisions/revision-forms';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { getProject } from '@/db/queries/projects';
import { listRevisions } from '@/db/queries/revisions';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/auth/session';
import { uuidSchema } from '@/lib/schemas/common';

export default async function ProjectPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(projectId).success) notFound();
  const project = await getProject(actor.labId, projectId);
  if (!project) notFound();
  const revisions = await listRevisions(actor.labId, project.id);

  return (
    <>
      <PageTitle kicker="Project" title={<span data-testid="project-name">{project.name}</span>} />
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
