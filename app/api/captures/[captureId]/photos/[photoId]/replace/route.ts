import { NextResponse } from 'next/server';
import { getPhoto } from '@/db/queries/photos';
import { notFound } from '@/lib/errors';
import { withAuth } from '@/lib/server/auth/with-auth';
import { readUploadBody, uploadFileName } from '@/lib/security/upload-body';
import { ingestPhoto } from '@/lib/server/storage/ingest-photo';
import { captureSetOr404, idOr404 } from '../../../../lookup';

type P = { captureId: string; photoId: string };

/**
 * Replaces one photo with the file sent as the body: the new file takes its role, is checked as
 * any upload is (the photo it replaces is left out of the size check), and the old photo and its
 * files go in the same step. The new file is read as the capture set and the file say (a
 * declaration made for the old photo was about that file). Readings made before stay, marked as
 * made from other photos (db/queries/photo-changes.ts).
 */
export const POST = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const old = await getPhoto(actor.labId, idOr404(params.photoId, 'photo'));
    if (!old || old.captureSetId !== set.id) throw notFound('No such photo');
    const name = uploadFileName(req);
    const bytes = await readUploadBody(req, name);
    const { photo, duplicate } = await ingestPhoto({ labId: actor.labId, userId: actor.user.id, captureSetId: set.id, role: old.role, name, bytes, replaces: old.id });
    const { storageKey: _s, previewKey: _p, ...shown } = photo;
    return NextResponse.json({ photo: shown, duplicate, replaced: duplicate ? null : old.id }, { status: duplicate ? 200 : 201 });
  },
  { permission: 'capture.write' },
);
