import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getCaptureSet } from '@/db/queries/capture-sets';
import { requireActor } from '@/lib/server/auth/session';
import { captureTitle } from '@/lib/server/page-titles';
import { uuidSchema } from '@/lib/schemas/common';

// 404 decided before the capture page's loading skeleton streams: once it is sent the status is
// 200 whatever the page finds. A layout sits outside its own segment's loading boundary.
export async function generateMetadata({ params }: { params: Promise<{ captureId: string }> }): Promise<Metadata> {
  return captureTitle((await params).captureId);
}

export default async function CaptureLayout({ children, params }: { children: React.ReactNode; params: Promise<{ captureId: string }> }) {
  const { captureId } = await params;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(captureId).success || !(await getCaptureSet(actor.labId, captureId))) notFound();
  return children;
}
