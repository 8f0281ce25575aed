import { NextResponse } from 'next/server';
import { deleteCameraProfile, setCameraDegreesPerPixel } from '@/db/queries/camera-profiles';
import { degreesPerPixelSchema } from '@/lib/schemas/camera-profile';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
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

// the angle one pixel spans, measured on a target of known angle; null or blank clears it
export const PATCH = withAuth<P>(
  async (req, { actor, params }) => {
    const profileId = idOr404(params.profileId, 'camera profile');
    const input = degreesPerPixelSchema.parse(await readJson(req));
    const profile = await setCameraDegreesPerPixel(actor.labId, actor.user.id, profileId, input.degreesPerPixel ?? null);
    if (!profile) throw notFound('No such camera profile');
    return NextResponse.json({ profile: { id: profile.id, name: profile.name, degreesPerPixel: profile.degreesPerPixel } });
  },
  { permission: 'camera.write' },
);
