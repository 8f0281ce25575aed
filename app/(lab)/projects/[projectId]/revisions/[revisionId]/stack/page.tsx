import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { buildComparisonRows, COMPARISON_COLUMNS } from '@/components/stack/comparison';
import { PlannerCautions } from '@/components/stack/planner-cautions';
import { storedElements, type MeasuredPoint } from '@/components/stack/planner-model';
import { StackWorkbench } from '@/components/stack/stack-workbench';
import { readVariantStacks } from '@/components/stack/workbench-model';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { getProject } from '@/db/queries/projects';
import { getRevisionStack, listMeasuredForPlanner, listRevisionsWithStacks } from '@/db/queries/stacks';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { revisionTitle } from '@/lib/server/page-titles';
import { uuidSchema } from '@/lib/schemas/common';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string; revisionId: string }> }): Promise<Metadata> {
  const { projectId, revisionId } = await params;
  return revisionTitle(projectId, revisionId, 'Stack planner');
}

type Params = { projectId: string; revisionId: string };

const litAllOver = (pattern: string) => pattern === 'full' || pattern === 'checkerboard';

export default async function StackPage({ params }: { params: Promise<Params> }) {
  const { projectId, revisionId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(projectId).success || !uuidSchema.safeParse(revisionId).success) notFound();
  const [project, revision] = await Promise.all([getProject(actor.labId, projectId), getRevisionStack(actor.labId, projectId, revisionId)]);
  if (!project || !revision) notFound();
  const [revisions, readings] = await Promise.all([listRevisionsWithStacks(actor.labId, projectId), listMeasuredForPlanner(actor.labId, projectId)]);

  const { elements, complete } = storedElements(revision.stack);
  const measured: MeasuredPoint[] = readings
    .filter((r) => r.revisionId === revision.revisionId)
    .map((r) => ({
      captureSetId: r.captureSetId,
      variant: r.variant,
      backgroundCdm2: r.backgroundCdm2,
      photoBackground: r.photoBackground,
      // a marker or square darkens part of the screen: its contrast and ghost are not the stack's
      ambientContrastRatio: litAllOver(r.pattern) ? r.ambientContrastRatio : null,
      ghostRatio: litAllOver(r.pattern) ? r.ghostRatio : null,
      transmission: r.transmission,
      orientation: r.orientation,
    }));
  const rows = buildComparisonRows(revisions, readings);

  return (
    <>
      <PageTitle
        kicker={
          <Link href={`/projects/${project.id}`} className="hover:text-beam">
            {project.name}
          </Link>
        }
        title={<span data-testid="revision-label">{revision.label} · stack planner</span>}
      >
        <nav aria-label="Revisions" className="flex flex-wrap gap-1">
          {revisions.map((r) => (
            <Link
              key={r.revisionId}
              href={`/projects/${project.id}/revisions/${r.revisionId}/stack`}
              aria-current={r.revisionId === revision.revisionId ? 'page' : undefined}
              className={
                r.revisionId === revision.revisionId
                  ? 'rounded-md bg-beam/15 px-2.5 py-1 text-sm text-beam'
                  : 'rounded-md px-2.5 py-1 text-sm text-muted hover:bg-raised hover:text-ink'
              }
            >
              {r.label}
            </Link>
          ))}
        </nav>
      </PageTitle>
      {revision.notes ? <p className="-mt-4 mb-6 max-w-3xl text-sm text-muted">{revision.notes}</p> : null}

      <div className="space-y-6">
        <StackWorkbench
          projectId={project.id}
          revisionId={revision.revisionId}
          revisionLabel={revision.label}
          initialElements={elements}
          storedComplete={complete}
          canWrite={can(actor.role, 'stack.write')}
          measured={measured}
          initialVariantStacks={readVariantStacks(revision.variantStacks)}
          cautions={<PlannerCautions />}
        />

        <Panel title="Predicted against measured, per revision and variant">
          <p className="mb-3 text-xs text-muted">
            Each variant’s saved stack (the revision’s stack changed as the variant says) against the mean of that variant’s newest readings only (one per capture set). The
            predicted contrast ratio is taken at the median background luminance of those readings: typed where given, else from the photos (a camera profile, or the rough EXIF
            estimate, marked). The ghost is the unpolarised back-surface ratio.
          </p>
          {readings.length === 0 ? (
            <EmptyState title="No measurements yet">
              Predictions appear here beside the measured values once capture sets of this project have been analysed.
            </EmptyState>
          ) : null}
          <div data-testid="comparison-table" className={readings.length === 0 ? 'mt-4' : undefined}>
            <DataTable csvName={`${project.name}-predicted-vs-measured`} columns={COMPARISON_COLUMNS} rows={rows} />
          </div>
        </Panel>
      </div>
    </>
  );
}
