import { getPhoto } from '@/db/queries/photos';
import { notFound } from '@/lib/errors';
import { makeThumbnail } from '@/lib/image/thumbnail';
import { withAuth } from '@/lib/server/auth/with-auth';
import { ByteLru } from '@/lib/server/cache/lru';
import { getStorage } from '@/lib/server/storage';
import { captureSetOr404, idOr404 } from '../../../../lookup';

// thumbnails of the photos open lately, by their preview's key (a key never gets new content)
const cache = new ByteLru<Buffer>(8 * 1024 * 1024);

/** A photo's thumbnail (WebP, at most 192 px a side), for a photo of this lab's capture set only. */
export const GET = withAuth<{ captureId: string; photoId: string }>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photo = await getPhoto(actor.labId, idOr404(params.photoId, 'photo'));
    if (!photo || photo.captureSetId !== set.id) throw notFound('No such photo');
    if (!photo.previewKey) throw notFound('This photo has no preview to make a thumbnail from');
    const etag = `"thumb-${photo.id}"`;
    // private: the answer depends on the session; immutable: a photo id never gets other content
    const headers = { etag, 'cache-control': 'private, max-age=86400, immutable', 'x-content-type-options': 'nosniff' };
    if (req.headers.get('if-none-match') === etag) return new Response(null, { status: 304, headers });
    let thumb = cache.get(photo.previewKey);
    if (!thumb) {
      const preview = await getStorage().get(photo.previewKey);
      if (!preview) throw notFound('The stored preview is missing');
      thumb = await makeThumbnail(preview);
      cache.set(photo.previewKey, thumb, thumb.byteLength);
    }
    return new Response(new Uint8Array(thumb), { status: 200, headers: { ...headers, 'content-type': 'image/webp', 'content-length': String(thumb.byteLength) } });
  },
  { permission: 'capture.read' },
);
