import { setAnalysisProgress, startAnalysisRun } from '../../db/queries/analyses';
import { findCameraProfile } from '../../db/queries/camera-profiles';
import { getCaptureSet } from '../../db/queries/capture-sets';
import { listPhotos, type Photo } from '../../db/queries/photos';
import { listRegions } from '../../db/queries/regions';
import { getRevisionStack } from '../../db/queries/stacks';
import { saveReadingAndFinish, type ReadingArtifacts } from '../../db/queries/readings';
import { analyzeFiles, type PhotoSource } from '../../lib/image';
import { EngineInputError } from '../../lib/photometry/errors';
import { photoEncoding } from '../../lib/schemas/capture-set';
import { displayOpticsOf } from '../../lib/schemas/stack';
import type { PhotoRole } from '../../lib/photometry/types';
import { artifactKey, getStorage } from '../../lib/server/storage';
import { notifyTargetFailures } from '../../lib/server/targets/notify';

export type RunOutcome = { status: 'done'; readingId: string } | { status: 'skipped' };

/** Progress is written to the row at most this often (or on a stage change), to spare the database. */
const PROGRESS_EVERY_MS = 400;

/**
 * One analysis end to end: photos from storage → engine → artifacts to storage → reading upsert
 * and status done in one transaction. Throws EngineInputError for input the tester must fix.
 */
export async function runAnalysis(labId: string, analysisId: string, onProgress?: (percent: number) => void): Promise<RunOutcome> {
  const analysis = await startAnalysisRun(labId, analysisId);
  if (!analysis) return { status: 'skipped' };
  const set = await getCaptureSet(labId, analysis.captureSetId);
  if (!set) throw new EngineInputError('file-missing', 'the capture set was deleted before it could be analysed');
  const [photos, regions] = await Promise.all([listPhotos(labId, set.id), listRegions(labId, set.id)]);
  // several photos of one role are a bracket, in upload order (the first sets the reference exposure)
  const byRole = new Map<PhotoRole, Photo[]>();
  for (const p of photos) byRole.set(p.role, [...(byRole.get(p.role) ?? []), p]);
  for (const role of ['on', 'off'] as const) {
    if (!byRole.has(role)) throw new EngineInputError('file-missing', `the capture set has no ${role} photo: upload the display-${role} photo, then analyse again`);
  }

  // how each photo's values are read: its own declaration, the set's, or its file's (a set declared
  // linear with a photo that cannot be is the tester's to fix, as the CLI's --linear16 refuses it)
  const linear = new Map<string, boolean>();
  for (const p of photos) {
    const d = photoEncoding(set.tiffEncoding, p);
    if (d.conflict) throw new EngineInputError('bad-argument', d.conflict);
    linear.set(p.id, d.linear);
  }
  const allLinear = photos.every((p) => linear.get(p.id) === true);

  let lastStage = '';
  let lastWrite = 0;
  let pending: Promise<void> = Promise.resolve();
  const report = (stage: string, percent: number, force = false) => {
    onProgress?.(percent);
    const now = Date.now();
    if (!force && stage === lastStage && now - lastWrite < PROGRESS_EVERY_MS) return;
    lastStage = stage;
    lastWrite = now;
    // chained so writes land in order; a failed progress write must not fail the analysis
    pending = pending.then(() => setAnalysisProgress(labId, analysisId, stage, percent)).catch(() => undefined);
  };

  report('loading', 3, true);
  const storage = getStorage();
  const loadOne = async (role: PhotoRole, p: Photo): Promise<PhotoSource> => {
    const bytes = await storage.get(p.storageKey);
    if (!bytes) throw new EngineInputError('file-missing', `the stored ${role} photo ${p.originalName || ''} is missing: upload it again`);
    return { name: p.originalName || `${role} photo`, bytes, linear16: linear.get(p.id) ?? false };
  };
  const load = async (role: PhotoRole): Promise<PhotoSource | PhotoSource[] | null> => {
    const list = byRole.get(role);
    if (!list?.length) return null;
    const sources = await Promise.all(list.map((p) => loadOne(role, p)));
    return sources.length === 1 ? (sources[0] as PhotoSource) : sources;
  };
  const [on, off, ambient, dark] = await Promise.all((['on', 'off', 'ambient', 'dark'] as const).map(load));
  // absolute luminance when the lab has calibrated the camera that took the on photo
  const onExif = (byRole.get('on') as Photo[])[0]?.exif ?? {};
  const profile = await findCameraProfile(labId, onExif.make, onExif.model);
  // field of view from the profile's measured angle per pixel; pixels per degree and Δu′v′ from the stack's display
  const revision = await getRevisionStack(labId, set.projectId, set.revisionId);
  const optics = { degreesPerPixel: profile?.degreesPerPixel ?? null, ...displayOpticsOf(revision?.stack) };

  const screen = regions.find((r) => r.kind === 'screen') ?? null;
  const background = regions.find((r) => r.kind === 'background') ?? null;
  const ghost = regions.find((r) => r.kind === 'ghost') ?? null;
  const rect = (r: { x: number; y: number; w: number; h: number } | null) => (r ? { x: r.x, y: r.y, w: r.w, h: r.h } : null);
  // a marked ghost rectangle is the screen's copy: its offset is what the engine wants
  const ghostOffset = ghost && screen ? { dx: ghost.x - screen.x, dy: ghost.y - screen.y } : null;

  const { result: engineResult, artifacts, rawWhiteBalance } = await analyzeFiles({
    on: on as PhotoSource | PhotoSource[],
    off: off as PhotoSource | PhotoSource[],
    calibration: profile?.k ?? null,
    optics,
    ambient,
    dark,
    pattern: set.pattern,
    screen: rect(screen),
    background: rect(background),
    ghostOffset,
    linear16: allLinear,
    onProgress: (stage, fraction) => report(stage === 'done' ? 'artifacts' : stage, 5 + 85 * fraction),
  });

  // the reading names the profile it was converted with and how each role's photos were read
  // (more keys are allowed in the result)
  const decodedAs: Partial<Record<PhotoRole, 'linear' | 'srgb' | 'mixed'>> = {};
  for (const [role, list] of byRole) {
    const kinds = new Set(list.map((p) => (linear.get(p.id) ? 'linear' : 'srgb')));
    decodedAs[role] = kinds.size > 1 ? 'mixed' : ([...kinds][0] as 'linear' | 'srgb');
  }
  // camera raw photos: the one white balance all of them were decoded with (lib/image/raw.ts)
  const withInput = rawWhiteBalance ? { ...engineResult, decodedAs, rawWhiteBalance } : { ...engineResult, decodedAs };
  const result = profile ? { ...withInput, cameraProfile: { id: profile.id, name: profile.name, make: profile.make, model: profile.model, k: profile.k } } : withInput;

  report('artifacts', 92, true);
  const stored: ReadingArtifacts = {};
  if (artifacts) {
    const lc = artifactKey(labId, analysisId, 'log-contrast');
    const df = artifactKey(labId, analysisId, 'difference');
    await Promise.all([storage.put(lc, artifacts.logContrastPng, { contentType: 'image/png' }), storage.put(df, artifacts.differencePng, { contentType: 'image/png' })]);
    stored.logContrastKey = lc;
    stored.differenceKey = df;
    stored.data = artifacts.data as ReadingArtifacts['data'];
  }

  report('saving', 96, true);
  await pending;
  const readingId = await saveReadingAndFinish({ labId, analysisId, backgroundCdm2: set.conditions.backgroundCdm2 ?? null, result, artifacts: stored });
  // the reading is saved: a failed target check or mail must never turn the analysis into a failure
  try {
    await notifyTargetFailures(labId, set.revisionId);
  } catch (err) {
    console.error('[veilmeter] target check after analysis', analysisId, 'failed:', err instanceof Error ? err.message : err);
  }
  onProgress?.(100);
  return { status: 'done', readingId };
}

/** A one-line message a tester can act on, from the engine's lower-case message. */
export function testerMessage(message: string): string {
  const s = message.trim();
  const sentence = s.charAt(0).toUpperCase() + s.slice(1);
  return /[.!?]$/.test(sentence) ? sentence : `${sentence}.`;
}
