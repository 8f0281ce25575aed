import { listPhotos } from '@/db/queries/photos';
import { rigRoute, v1Answer } from '@/lib/api-v1/handler';
import { captureSetOr404 } from '@/lib/api-v1/lookup';
import { ingestPhoto } from '@/lib/storage/ingest-photo';

export const GET = rigRoute(
  'listPhotos',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return v1Answer('listPhotos', 200, { photos: await listPhotos(actor.labId, set.id) });
  },
);

function fileName(req: Request): string {
  const raw = req.headers.get('x-file-name') ?? '';
  let name = raw;
  try {
    name = decodeURIComponent(raw);
  } catch {
    // keep the raw header text
  }
  // a display name only: it never becomes a storage key or a path
  return name.replace(/[\u0000-\u001f\u007f/\\]/g, '_').trim().slice(0, 200) || 'photo';
}

/** The body is the file itself (?role=on|off|ambient|dark), counted while it arrives. */
export const POST = rigRoute(
  'uploadPhoto',
  { permission: 'capture.write' },
  async (req, { actor, params, query, bytes }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const encoding = query.encoding === undefined || query.encoding === 'auto' ? null : query.encoding;
    const { photo, duplicate } = await ingestPhoto({ labId: actor.labId, userId: actor.user.id, captureSetId: set.id, role: query.role, name: fileName(req), bytes, encoding });
    return v1Answer('uploadPhoto', duplicate ? 200 : 201, { photo, duplicate });
  },
);
