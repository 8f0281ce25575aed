import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getProject } from '@/db/queries/projects';
import { requireActor } from '@/lib/server/auth/session';
import { projectTitle } from '@/lib/server/page-titles';
import { uuidSchema } from '@/lib/schemas/common';

// Decides 404 before anything streams: the pages below show loading skeletons (loading.tsx), and
// once a skeleton is sent the status is 200 whatever the page finds. A layout sits outside its own
// segment's loading boundary, so a project of another lab (or none) answers 404 here.
export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }): Promise<Metadata> {
  return projectTitle((await params).projectId);
}

export default async function ProjectLayout({ children, params }: { children: React.ReactNode; params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(projectId).success || !(await getProject(actor.labId, projectId))) notFound();
  return children;
}
