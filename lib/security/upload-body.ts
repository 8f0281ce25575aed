import { AppError } from '../errors';
import { MAX_UPLOAD_BYTES } from '../schemas/upload';
import { readBodyLimited } from './body-limit';

/** The file's display name from `X-File-Name`: never a storage key or a path. */
export function uploadFileName(req: Request): string {
  const raw = req.headers.get('x-file-name') ?? '';
  let name = raw;
  try {
    name = decodeURIComponent(raw);
  } catch {
    // keep the raw header text
  }
  return name.replace(/[\u0000-\u001f\u007f/\\]/g, '_').trim().slice(0, 200) || 'photo';
}

/**
 * Reads a photo sent as the whole request body (one request a file, so a browser or rig can report
 * progress per file): at most 60 MB, counted while it streams, and refused when it arrives shorter
 * than announced or the connection ends part-way, so nothing half-sent is stored.
 */
export async function readUploadBody(req: Request, name: string): Promise<Uint8Array> {
  const bytes = await readBodyLimited(req, MAX_UPLOAD_BYTES, name).catch((e: unknown) => {
    if (e instanceof AppError) {
      if (e.code === 'too_large') {
        throw new AppError(413, `${name} is larger than 60 MB, the limit for a photo: export a JPEG at high quality or a compressed TIFF`, 'too_large');
      }
      throw e;
    }
    throw new AppError(413, `${name} arrived incomplete: the connection ended before the whole file came; send it again`, 'incomplete');
  });
  const declared = Number(req.headers.get('content-length') ?? NaN);
  // fewer bytes than announced: the transfer (or a proxy's body limit) cut the file short
  if (Number.isFinite(declared) && bytes.byteLength < declared) {
    throw new AppError(413, `${name} arrived incomplete (${bytes.byteLength} of ${declared} bytes): send it again, or ask your admin whether a proxy's request size limit cut it short`, 'incomplete');
  }
  return bytes;
}
