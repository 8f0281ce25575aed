import { getDb } from '../index';
import type { Stack, VariantStacks } from '../../lib/schemas/stack';
import { recordAudit } from './audit';

/** A revision with its stored stack, as the editor loads it. The stack is raw JSON: validate before use. */
export type RevisionStack = {
  revisionId: string;
  projectId: string;
  label: string;
  position: number;
  status: string;
  notes: string;
  stack: unknown;
  /** Each variant's change to the stack (raw JSON: validate before use). */
  variantStacks: unknown;
  updatedAt: Date;
};

type RevRow = { id: string; project_id: string; label: string; position: number; status: string; notes: string; stack: unknown; variant_stacks?: unknown; updated_at: Date };

const toRevisionStack = (r: RevRow): RevisionStack => ({
  revisionId: r.id,
  projectId: r.project_id,
  label: r.label,
  position: r.position,
  status: r.status,
  notes: r.notes,
  stack: r.stack,
  variantStacks: r.variant_stacks ?? {},
  updatedAt: r.updated_at,
});

const REV_COLUMNS = ['id', 'project_id', 'label', 'position', 'status', 'notes', 'stack', 'variant_stacks', 'updated_at'] as const;

/** The revision's stack, or null when the revision is not in this lab and project. */
export async function getRevisionStack(labId: string, projectId: string, revisionId: string): Promise<RevisionStack | null> {
  const row: RevRow | undefined = await getDb()('revisions')
    .where({ lab_id: labId, project_id: projectId, id: revisionId })
    .first<RevRow>(...REV_COLUMNS);
  return row ? toRevisionStack(row) : null;
}

/** Every revision of a project with its stored stack, in build order. */
export async function listRevisionsWithStacks(labId: string, projectId: string): Promise<RevisionStack[]> {
  const rows: RevRow[] = await getDb()('revisions')
    .where({ lab_id: labId, project_id: projectId })
    .select(...REV_COLUMNS)
    .orderBy('position');
  return rows.map(toRevisionStack);
}

/**
 * Stores a validated stack on a revision and records who did it. Returns null when the revision
 * is not in this lab (the caller answers 404).
 */
export async function saveRevisionStack(labId: string, userId: string, revisionId: string, stack: Stack, variantStacks?: VariantStacks): Promise<RevisionStack | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('revisions')
      .where({ lab_id: labId, id: revisionId })
      .update({ stack: JSON.stringify(stack), ...(variantStacks ? { variant_stacks: JSON.stringify(variantStacks) } : {}), updated_at: trx.fn.now() })
      .returning<RevRow[]>([...REV_COLUMNS]);
    if (!row) return null;
    await recordAudit(
      {
        labId,
        userId,
        action: 'stack.save',
        targetType: 'revision',
        targetId: revisionId,
        details: { elements: stack.elements.map((e) => e.kind), ...(variantStacks ? { variants: Object.keys(variantStacks) } : {}) },
      },
      trx,
    );
    return toRevisionStack(row);
  });
}

/** The newest reading of one capture set, with what the planner compares against. */
export type PlannerReading = {
  captureSetId: string;
  revisionId: string;
  revisionLabel: string;
  variant: string;
  backgroundCdm2: number | null;
  /** The world's luminance behind the screen from the photos: calibrated with a camera profile, or the rough EXIF estimate. */
  photoBackground: { cdm2: number; kind: 'calibrated' | 'rough-estimate' } | null;
  ambientContrastRatio: number | null;
  ghostRatio: number | null;
  transmission: number | null;
  /** What the display showed: a screen lit all over (full, checkerboard) or a marker or square that darkens part of it. */
  pattern: string;
  /** How the orientation marker arrived (capture sets of pattern orientation, engine 1.2.0 on). */
  orientation: MeasuredOrientation | null;
  createdAt: Date;
};

export type MeasuredOrientation = { orientation: 'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180'; mirrored: boolean; margin: number };

type ReadingRow = {
  capture_set_id: string;
  revision_id: string;
  revision_label: string;
  variant: string;
  background_cdm2: number | null;
  abs: { kind?: unknown; off?: unknown; ambient?: unknown } | null;
  ambient_contrast_ratio: number | null;
  ghost_ratio: number | null;
  transmission: number | null;
  orientation: { orientation?: unknown; mirrored?: unknown; margin?: unknown } | null;
  pattern: string | null;
  created_at: Date;
};

const ORIENTATIONS = ['normal', 'mirrored', 'upside-down-mirrored', 'rotated-180'] as const;
function orientationOf(o: ReadingRow['orientation']): MeasuredOrientation | null {
  if (!o || typeof o.mirrored !== 'boolean' || typeof o.margin !== 'number' || !ORIENTATIONS.includes(o.orientation as (typeof ORIENTATIONS)[number])) return null;
  return { orientation: o.orientation as MeasuredOrientation['orientation'], mirrored: o.mirrored, margin: o.margin };
}

const num = (v: number | string | null): number | null => (v === null ? null : Number.isFinite(Number(v)) ? Number(v) : null);

/**
 * The world's luminance behind the screen as the photos give it: the ambient photo (optics out of
 * the path) where there is one, else the off photo through the optics divided by the measured
 * transmission. Null without an absolute scale.
 */
function photoBackground(r: ReadingRow): PlannerReading['photoBackground'] {
  const abs = r.abs;
  if (!abs || (abs.kind !== 'calibrated' && abs.kind !== 'rough-estimate')) return null;
  const ambient = typeof abs.ambient === 'number' && Number.isFinite(abs.ambient) && abs.ambient > 0 ? abs.ambient : null;
  const off = typeof abs.off === 'number' && Number.isFinite(abs.off) && abs.off > 0 ? abs.off : null;
  const tau = num(r.transmission);
  const cdm2 = ambient ?? (off !== null && tau !== null && tau > 0 ? off / tau : null);
  return cdm2 === null ? null : { cdm2, kind: abs.kind };
}

/**
 * The newest reading per capture set of a project: re-analyses replace older readings, so only
 * the latest one of each shot counts.
 */
export async function listMeasuredForPlanner(labId: string, projectId: string): Promise<PlannerReading[]> {
  const rows: ReadingRow[] = await getDb()('readings as g')
    .join('revisions as r', function joinRevision() {
      this.on('r.id', '=', 'g.revision_id').andOn('r.lab_id', '=', 'g.lab_id');
    })
    .where({ 'g.lab_id': labId, 'g.project_id': projectId })
    .distinctOn('g.capture_set_id')
    .select(
      'g.capture_set_id',
      'g.revision_id',
      'r.label as revision_label',
      'g.variant',
      'g.background_cdm2',
      getDb().raw(`g.result->'absoluteLuminance' AS abs`),
      getDb().raw(`g.result->'orientation' AS orientation`),
      getDb().raw(`g.result->>'pattern' AS pattern`),
      'g.ambient_contrast_ratio',
      'g.ghost_ratio',
      'g.transmission',
      'g.created_at',
    )
    .orderBy([
      { column: 'g.capture_set_id' },
      { column: 'g.created_at', order: 'desc' },
    ]);
  return rows
    .map((r) => ({
      captureSetId: r.capture_set_id,
      revisionId: r.revision_id,
      revisionLabel: r.revision_label,
      variant: r.variant,
      backgroundCdm2: num(r.background_cdm2),
      photoBackground: photoBackground(r),
      ambientContrastRatio: num(r.ambient_contrast_ratio),
      ghostRatio: num(r.ghost_ratio),
      transmission: num(r.transmission),
      pattern: r.pattern ?? 'full',
      orientation: orientationOf(r.orientation),
      createdAt: r.created_at,
    }))
    .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime());
}
