import { NextResponse } from 'next/server';
import { deleteCameraProfile } from '@/db/queries/camera-profiles';
import { withAuth } from '@/lib/auth/with-auth';
import { notFound } from '@/lib/errors';

type P = { profileId: string };
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const DELETE = withAuth<P>(
  async (_req, { actor, params }) => {
    // another lab's profile and a malformed id look the same: not found
    if (!UUID.test(params.profileId) || !(await deleteCameraProfile(actor.labId, actor.user.id, params.profileId))) throw notFound('No such camera profile');
    return NextResponse.json({ ok: true });
  },
  { permission: 'camera.write' },
);
