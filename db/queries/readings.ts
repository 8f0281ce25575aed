import type { Knex } from 'knex';
import { getDb } from '../index';
import type { CaptureResult, UncertainMetric } from '../../lib/photometry/result';
import { markAnalysisDone, toAnalysis, type Analysis } from './analyses';

export type ReadingArtifacts = {
  logContrastKey?: string;
  differenceKey?: string;
  data?: {
    logContrast: { min: number; max: number; unit: string };
    difference: { min: number; max: number; unit: string };
    factor: number;
    histograms: Record<string, { log2Min: number; log2Max: number; counts: number[]; nonPositive: number; above: number; total: number; step: number }>;
  };
};

/** A reading's figures, as the readings table keeps them (stored scale: ratios, fractions, ΔE00, cy/px). */
export type ReadingFigures = {
  ambientContrastRatio: number | null;
  michelson: number | null;
  ansiContrast: number | null;
  uniformity: number | null;
  ghostRatio: number | null;
  transmission: number | null;
  tintDeltaE00: number | null;
  transmissionOptics: number | null;
  veil: number | null;
  veilCdm2: number | null;
  mtf50: number | null;
  mtf50PerDegree: number | null;
  displayDuv: number | null;
  colourUniformityDuv: number | null;
  /** Standard uncertainty of each metric that has one (engine 1.2.0 on; older readings: none). */
  uncertainty: Partial<Record<UncertainMetric, number>>;
};

export type Reading = ReadingFigures & {
  id: string;
  analysisId: string;
  captureSetId: string;
  revisionId: string;
  projectId: string;
  variant: string;
  engineVersion: string;
  clippedFraction: number | null;
  warningCount: number;
  result: CaptureResult;
  artifacts: ReadingArtifacts;
  createdAt: Date;
};

type Row = {
  id: string; analysis_id: string; capture_set_id: string; revision_id: string; project_id: string; variant: string; engine_version: string;
  ambient_contrast_ratio: number | null; michelson: number | null; ansi_contrast: number | null; uniformity: number | null; ghost_ratio: number | null;
  transmission: number | null; tint_delta_e00: number | null; clipped_fraction: number | null; warning_count: number; result: CaptureResult; artifacts: ReadingArtifacts; created_at: Date;
  transmission_optics: number | null; veil: number | null; veil_cdm2: number | null; mtf50: number | null; mtf50_per_degree: number | null; display_duv: number | null; colour_uniformity_duv: number | null;
  uncertainty: Partial<Record<UncertainMetric, number>> | null;
};

const toReading = (r: Row): Reading => ({
  id: r.id,
  analysisId: r.analysis_id,
  captureSetId: r.capture_set_id,
  revisionId: r.revision_id,
  projectId: r.project_id,
  variant: r.variant,
  engineVersion: r.engine_version,
  ambientContrastRatio: r.ambient_contrast_ratio,
  michelson: r.michelson,
  ansiContrast: r.ansi_contrast,
  uniformity: r.uniformity,
  ghostRatio: r.ghost_ratio,
  transmission: r.transmission,
  tintDeltaE00: r.tint_delta_e00,
  transmissionOptics: r.transmission_optics ?? null,
  veil: r.veil ?? null,
  veilCdm2: r.veil_cdm2 ?? null,
  mtf50: r.mtf50 ?? null,
  mtf50PerDegree: r.mtf50_per_degree ?? null,
  displayDuv: r.display_duv ?? null,
  colourUniformityDuv: r.colour_uniformity_duv ?? null,
  uncertainty: r.uncertainty ?? {},
  clippedFraction: r.clipped_fraction,
  warningCount: r.warning_count,
  result: r.result,
  artifacts: r.artifacts ?? {},
  createdAt: r.created_at,
});

export async function getReadingForAnalysis(labId: string, analysisId: string): Promise<Reading | null> {
  const row: Row | undefined = await getDb()('readings').where({ lab_id: labId, analysis_id: analysisId }).first();
  return row ? toReading(row) : null;
}

export type PollReading = Pick<Reading, 'id' | 'ambientContrastRatio' | 'warningCount' | 'result'>;

/**
 * An analysis and, once it is done, the part of its reading a status poll shows: one query and
 * none of the reading's other columns (artifacts and the metric copies), since clients poll often.
 */
export async function getAnalysisForPoll(labId: string, analysisId: string): Promise<{ analysis: Analysis; reading: PollReading | null } | null> {
  const row = await getDb()('analyses as a')
    .leftJoin('readings as g', function joinReading() {
      this.on('g.analysis_id', '=', 'a.id').andOn('g.lab_id', '=', 'a.lab_id');
    })
    .where({ 'a.lab_id': labId, 'a.id': analysisId })
    .first('a.*', 'g.id as reading_id', 'g.ambient_contrast_ratio as reading_acr', 'g.warning_count as reading_warning_count', 'g.result as reading_result');
  if (!row) return null;
  const { reading_id, reading_acr, reading_warning_count, reading_result, ...a } = row as Parameters<typeof toAnalysis>[0] & { reading_id: string | null; reading_acr: number | null; reading_warning_count: number; reading_result: CaptureResult };
  const analysis = toAnalysis(a);
  const reading = analysis.status === 'done' && reading_id ? { id: reading_id, ambientContrastRatio: reading_acr, warningCount: reading_warning_count, result: reading_result } : null;
  return { analysis, reading };
}

export async function getLatestReading(labId: string, captureSetId: string): Promise<Reading | null> {
  const row: Row | undefined = await getDb()('readings').where({ lab_id: labId, capture_set_id: captureSetId }).orderBy('created_at', 'desc').first();
  return row ? toReading(row) : null;
}

const finite = (v: number | null | undefined): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** The result's uncertainties with their finite values only (JSON has no room for NaN or ∞). */
function finiteEntries(u: CaptureResult['uncertainty']): Partial<Record<UncertainMetric, number>> {
  const out: Partial<Record<UncertainMetric, number>> = {};
  for (const [k, v] of Object.entries(u ?? {})) if (typeof v === 'number' && Number.isFinite(v)) out[k as UncertainMetric] = v;
  return out;
}

/**
 * Writes the reading of one analysis. Keyed on the analysis, so a job that runs twice (a worker
 * killed after writing, a redelivered job) leaves one row with the last result.
 */
/**
 * Saves an analysis's reading and marks the analysis done, both or neither: the worker's last step.
 * Returns the reading's id.
 */
export async function saveReadingAndFinish(input: { labId: string; analysisId: string; backgroundCdm2: number | null; result: CaptureResult; artifacts: ReadingArtifacts }): Promise<string> {
  return getDb().transaction(async (trx) => {
    const id = await upsertReading(trx, input);
    await markAnalysisDone(input.labId, input.analysisId, input.result.engineVersion, trx);
    return id;
  });
}

export async function upsertReading(
  trx: Knex | Knex.Transaction,
  input: { labId: string; analysisId: string; backgroundCdm2: number | null; result: CaptureResult; artifacts: ReadingArtifacts },
): Promise<string> {
  const ctx = await trx('analyses as a')
    .join('capture_sets as c', 'c.id', 'a.capture_set_id')
    .join('revisions as r', 'r.id', 'c.revision_id')
    .where({ 'a.lab_id': input.labId, 'a.id': input.analysisId })
    .first('c.id as capture_set_id', 'c.variant', 'r.id as revision_id', 'r.project_id');
  if (!ctx) throw new Error(`analysis ${input.analysisId} is gone`);
  const r = input.result;
  const abs = r.absoluteLuminance;
  const values = {
    lab_id: input.labId,
    analysis_id: input.analysisId,
    capture_set_id: ctx.capture_set_id,
    revision_id: ctx.revision_id,
    project_id: ctx.project_id,
    variant: ctx.variant,
    engine_version: r.engineVersion,
    ambient_contrast_ratio: finite(r.ambientContrastRatio),
    michelson: finite(r.michelson),
    ansi_contrast: finite(r.ansiContrast),
    uniformity: finite(r.uniformity),
    ghost_ratio: finite(r.ghost?.ratio),
    transmission: finite(r.transmission),
    tint_delta_e00: finite(r.tint?.deltaE00),
    tint_dx: finite(r.tint?.dx),
    tint_dy: finite(r.tint?.dy),
    luminance_on: finite(r.luminance.on),
    luminance_off: finite(r.luminance.off),
    luminance_ambient: finite(r.luminance.ambient),
    // only a camera profile gives cd/m² worth trending; the rough estimate stays in the result
    luminance_on_cdm2: abs?.kind === 'calibrated' ? finite(abs.on) : null,
    background_cdm2: input.backgroundCdm2,
    clipped_fraction: finite(r.clippedFraction),
    transmission_optics: finite(r.transmissionOptics),
    veil: finite(r.veil?.relative),
    veil_cdm2: finite(r.veil?.cdm2),
    mtf50: finite(r.sharpness?.mtf50),
    mtf50_per_degree: finite(r.sharpness?.mtf50PerDegree),
    display_duv: finite(r.displayColour?.duvFromWhite),
    colour_uniformity_duv: finite(r.displayColour?.uniformityDuv),
    uncertainty: JSON.stringify(finiteEntries(r.uncertainty)),
    warning_count: r.warnings.length,
    result: JSON.stringify(r),
    artifacts: JSON.stringify(input.artifacts),
  };
  const { lab_id: _lab, analysis_id: _analysis, ...update } = values;
  const [row] = await trx('readings')
    .insert(values)
    .onConflict('analysis_id')
    .merge({ ...update, updated_at: trx.fn.now() })
    .returning<{ id: string }[]>('id');
  if (!row) throw new Error('upsert returned nothing');
  return row.id;
}
