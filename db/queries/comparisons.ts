import { getDb } from '../index';
import { encodeGroup, groupLabel, type GroupKey } from '../../lib/targets/compare';
import type { SetReading } from '../../lib/targets/series';
import { listNewestReadings } from './trends';

export type GroupOption = { key: string; label: string; revisionId: string; variant: string | null; captures: number };

/**
 * What can be compared in a project: each revision with readings, and each of its variants when it
 * has more than one (a single variant is the whole revision).
 */
export async function listGroupOptions(labId: string, projectId: string): Promise<GroupOption[]> {
  const db = getDb();
  const rows: { revision_id: string; label: string; position: number; variant: string; n: string | number }[] = await db('readings as g')
    .join('capture_sets as c', 'c.id', 'g.capture_set_id')
    .join('revisions as r', 'r.id', 'g.revision_id')
    .where({ 'g.lab_id': labId, 'g.project_id': projectId })
    .groupBy('g.revision_id', 'r.label', 'r.position', 'c.variant')
    .orderBy([{ column: 'r.position' }, { column: 'c.variant' }])
    .select('g.revision_id', 'r.label', 'r.position', 'c.variant', db.raw('count(DISTINCT g.capture_set_id) AS n'));
  const out: GroupOption[] = [];
  const byRevision = new Map<string, typeof rows>();
  for (const r of rows) byRevision.set(r.revision_id, [...(byRevision.get(r.revision_id) ?? []), r]);
  for (const [revisionId, list] of byRevision) {
    const first = list[0];
    if (!first) continue;
    const total = list.reduce((s, r) => s + Number(r.n), 0);
    out.push({ key: encodeGroup({ revisionId, variant: null }), label: `${groupLabel(first.label, null)} (all captures)`, revisionId, variant: null, captures: total });
    if (list.length > 1) {
      for (const r of list) out.push({ key: encodeGroup({ revisionId, variant: r.variant }), label: groupLabel(first.label, r.variant), revisionId, variant: r.variant, captures: Number(r.n) });
    }
  }
  return out;
}

export type Preview = {
  captureSetId: string;
  captureLabel: string;
  photoId: string;
  width: number;
  height: number;
  screen: { x: number; y: number; w: number; h: number } | null;
  background: { x: number; y: number; w: number; h: number } | null;
  ghost: { x: number; y: number; w: number; h: number } | null;
};

export type ComparisonGroup = GroupKey & { label: string; revisionLabel: string; readings: SetReading[]; previews: Preview[] };

type Rect = { x: number; y: number; w: number; h: number };
const isRect = (v: unknown): v is Rect =>
  typeof v === 'object' && v !== null && ['x', 'y', 'w', 'h'].every((k) => typeof (v as Record<string, unknown>)[k] === 'number');

/** One side of a comparison, or null when the revision is not in this lab's project. */
export async function getComparisonGroup(labId: string, projectId: string, key: GroupKey, previewLimit = 4): Promise<ComparisonGroup | null> {
  const db = getDb();
  const rev = await db('revisions').where({ lab_id: labId, project_id: projectId, id: key.revisionId }).first<{ id: string; label: string } | undefined>('id', 'label');
  if (!rev) return null;
  const readings = await listNewestReadings(labId, { projectId, revisionId: rev.id, variant: key.variant });
  const shown = readings.slice(0, previewLimit);
  const previews: Preview[] = [];
  if (shown.length) {
    const rows: { capture_set_id: string; photo_id: string; width: number; height: number; screen: unknown; background: unknown; ghost: unknown }[] = await db('photos as p')
      .join('readings as g', 'g.capture_set_id', 'p.capture_set_id')
      .where({ 'p.lab_id': labId, 'p.role': 'on' })
      .whereNotNull('p.preview_key')
      .whereIn('g.id', shown.map((r) => r.readingId))
      .select('p.capture_set_id', 'p.id as photo_id', 'p.width', 'p.height', db.raw("g.result->'screen' AS screen"), db.raw("g.result->'background' AS background"), db.raw("g.result->'ghost' AS ghost"));
    for (const r of shown) {
      const row = rows.find((x) => x.capture_set_id === r.captureSetId);
      if (!row) continue;
      const screen = isRect(row.screen) ? row.screen : null;
      const g = row.ghost as { dx?: unknown; dy?: unknown } | null;
      const ghost = screen && g && typeof g.dx === 'number' && typeof g.dy === 'number' ? { x: screen.x + g.dx, y: screen.y + g.dy, w: screen.w, h: screen.h } : null;
      previews.push({
        captureSetId: r.captureSetId,
        captureLabel: r.captureLabel,
        photoId: row.photo_id,
        width: row.width,
        height: row.height,
        screen: screen ? { x: screen.x, y: screen.y, w: screen.w, h: screen.h } : null,
        background: isRect(row.background) ? { x: row.background.x, y: row.background.y, w: row.background.w, h: row.background.h } : null,
        ghost,
      });
    }
  }
  return { ...key, revisionId: rev.id, label: groupLabel(rev.label, key.variant), revisionLabel: rev.label, readings, previews };
}
