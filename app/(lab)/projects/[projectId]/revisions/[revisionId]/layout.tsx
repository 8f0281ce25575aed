import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getRevision } from '@/db/queries/revision-edits';
import { requireActor } from '@/lib/server/auth/session';
import { revisionTitle } from '@/lib/server/page-titles';
import { uuidSchema } from '@/lib/schemas/common';

// 404 decided before the revision's loading skeleton streams (see ../../layout.tsx): a revision of
// another lab, or of another project than the one in the address, is not found.
export async function generateMetadata({ params }: { params: Promise<{ projectId: string; revisionId: string }> }): Promise<Metadata> {
  const { projectId, revisionId } = await params;
  return revisionTitle(projectId, revisionId);
}

export default async function RevisionLayout({ children, params }: { children: React.ReactNode; params: Promise<{ projectId: string; revisionId: string }> }) {
  const { projectId, revisionId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(revisionId).success) notFound();
  const revision = await getRevision(actor.labId, revisionId);
  if (!revision || revision.projectId !== projectId) notFound();
  return children;
}
