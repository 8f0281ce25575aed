import type { Knex } from 'knex';
import { getDb } from '../index';
import type { PhotoRole } from '../../lib/schemas/upload';
import { recordAudit } from './audit';

export type PhotoExif = { exposureTime?: number; fNumber?: number; iso?: number; make?: string; model?: string; lens?: string; takenAt?: string; orientation?: number };

export type Photo = {
  id: string;
  captureSetId: string;
  role: PhotoRole;
  storageKey: string;
  previewKey: string | null;
  sha256: string;
  bytes: number;
  width: number;
  height: number;
  format: string;
  bitDepth: number;
  /** What the file said about its encoding at upload (null: stored before files were asked). */
  encodingFile: 'linear' | 'srgb' | null;
  encodingReason: string;
  /** The tester's declaration for this photo; null follows the capture set. */
  encodingDeclared: 'linear' | 'srgb' | null;
  /** Pages in the file; the first is measured. */
  pages: number;
  exif: PhotoExif;
  originalName: string;
  createdAt: Date;
};

type Row = { id: string; capture_set_id: string; role: PhotoRole; storage_key: string; preview_key: string | null; sha256: string; bytes: string | number; width: number; height: number; format: string; bit_depth: number; encoding_file?: 'linear' | 'srgb' | null; encoding_reason?: string; encoding_declared?: 'linear' | 'srgb' | null; pages?: number; exif: PhotoExif | null; original_name: string; created_at: Date };

const toPhoto = (r: Row): Photo => ({
  id: r.id,
  captureSetId: r.capture_set_id,
  role: r.role,
  storageKey: r.storage_key,
  previewKey: r.preview_key,
  sha256: r.sha256.trim(),
  bytes: Number(r.bytes),
  width: r.width,
  height: r.height,
  format: r.format,
  bitDepth: r.bit_depth,
  encodingFile: r.encoding_file ?? null,
  encodingReason: r.encoding_reason ?? '',
  encodingDeclared: r.encoding_declared ?? null,
  pages: r.pages ?? 1,
  exif: r.exif ?? {},
  originalName: r.original_name,
  createdAt: r.created_at,
});

const ROLE_ORDER = "CASE role WHEN 'on' THEN 1 WHEN 'off' THEN 2 WHEN 'ambient' THEN 3 ELSE 4 END";

export async function listPhotos(labId: string, captureSetId: string, trx: Knex | Knex.Transaction = getDb()): Promise<Photo[]> {
  const rows: Row[] = await trx('photos').where({ lab_id: labId, capture_set_id: captureSetId }).orderByRaw(`${ROLE_ORDER}, created_at`);
  return rows.map(toPhoto);
}

export async function getPhoto(labId: string, id: string): Promise<Photo | null> {
  const row: Row | undefined = await getDb()('photos').where({ lab_id: labId, id }).first();
  return row ? toPhoto(row) : null;
}

/** The photo with this content in the lab, and the capture set that holds it. */
export async function findPhotoBySha(labId: string, sha256: string): Promise<(Photo & { captureSetLabel: string }) | null> {
  const row = await getDb()('photos as ph').join('capture_sets as c', 'c.id', 'ph.capture_set_id').where({ 'ph.lab_id': labId, 'ph.sha256': sha256 }).first('ph.*', 'c.label as capture_set_label');
  return row ? { ...toPhoto(row as Row), captureSetLabel: (row as { capture_set_label: string }).capture_set_label } : null;
}

export type PhotoWrite = Omit<Photo, 'id' | 'createdAt' | 'captureSetId' | 'encodingDeclared' | 'encodingFile' | 'encodingReason' | 'pages'> & Partial<Pick<Photo, 'encodingDeclared' | 'encodingFile' | 'encodingReason' | 'pages'>>;

const sameExposure = (a: PhotoExif, b: PhotoExif): boolean => a.exposureTime === b.exposureTime && a.fNumber === b.fNumber && a.iso === b.iso;
const fullExposure = (e: PhotoExif): boolean => [e.exposureTime, e.fNumber, e.iso].every((v) => typeof v === 'number' && v > 0);

/** Whether a new photo with `incoming` EXIF replaces an earlier photo of its role (a reshoot) rather than joining its bracket. */
export function replacesInBracket(earlier: PhotoExif, incoming: PhotoExif): boolean {
  return !fullExposure(incoming) || !fullExposure(earlier) || sameExposure(earlier, incoming);
}

/**
 * Stores a photo of a role as part of its bracket: earlier photos of the role taken with the same
 * exposure (a reshoot) are replaced, photos at other exposures are kept. Without full exposure
 * EXIF nothing can tell the shots apart, so the role keeps only the new photo. `replaces` names a
 * photo of the role that goes whatever its exposure (a replacement picked on the page); null when
 * that photo is no longer there, and nothing is stored then.
 */
export async function putPhoto(labId: string, userId: string, captureSetId: string, p: PhotoWrite, replaces?: string): Promise<{ photo: Photo; replacedKeys: string[]; bracketSize: number } | null> {
  return getDb().transaction(async (trx) => {
    const rows: Row[] = await trx('photos').where({ lab_id: labId, capture_set_id: captureSetId, role: p.role }).forUpdate();
    if (replaces && !rows.some((r) => r.id === replaces)) return null;
    const old = rows.filter((r) => r.id === replaces || replacesInBracket(r.exif ?? {}, p.exif));
    if (old.length) await trx('photos').whereIn('id', old.map((o) => o.id)).delete();
    const [row] = await trx('photos')
      .insert({
        lab_id: labId,
        capture_set_id: captureSetId,
        role: p.role,
        storage_key: p.storageKey,
        preview_key: p.previewKey,
        sha256: p.sha256,
        bytes: p.bytes,
        width: p.width,
        height: p.height,
        format: p.format,
        bit_depth: p.bitDepth,
        encoding_file: p.encodingFile ?? null,
        encoding_reason: p.encodingReason ?? '',
        encoding_declared: p.encodingDeclared ?? null,
        pages: p.pages ?? 1,
        exif: JSON.stringify(p.exif),
        original_name: p.originalName,
      })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    const bracketSize = rows.length - old.length + 1;
    await recordAudit({ labId, userId, action: 'photo.upload', targetType: 'photo', targetId: row.id, details: { captureSetId, role: p.role, bytes: p.bytes, bracketSize, ...(replaces ? { replaces } : {}) } }, trx);
    return { photo: toPhoto(row), replacedKeys: old.flatMap((o) => [o.storage_key, ...(o.preview_key ? [o.preview_key] : [])]), bracketSize };
  });
}

/** Returns the storage keys to remove, or null when no such photo is in the lab. */
export async function deletePhoto(labId: string, userId: string, id: string): Promise<string[] | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('photos').where({ lab_id: labId, id }).delete().returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'photo.delete', targetType: 'photo', targetId: id, details: { role: row.role } }, trx);
    return [row.storage_key, ...(row.preview_key ? [row.preview_key] : [])];
  });
}

/** Sets or clears (null) a photo's own encoding declaration; null when no such photo is in the lab's set. */
export async function setPhotoEncoding(labId: string, userId: string, captureSetId: string, id: string, encoding: 'linear' | 'srgb' | null): Promise<Photo | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('photos').where({ lab_id: labId, capture_set_id: captureSetId, id }).update({ encoding_declared: encoding, updated_at: trx.fn.now() }).returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'photo.encoding', targetType: 'photo', targetId: id, details: { captureSetId, encoding } }, trx);
    return toPhoto(row);
  });
}
