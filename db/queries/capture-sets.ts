import { getDb } from '../index';
import type { CapturePatternKey, Conditions, TiffEncodingSetting } from '../../lib/schemas/capture-set';
import { PHOTO_ROLES } from '../../lib/schemas/upload';
import { recordAudit } from './audit';

const roleRank = (role: string): number => (PHOTO_ROLES as readonly string[]).indexOf(role);

export type CaptureSet = {
  id: string;
  revisionId: string;
  revisionLabel: string;
  projectId: string;
  projectName: string;
  label: string;
  variant: string;
  pattern: CapturePatternKey;
  /** How the set's 16-bit TIFFs are read (lib/schemas/capture-set.ts). */
  tiffEncoding: TiffEncodingSetting;
  conditions: Conditions;
  notes: string;
  createdAt: Date;
  updatedAt: Date;
};

export type CaptureSetSummary = CaptureSet & {
  photoCount: number;
  roles: string[];
  latestStatus: string | null;
  latestAcr: number | null;
  /** Ghost ratio, see-through transmission and uniformity of the newest reading (null where it has none). */
  latestGhost: number | null;
  latestTransmission: number | null;
  latestUniformity: number | null;
  latestReadingAt: Date | null;
};

type Row = {
  id: string; revision_id: string; revision_label: string; project_id: string; project_name: string; label: string; variant: string; pattern: CapturePatternKey; tiff_encoding?: TiffEncodingSetting;
  conditions: Conditions | null; notes: string; created_at: Date; updated_at: Date;
  photo_count?: string | number; roles?: string[] | null; latest_status?: string | null; latest_acr?: number | null; latest_ghost?: number | null; latest_transmission?: number | null; latest_uniformity?: number | null; latest_reading_at?: Date | null;
};

const toSet = (r: Row): CaptureSet => ({
  id: r.id,
  revisionId: r.revision_id,
  revisionLabel: r.revision_label,
  projectId: r.project_id,
  projectName: r.project_name,
  label: r.label,
  variant: r.variant,
  pattern: r.pattern,
  tiffEncoding: r.tiff_encoding ?? 'auto',
  conditions: { displayLevel: '', ...(r.conditions ?? {}) },
  notes: r.notes,
  createdAt: r.created_at,
  updatedAt: r.updated_at,
});

function base(labId: string) {
  return getDb()('capture_sets as c')
    .join('revisions as r', 'r.id', 'c.revision_id')
    .join('projects as p', 'p.id', 'r.project_id')
    .where('c.lab_id', labId)
    .select('c.*', 'r.label as revision_label', 'r.project_id', 'p.name as project_name');
}

export async function getCaptureSet(labId: string, id: string): Promise<CaptureSet | null> {
  const row: Row | undefined = await base(labId).andWhere('c.id', id).first();
  return row ? toSet(row) : null;
}

export async function listCaptureSets(labId: string, revisionId: string): Promise<CaptureSetSummary[]> {
  const db = getDb();
  const rows: Row[] = await base(labId)
    .andWhere('c.revision_id', revisionId)
    .select(
      db.raw('(SELECT count(*) FROM photos ph WHERE ph.capture_set_id = c.id) AS photo_count'),
      db.raw('(SELECT array_agg(DISTINCT ph.role::text) FROM photos ph WHERE ph.capture_set_id = c.id) AS roles'),
      db.raw('(SELECT a.status FROM analyses a WHERE a.capture_set_id = c.id ORDER BY a.created_at DESC LIMIT 1) AS latest_status'),
      'lr.ambient_contrast_ratio as latest_acr',
      'lr.ghost_ratio as latest_ghost',
      'lr.transmission as latest_transmission',
      'lr.uniformity as latest_uniformity',
      'lr.created_at as latest_reading_at',
    )
    // the newest reading, one row per capture set
    .joinRaw('LEFT JOIN LATERAL (SELECT g.ambient_contrast_ratio, g.ghost_ratio, g.transmission, g.uniformity, g.created_at FROM readings g WHERE g.capture_set_id = c.id ORDER BY g.created_at DESC LIMIT 1) lr ON true')
    .orderBy('c.created_at');
  return rows.map((r) => ({
    ...toSet(r),
    photoCount: Number(r.photo_count ?? 0),
    // in the order people shoot them (on, off, ambient, dark), not the database's
    roles: [...(r.roles ?? [])].sort((a, b) => roleRank(a) - roleRank(b)),
    latestStatus: r.latest_status ?? null,
    latestAcr: r.latest_acr ?? null,
    latestGhost: r.latest_ghost ?? null,
    latestTransmission: r.latest_transmission ?? null,
    latestUniformity: r.latest_uniformity ?? null,
    latestReadingAt: r.latest_reading_at ?? null,
  }));
}

/** The variants the capture sets of a revision name (not the empty one), sorted; [] for a revision of another lab. */
export async function listRevisionVariants(labId: string, revisionId: string): Promise<string[]> {
  const rows: { variant: string }[] = await getDb()('capture_sets').where({ lab_id: labId, revision_id: revisionId }).whereNot('variant', '').distinct('variant');
  return rows.map((r) => r.variant).sort((a, b) => a.localeCompare(b));
}

export type CaptureSetWrite = { label?: string; variant?: string; pattern?: CapturePatternKey; tiffEncoding?: TiffEncodingSetting; notes?: string } & Partial<Conditions>;

function conditionsOf(input: Partial<Conditions>, previous: Conditions = { displayLevel: '' }): Conditions {
  const out: Conditions = { ...previous };
  if ('ambientLux' in input) out.ambientLux = input.ambientLux;
  if ('backgroundCdm2' in input) out.backgroundCdm2 = input.backgroundCdm2;
  if (input.displayLevel !== undefined) out.displayLevel = input.displayLevel;
  // JSON drops undefined keys; keep the stored document free of them too
  return JSON.parse(JSON.stringify(out)) as Conditions;
}

/** Returns null when the revision is not in this lab. */
export async function createCaptureSet(labId: string, userId: string, revisionId: string, input: CaptureSetWrite & { label: string }): Promise<CaptureSet | null> {
  const db = getDb();
  const id = await db.transaction(async (trx) => {
    const rev = await trx('revisions').where({ lab_id: labId, id: revisionId }).first('id');
    if (!rev) return null;
    const [row] = await trx('capture_sets')
      .insert({
        lab_id: labId,
        revision_id: revisionId,
        label: input.label,
        variant: input.variant ?? '',
        pattern: input.pattern ?? 'full',
        tiff_encoding: input.tiffEncoding ?? 'auto',
        notes: input.notes ?? '',
        conditions: JSON.stringify(conditionsOf(input)),
        created_by: userId,
      })
      .returning<{ id: string }[]>('id');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'capture.create', targetType: 'capture_set', targetId: row.id, details: { label: input.label, revisionId } }, trx);
    return row.id;
  });
  return id ? getCaptureSet(labId, id) : null;
}

export async function updateCaptureSet(labId: string, userId: string, id: string, input: CaptureSetWrite): Promise<CaptureSet | null> {
  const current = await getCaptureSet(labId, id);
  if (!current) return null;
  await getDb().transaction(async (trx) => {
    const patch: Record<string, unknown> = { updated_at: trx.fn.now(), conditions: JSON.stringify(conditionsOf(input, current.conditions)) };
    if (input.label !== undefined) patch.label = input.label;
    if (input.variant !== undefined) patch.variant = input.variant;
    if (input.pattern !== undefined) patch.pattern = input.pattern;
    if (input.tiffEncoding !== undefined) patch.tiff_encoding = input.tiffEncoding;
    if (input.notes !== undefined) patch.notes = input.notes;
    await trx('capture_sets').where({ lab_id: labId, id }).update(patch);
    await recordAudit({ labId, userId, action: 'capture.update', targetType: 'capture_set', targetId: id, details: input }, trx);
  });
  return getCaptureSet(labId, id);
}

/** Deletes the set and returns the storage keys its photos and artifacts used, for the caller to remove. */
export async function deleteCaptureSet(labId: string, userId: string, id: string): Promise<string[] | null> {
  return getDb().transaction(async (trx) => {
    const photos = await trx('photos').where({ lab_id: labId, capture_set_id: id }).select('storage_key', 'preview_key');
    const readings = await trx('readings').where({ lab_id: labId, capture_set_id: id }).select('artifacts');
    const n = await trx('capture_sets').where({ lab_id: labId, id }).delete();
    if (n === 0) return null;
    await recordAudit({ labId, userId, action: 'capture.delete', targetType: 'capture_set', targetId: id }, trx);
    const keys: string[] = [];
    for (const p of photos) keys.push(p.storage_key as string, ...(p.preview_key ? [p.preview_key as string] : []));
    for (const r of readings) keys.push(...artifactKeys(r.artifacts));
    return keys;
  });
}

export function artifactKeys(artifacts: unknown): string[] {
  const a = (artifacts ?? {}) as { logContrastKey?: unknown; differenceKey?: unknown };
  return [a.logContrastKey, a.differenceKey].filter((k): k is string => typeof k === 'string');
}
