import 'server-only';
import { decodePhoto, type DecodedPhoto } from '@/lib/image';
import { AppError } from '@/lib/errors';
import { isEngineInputError } from '@/lib/photometry';
import { MAX_UPLOAD_BYTES } from '@/lib/schemas/upload';
import { readFormLimited } from '@/lib/security/body-limit';

// the photo plus its handful of text fields and the multipart framing
const MAX_FORM_BYTES = MAX_UPLOAD_BYTES + 64 * 1024;
const TOO_LARGE = 'The photo is larger than 60 MB, the limit a photo: export a JPEG at high quality or a compressed TIFF';

/** The photo and the text fields of a camera form (multipart), the photo decoded. */
export async function readCameraForm(req: Request): Promise<{ photo: DecodedPhoto; name: string; fields: Record<string, string> }> {
  let form: FormData;
  try {
    // counted while it streams: a chunked body without a length stops at the limit, never buffered whole
    form = await readFormLimited(req, MAX_FORM_BYTES);
  } catch (e) {
    if (e instanceof AppError && e.status === 413) throw new AppError(413, TOO_LARGE, 'too_large');
    throw new AppError(422, 'Send the form with its photo (multipart/form-data)', 'invalid');
  }
  const file = form.get('photo');
  if (!file || typeof file === 'string' || file.size === 0) throw new AppError(422, 'Choose a photo first', 'invalid', { photo: ['Choose a photo'] });
  if (file.size > MAX_UPLOAD_BYTES) throw new AppError(413, `${file.name} is larger than 60 MB, the limit a photo`, 'too_large');
  const name = (file.name || 'photo').replace(/[\u0000-\u001f\u007f/\\]/g, '_').slice(0, 200);
  const fields: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === 'string') fields[k] = v;
  try {
    const photo = await decodePhoto(new Uint8Array(await file.arrayBuffer()), { name });
    return { photo, name, fields };
  } catch (e) {
    if (isEngineInputError(e)) throw new AppError(422, sentence(e.message), 'photo_refused');
    throw e;
  }
}

/** A RangeError from the engine's checks is the person's input, not a bug: say it as a 422. */
export function asInputError(e: unknown): never {
  if (e instanceof RangeError) throw new AppError(422, sentence(e.message.charAt(0).toUpperCase() + e.message.slice(1)), 'invalid');
  throw e;
}

function sentence(s: string): string {
  const t = s.trim();
  return /[.!?]$/.test(t) ? t : `${t}.`;
}
