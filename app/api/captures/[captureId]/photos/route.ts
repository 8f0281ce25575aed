import { NextResponse } from 'next/server';
import { withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { photoEncodingSchema } from '@/lib/schemas/capture-set';
import { photoRoleSchema } from '@/lib/schemas/upload';
import { ingestPhoto } from '@/lib/server/storage/ingest-photo';
import { readUploadBody, uploadFileName } from '@/lib/security/upload-body';
import { captureSetOr404 } from '../../lookup';

type P = { captureId: string };

export const POST = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const role = photoRoleSchema.safeParse(new URL(req.url).searchParams.get('role'));
    if (!role.success) throw new AppError(422, 'Say which photo this is: on, off, ambient or dark', 'invalid', { role: ['Pick a role'] });
    // optional: how this photo's values encode light (linear or srgb); without it the set and the file decide
    const rawEncoding = new URL(req.url).searchParams.get('encoding');
    const encoding = rawEncoding === null || rawEncoding === '' || rawEncoding === 'auto' ? { success: true as const, data: { encoding: null } } : photoEncodingSchema.safeParse({ encoding: rawEncoding });
    if (!encoding.success) throw new AppError(422, 'The encoding is linear, srgb or auto (follow the capture set and the file)', 'invalid', { encoding: ['Pick linear, srgb or auto'] });
    const name = uploadFileName(req);
    const bytes = await readUploadBody(req, name);
    const { photo, duplicate } = await ingestPhoto({ labId: actor.labId, userId: actor.user.id, captureSetId: set.id, role: role.data, name, bytes, encoding: encoding.data.encoding });
    const { storageKey: _s, previewKey: _p, ...shown } = photo;
    return NextResponse.json({ photo: shown, duplicate }, { status: duplicate ? 200 : 201 });
  },
  { permission: 'capture.write' },
);
