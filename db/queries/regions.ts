import { getDb } from '../index';
import type { RegionInput, RegionKind } from '../../lib/schemas/region';
import { recordAudit } from './audit';

export type Region = { kind: RegionKind; x: number; y: number; w: number; h: number; source: 'marked' | 'detected' | 'template' };

type Row = { kind: RegionKind; x: number; y: number; w: number; h: number; source: Region['source'] };

export async function listRegions(labId: string, captureSetId: string): Promise<Region[]> {
  const rows: Row[] = await getDb()('regions').where({ lab_id: labId, capture_set_id: captureSetId }).select('kind', 'x', 'y', 'w', 'h', 'source').orderBy('kind');
  return rows.map((r) => ({ kind: r.kind, x: r.x, y: r.y, w: r.w, h: r.h, source: r.source }));
}

/** Replaces all of a capture set's regions with these (validated by the caller against the photo size). */
export async function replaceRegions(labId: string, userId: string, captureSetId: string, regions: readonly RegionInput[]): Promise<Region[]> {
  await getDb().transaction(async (trx) => {
    await trx('regions').where({ lab_id: labId, capture_set_id: captureSetId }).delete();
    if (regions.length) {
      await trx('regions').insert(regions.map((r) => ({ lab_id: labId, capture_set_id: captureSetId, kind: r.kind, x: r.x, y: r.y, w: r.w, h: r.h, source: r.source })));
    }
    await recordAudit({ labId, userId, action: 'regions.save', targetType: 'capture_set', targetId: captureSetId, details: { kinds: regions.map((r) => r.kind) } }, trx);
  });
  return listRegions(labId, captureSetId);
}
