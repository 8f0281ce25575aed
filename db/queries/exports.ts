import { getDb } from '../index';
import type { UncertainMetric } from '../../lib/photometry/result';
import type { ReadingFigures } from './readings';

/** One row of a readings export: the newest reading of a capture set with its context. */
export type ExportRow = ReadingFigures & {
  readingId: string;
  projectName: string;
  revisionLabel: string;
  revisionPosition: number;
  captureSetId: string;
  captureLabel: string;
  variant: string;
  pattern: string;
  ambientLux: number | null;
  backgroundCdm2: number | null;
  engineVersion: string;
  createdAt: Date;
  luminanceOn: number | null;
  luminanceOff: number | null;
  luminanceAmbient: number | null;
  luminanceOnCdm2: number | null;
  clippedFraction: number | null;
  warningCount: number;
};

type Row = {
  id: string; project_name: string; revision_label: string; revision_position: number; capture_set_id: string; capture_label: string; variant: string; pattern: string;
  conditions: { ambientLux?: number; backgroundCdm2?: number } | null; background_cdm2: number | null; engine_version: string; created_at: Date;
  ambient_contrast_ratio: number | null; michelson: number | null; ansi_contrast: number | null; uniformity: number | null; ghost_ratio: number | null; transmission: number | null;
  tint_delta_e00: number | null; luminance_on: number | null; luminance_off: number | null; luminance_ambient: number | null; luminance_on_cdm2: number | null; clipped_fraction: number | null; warning_count: number;
  transmission_optics: number | null; veil: number | null; veil_cdm2: number | null; mtf50: number | null; mtf50_per_degree: number | null; display_duv: number | null; colour_uniformity_duv: number | null;
  uncertainty: Partial<Record<UncertainMetric, number>> | null;
};

const n = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/**
 * Newest reading per capture set of a project or one revision (optionally one variant), in
 * revision order: the numbers the statistics use. Always scoped by the lab.
 */
export async function listExportRows(labId: string, filter: { projectId: string; revisionId?: string; variant?: string | null }): Promise<ExportRow[]> {
  const db = getDb();
  const q = db
    .select(
      db.raw('DISTINCT ON (g.capture_set_id) g.id'),
      'p.name as project_name', 'r.label as revision_label', 'r.position as revision_position', 'g.capture_set_id', 'c.label as capture_label', 'c.variant', 'c.pattern', 'c.conditions',
      'g.background_cdm2', 'g.engine_version', 'g.created_at', 'g.ambient_contrast_ratio', 'g.michelson', 'g.ansi_contrast', 'g.uniformity', 'g.ghost_ratio', 'g.transmission',
      'g.tint_delta_e00', 'g.luminance_on', 'g.luminance_off', 'g.luminance_ambient', 'g.luminance_on_cdm2', 'g.clipped_fraction', 'g.warning_count',
      'g.transmission_optics', 'g.veil', 'g.veil_cdm2', 'g.mtf50', 'g.mtf50_per_degree', 'g.display_duv', 'g.colour_uniformity_duv', 'g.uncertainty',
    )
    .from('readings as g')
    .join('capture_sets as c', 'c.id', 'g.capture_set_id')
    .join('revisions as r', 'r.id', 'g.revision_id')
    .join('projects as p', 'p.id', 'g.project_id')
    .where({ 'g.lab_id': labId, 'g.project_id': filter.projectId });
  if (filter.revisionId) q.andWhere('g.revision_id', filter.revisionId);
  if (filter.variant !== undefined && filter.variant !== null) q.andWhere('c.variant', filter.variant);
  const rows: Row[] = await q.orderBy([{ column: 'g.capture_set_id' }, { column: 'g.created_at', order: 'desc' }]);
  return rows
    .map((r) => ({
      readingId: r.id,
      projectName: r.project_name,
      revisionLabel: r.revision_label,
      revisionPosition: r.revision_position,
      captureSetId: r.capture_set_id,
      captureLabel: r.capture_label,
      variant: r.variant,
      pattern: r.pattern,
      ambientLux: n(r.conditions?.ambientLux),
      backgroundCdm2: n(r.background_cdm2) ?? n(r.conditions?.backgroundCdm2),
      engineVersion: r.engine_version,
      createdAt: r.created_at,
      ambientContrastRatio: n(r.ambient_contrast_ratio),
      michelson: n(r.michelson),
      ansiContrast: n(r.ansi_contrast),
      uniformity: n(r.uniformity),
      ghostRatio: n(r.ghost_ratio),
      transmission: n(r.transmission),
      tintDeltaE00: n(r.tint_delta_e00),
      transmissionOptics: n(r.transmission_optics),
      veil: n(r.veil),
      veilCdm2: n(r.veil_cdm2),
      mtf50: n(r.mtf50),
      mtf50PerDegree: n(r.mtf50_per_degree),
      displayDuv: n(r.display_duv),
      colourUniformityDuv: n(r.colour_uniformity_duv),
      uncertainty: r.uncertainty ?? {},
      luminanceOn: n(r.luminance_on),
      luminanceOff: n(r.luminance_off),
      luminanceAmbient: n(r.luminance_ambient),
      luminanceOnCdm2: n(r.luminance_on_cdm2),
      clippedFraction: n(r.clipped_fraction),
      warningCount: r.warning_count,
    }))
    .sort((a, b) => a.revisionPosition - b.revisionPosition || a.createdAt.getTime() - b.createdAt.getTime() || a.captureLabel.localeCompare(b.captureLabel));
}
