import { NextResponse } from 'next/server';
import { deleteCameraProfile } from '@/db/queries/camera-profiles';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/reports/http';

type P = { profileId: string };

export const DELETE = withAuth<P>(
  async (_req, { actor, params }) => {
    // another lab's profile and a malformed id look the same: not found
    const profileId = idOr404(params.profileId, 'camera profile');
    if (!(await deleteCameraProfile(actor.labId, actor.user.id, profileId))) throw notFound('No such camera profile');
    return NextResponse.json({ ok: true });
  },
  { permission: 'camera.write' },
);
