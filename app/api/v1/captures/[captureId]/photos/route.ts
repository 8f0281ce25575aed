import { listPhotos } from '@/db/queries/photos';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';
import { uploadFileName } from '@/lib/security/upload-body';
import { ingestPhoto } from '@/lib/server/storage/ingest-photo';

export const GET = rigRoute(
  'listPhotos',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return v1Answer('listPhotos', 200, { photos: await listPhotos(actor.labId, set.id) });
  },
);

/** The body is the file itself (?role=on|off|ambient|dark), counted while it arrives. */
export const POST = rigRoute(
  'uploadPhoto',
  { permission: 'capture.write' },
  async (req, { actor, params, query, bytes }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const encoding = query.encoding === undefined || query.encoding === 'auto' ? null : query.encoding;
    const { photo, duplicate } = await ingestPhoto({ labId: actor.labId, userId: actor.user.id, captureSetId: set.id, role: query.role, name: uploadFileName(req), bytes, encoding });
    return v1Answer('uploadPhoto', duplicate ? 200 : 201, { photo, duplicate });
  },
);
