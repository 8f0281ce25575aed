import { createHash } from 'node:crypto';
import { findPhotoBySha, listPhotos, putPhoto, replacesInBracket, type Photo } from '../../../db/queries/photos';
import { AppError } from '../../errors';
import { EXIF_BOUNDS, exifText, withinBounds } from '../../image/exif';
import { makePreview } from '../../image/preview';
import { isRawFormat } from '../../image/raw-formats';
import { probePhoto, type ProbedPhoto } from '../../image/probe';
import { isEngineInputError } from '../../photometry/errors';
import { MAX_UPLOAD_BYTES, ROLE_LABELS, type PhotoRole } from '../../schemas/upload';
import { deleteKeys, getStorage, photoKey, previewKey } from './index';

/** `bracketSize`: photos of this role now kept (several at different exposures form a bracket). */
export type IngestResult = { photo: Photo; duplicate: boolean; bracketSize?: number };

const refuse = (message: string, code = 'photo_refused', status = 422) => new AppError(status, message, code);

/**
 * Takes one uploaded photo for a role (a photo at a new exposure joins the role's bracket; one at
 * an exposure the role already has replaces that shot): checks it (type from content, size, pixels, same size as
 * the set's other photos, not already in the lab), stores the original and a preview under fresh
 * keys, then records it. A refused file leaves no row and no stored object behind.
 */
export async function ingestPhoto(input: { labId: string; userId: string; captureSetId: string; role: PhotoRole; name: string; bytes: Uint8Array; encoding?: 'linear' | 'srgb' | null; replaces?: string }): Promise<IngestResult> {
  const { labId, userId, captureSetId, role, bytes } = input;
  const name = input.name.trim().slice(0, 200) || `${role} photo`;
  if (bytes.length > MAX_UPLOAD_BYTES) throw refuse(`${name} is ${(bytes.length / 1048576).toFixed(0)} MB; the limit is 60 MB a photo: export a JPEG at high quality or a compressed TIFF`, 'too_large', 413);

  let probed;
  try {
    probed = await probePhoto(bytes, name);
  } catch (e) {
    if (isEngineInputError(e)) throw refuse(sentence(e.message));
    throw e;
  }

  // a camera raw photo is always decoded to linear light: declaring it sRGB-encoded is a mistake to say
  if (isRawFormat(probed.format) && input.encoding === 'srgb') {
    throw refuse(`${name} is a camera raw file, which is always read as linear light: upload it without an encoding (or with linear).`, 'raw_always_linear');
  }
  // only a 16-bit TIFF (or a camera raw file) can hold linear values (the engine refuses the rest, as the CLI's --linear16 does)
  if (input.encoding === 'linear' && !isRawFormat(probed.format) && !(probed.format === 'tiff' && probed.bitDepth === 16)) {
    throw refuse(`${name} is ${probed.bitDepth === 8 ? 'an' : 'a'} ${probed.bitDepth}-bit ${probed.format === 'jpeg' ? 'JPEG' : probed.format.toUpperCase()}, so it cannot be declared linear: only 16-bit TIFFs can.`, 'not_linear');
  }

  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const existing = await findPhotoBySha(labId, sha256);
  if (existing) {
    if (existing.captureSetId === captureSetId && existing.role === role) return { photo: existing, duplicate: true };
    const where = existing.captureSetId === captureSetId ? `as the ${ROLE_LABELS[existing.role].toLowerCase()} photo of this set` : `in capture set “${existing.captureSetLabel}” (${existing.role})`;
    throw refuse(`${name} is already uploaded ${where}. Each photo belongs to one capture set: shoot the ${role} photo separately.`, 'duplicate', 409);
  }

  // bracket members share the size of every other photo in the set, whatever their role; a photo
  // this upload replaces (same role, same exposure) is not compared
  const exif = plausibleExif(probed.exif);
  // (nor is the photo it was picked to replace, `input.replaces`, whatever its exposure)
  const others = (await listPhotos(labId, captureSetId)).filter((p) => p.id !== input.replaces && (p.role !== role || !replacesInBracket(p.exif, exif)));
  const mismatch = others.find((p) => p.width !== probed.width || p.height !== probed.height);
  if (mismatch) {
    throw refuse(`${name} is ${probed.width} × ${probed.height} pixels but the ${mismatch.role} photo is ${mismatch.width} × ${mismatch.height}: shoot every role with the same camera and settings, uncropped`, 'size_mismatch');
  }

  let preview;
  try {
    preview = await makePreview(bytes, name);
  } catch (e) {
    // a raw file's half-size decode says what went wrong in its own words
    if (isEngineInputError(e)) throw refuse(sentence(e.message));
    throw refuse(`${name} is damaged or cut short and cannot be decoded: upload the complete file again`);
  }

  const storage = getStorage();
  const original = photoKey(labId, probed.ext);
  const small = previewKey(labId);
  const written: string[] = [];
  try {
    await storage.put(original, bytes, { contentType: probed.contentType });
    written.push(original);
    await storage.put(small, preview.webp, { contentType: 'image/webp' });
    written.push(small);
    const put = await putPhoto(labId, userId, captureSetId, {
      role,
      storageKey: original,
      previewKey: small,
      sha256,
      bytes: bytes.length,
      width: probed.width,
      height: probed.height,
      format: probed.format,
      bitDepth: probed.bitDepth,
      encodingFile: probed.encoding.encoding,
      encodingReason: probed.encoding.reason,
      encodingDeclared: input.encoding ?? null,
      pages: probed.pages,
      exif,
      originalName: name,
    }, input.replaces);
    if (!put) throw refuse('The photo to replace was removed in the meantime: nothing was stored. Upload the file as a new photo.', 'gone', 409);
    const { photo, replacedKeys, bracketSize } = put;
    await deleteKeys(replacedKeys);
    return { photo, duplicate: false, bracketSize };
  } catch (e) {
    await deleteKeys(written);
    // two uploads of the same file at once: the loser sees the same message as a later duplicate
    if ((e as { code?: string }).code === '23505') throw refuse(`${name} is already uploaded in this lab.`, 'duplicate', 409);
    throw e;
  }
}

// EXIF is whatever the file says: values no camera can produce are dropped rather than shown to
// the tester as facts about the shot (a 10⁹ s exposure, a photo taken in the year 10007)
function plausibleExif(exif: ProbedPhoto['exif']): ProbedPhoto['exif'] {
  const out: ProbedPhoto['exif'] = {};
  if (withinBounds(exif.exposureTime, EXIF_BOUNDS.exposureTime)) out.exposureTime = exif.exposureTime;
  if (withinBounds(exif.fNumber, EXIF_BOUNDS.fNumber)) out.fNumber = exif.fNumber;
  if (withinBounds(exif.iso, EXIF_BOUNDS.iso)) out.iso = exif.iso;
  if (withinBounds(exif.orientation, EXIF_BOUNDS.orientation)) out.orientation = exif.orientation;
  const make = exifText(exif.make);
  const model = exifText(exif.model);
  const lens = exifText(exif.lens);
  if (make) out.make = make;
  if (model) out.model = model;
  if (lens) out.lens = lens;
  const taken = exif.takenAt ? Date.parse(exif.takenAt) : NaN;
  if (Number.isFinite(taken) && taken >= Date.UTC(1990, 0, 1) && taken <= Date.now() + 366 * 86_400_000) out.takenAt = exif.takenAt;
  return out;
}

// messages start with the file's own name, so only the full stop is added
function sentence(s: string): string {
  const t = s.trim();
  return /[.!?]$/.test(t) ? t : `${t}.`;
}
