import type { Knex } from 'knex';
import { getDb } from '../index';
import type { CalibrationDetails, LinearityDetails } from '../../lib/schemas/camera-profile';
import { recordAudit } from './audit';

export type CameraProfile = {
  id: string;
  make: string;
  model: string;
  name: string;
  k: number;
  calibration: CalibrationDetails;
  linearity: LinearityDetails | null;
  /** Angle one pixel spans, measured on a target of known angle; null when not measured. */
  degreesPerPixel: number | null;
  createdBy: string | null;
  createdAt: Date;
  updatedAt: Date;
};

type Row = { id: string; lab_id: string; make: string; model: string; name: string; k: number | string; calibration: CalibrationDetails; linearity: LinearityDetails | null; degrees_per_pixel?: number | string | null; created_by: string | null; created_at: Date; updated_at: Date };

const toProfile = (r: Row): CameraProfile => ({
  id: r.id,
  make: r.make,
  model: r.model,
  name: r.name,
  k: Number(r.k),
  calibration: r.calibration,
  linearity: r.linearity,
  degreesPerPixel: r.degrees_per_pixel === null || r.degrees_per_pixel === undefined ? null : Number(r.degrees_per_pixel),
  createdBy: r.created_by,
  createdAt: r.created_at,
  updatedAt: r.updated_at,
});

/** EXIF spells make and model with varying case and padding: profiles match on a normalised form. */
export const cameraKey = (s: string): string => s.trim().replace(/\s+/g, ' ').toLowerCase();

export async function listCameraProfiles(labId: string): Promise<CameraProfile[]> {
  const rows: Row[] = await getDb()('camera_profiles').where({ lab_id: labId }).orderBy(['make', 'model']);
  return rows.map(toProfile);
}

export async function getCameraProfile(labId: string, id: string): Promise<CameraProfile | null> {
  const row: Row | undefined = await getDb()('camera_profiles').where({ lab_id: labId, id }).first();
  return row ? toProfile(row) : null;
}

/** The lab's profile for a camera, by EXIF make and model; null without both or without a profile. */
export async function findCameraProfile(labId: string, make: string | undefined, model: string | undefined, trx: Knex | Knex.Transaction = getDb()): Promise<CameraProfile | null> {
  if (!make || !model) return null;
  const row: Row | undefined = await trx('camera_profiles').where({ lab_id: labId, make: cameraKey(make), model: cameraKey(model) }).first();
  return row ? toProfile(row) : null;
}

/** Saves a calibration for a camera, replacing the lab's earlier one for the same make and model. */
export async function saveCameraCalibration(
  labId: string,
  userId: string,
  input: { make: string; model: string; name: string; k: number; calibration: CalibrationDetails },
): Promise<CameraProfile> {
  return getDb().transaction(async (trx) => {
    const make = cameraKey(input.make);
    const model = cameraKey(input.model);
    const [row] = await trx('camera_profiles')
      .insert({ lab_id: labId, make, model, name: input.name, k: input.k, calibration: JSON.stringify(input.calibration), created_by: userId })
      .onConflict(['lab_id', 'make', 'model'])
      .merge({ name: input.name, k: input.k, calibration: JSON.stringify(input.calibration), updated_at: trx.fn.now() })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'camera.calibrate', targetType: 'camera_profile', targetId: row.id, details: { make, model, k: input.k } }, trx);
    return toProfile(row);
  });
}

/** Keeps the latest linearity check on the camera's profile; false when the lab has none for it. */
export async function saveCameraLinearity(labId: string, userId: string, make: string, model: string, linearity: LinearityDetails): Promise<CameraProfile | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('camera_profiles')
      .where({ lab_id: labId, make: cameraKey(make), model: cameraKey(model) })
      .update({ linearity: JSON.stringify(linearity), updated_at: trx.fn.now() })
      .returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'camera.linearity', targetType: 'camera_profile', targetId: row.id, details: { exponent: linearity.exponent, linear: linearity.linear } }, trx);
    return toProfile(row);
  });
}

/** Sets (or clears, with null) a profile's degrees per pixel; null when the lab has no such profile. */
export async function setCameraDegreesPerPixel(labId: string, userId: string, id: string, degreesPerPixel: number | null): Promise<CameraProfile | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('camera_profiles').where({ lab_id: labId, id }).update({ degrees_per_pixel: degreesPerPixel, updated_at: trx.fn.now() }).returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'camera.angle', targetType: 'camera_profile', targetId: id, details: { degreesPerPixel } }, trx);
    return toProfile(row);
  });
}

export async function deleteCameraProfile(labId: string, userId: string, id: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('camera_profiles').where({ lab_id: labId, id }).delete().returning<Row[]>('*');
    if (!row) return false;
    await recordAudit({ labId, userId, action: 'camera.delete', targetType: 'camera_profile', targetId: id, details: { make: row.make, model: row.model } }, trx);
    return true;
  });
}
