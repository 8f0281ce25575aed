import { getDb } from '../index';

/** When the capture set's photos last changed (added, removed, replaced, read differently); null when not since it was made. */
export async function getPhotosChangedAt(labId: string, captureSetId: string): Promise<Date | null> {
  const row: { changed_at: Date } | undefined = await getDb()('photo_changes').where({ lab_id: labId, capture_set_id: captureSetId }).first('changed_at');
  return row?.changed_at ?? null;
}

/**
 * Whether a reading was made from other photos than the set holds now: its analysis started
 * (or, not started yet, was queued) before the photos last changed.
 */
export function madeBeforePhotoChange(changedAt: Date | null, analysis: { queuedAt: Date; startedAt: Date | null }): boolean {
  if (!changedAt) return false;
  return changedAt.getTime() > (analysis.startedAt ?? analysis.queuedAt).getTime();
}
