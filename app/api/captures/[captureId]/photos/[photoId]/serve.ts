import 'server-only';
import { getPhoto } from '@/db/queries/photos';
import { notFound } from '@/lib/errors';
import { getStorage } from '@/lib/server/storage';
import { captureSetOr404, idOr404 } from '../../../lookup';

const TYPES: Record<string, string> = { jpeg: 'image/jpeg', png: 'image/png', tiff: 'image/tiff', webp: 'image/webp' };
const EXT: Record<string, string> = { jpeg: 'jpg', png: 'png', tiff: 'tif', webp: 'webp' };

/** Streams a photo's preview or original; only ever for a photo of this lab's capture set. */
export async function servePhoto(labId: string, captureId: string, photoId: string, which: 'preview' | 'original'): Promise<Response> {
  const set = await captureSetOr404(labId, captureId);
  const photo = await getPhoto(labId, idOr404(photoId, 'photo'));
  if (!photo || photo.captureSetId !== set.id) throw notFound('No such photo');
  const key = which === 'preview' ? photo.previewKey : photo.storageKey;
  const bytes = key ? await getStorage().get(key) : null;
  if (!bytes) throw notFound('The stored file is missing');
  const headers: Record<string, string> = {
    'content-type': which === 'preview' ? 'image/webp' : (TYPES[photo.format] ?? 'application/octet-stream'),
    'content-length': String(bytes.byteLength),
    // private: the answer depends on the session; immutable: a key never gets new content
    'cache-control': 'private, max-age=86400, immutable',
    'x-content-type-options': 'nosniff',
  };
  if (which === 'original') {
    const safe = `${set.label}-${photo.role}`.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 80);
    headers['content-disposition'] = `attachment; filename="${safe}.${EXT[photo.format] ?? 'bin'}"`;
  }
  return new Response(new Uint8Array(bytes), { status: 200, headers });
}
