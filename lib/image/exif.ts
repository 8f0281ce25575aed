import exifr from 'exifr';
import type { ExposureTags } from '../photometry/types';

const PICK = ['ExposureTime', 'FNumber', 'ISO', 'ISOSpeedRatings', 'PhotographicSensitivity', 'Make', 'Model'];

function num(v: unknown): number | undefined {
  if (typeof v === 'number' && Number.isFinite(v) && v > 0) return v;
  if (Array.isArray(v) && typeof v[0] === 'number') return num(v[0]);
  return undefined;
}

/** Exposure time, f-number, ISO, make and model from a photo's EXIF; null when it has none. */
export async function readExposureTags(buf: Uint8Array): Promise<ExposureTags | null> {
  let tags: Record<string, unknown> | undefined;
  try {
    tags = (await exifr.parse(Buffer.from(buf.buffer, buf.byteOffset, buf.byteLength), { pick: PICK })) as Record<string, unknown> | undefined;
  } catch {
    return null;
  }
  if (!tags) return null;
  const out: ExposureTags = {};
  const t = num(tags.ExposureTime);
  const n = num(tags.FNumber);
  const s = num(tags.ISO) ?? num(tags.ISOSpeedRatings) ?? num(tags.PhotographicSensitivity);
  if (t !== undefined) out.exposureTime = t;
  if (n !== undefined) out.fNumber = n;
  if (s !== undefined) out.iso = s;
  if (typeof tags.Make === 'string') out.make = tags.Make.trim();
  if (typeof tags.Model === 'string') out.model = tags.Model.trim();
  return Object.keys(out).length > 0 ? out : null;
}
