import { listPhotos } from '../../../db/queries/photos';
import { getLatestReading, type Reading } from '../../../db/queries/readings';
import { formatSig } from '../../format';
import { reportFigure } from '../../image/report-figure';
import type { FigureRegion, PdfFigure } from '../../reports/pdf';
import { getStorage } from '../storage';

export type FigureMap = 'logContrast' | 'difference';

/** What a figure list leaves out, in words for the report (a photo or map that is not stored). */
export type CaptureFigures = { figures: PdfFigure[]; missing: string[] };

/**
 * The regions a reading measured, as fractions of its photo: the screen, the background and, when
 * the reading has a ghost, the screen's rectangle moved by the ghost's offset (docs/method.md §5).
 */
export function readingRegions(result: Reading['result']): FigureRegion[] {
  const { width, height } = result.image;
  const frac = (r: { x: number; y: number; w: number; h: number }, kind: FigureRegion['kind']): FigureRegion => ({ kind, x: r.x / width, y: r.y / height, w: r.w / width, h: r.h / height });
  const out: FigureRegion[] = [frac(result.screen, 'screen')];
  if (result.background) out.push(frac(result.background, 'background'));
  if (result.ghost) out.push(frac({ ...result.screen, x: result.screen.x + result.ghost.dx, y: result.screen.y + result.ghost.dy }, 'ghost'));
  return out;
}

const MAP_CAPTION: Record<FigureMap, (r: Reading) => string> = {
  logContrast: (r) => `Local contrast log10(on/off), deep blue 0 to near-white ${formatSig(r.artifacts.data?.logContrast.max ?? null, 2)}`,
  difference: (r) => `Display light D = on − off, deep blue 0 to near-white ${formatSig(r.artifacts.data?.difference.max ?? null, 2)} (relative luminance)`,
};

/**
 * A capture set's pictures for a report: its on photo (the stored preview) with the regions the
 * reading measured drawn on it, then the reading's maps, each a small palette PNG. Regions are
 * drawn only when the reading was made from a photo of the same size as the one stored now.
 */
export async function captureFigures(labId: string, set: { id: string; label: string }, reading: Reading | null, opts: { maps: readonly FigureMap[]; side?: number; prefix?: boolean }): Promise<CaptureFigures> {
  const storage = getStorage();
  const figures: PdfFigure[] = [];
  const missing: string[] = [];
  const name = (what: string) => (opts.prefix ? `${set.label} · ${what}` : what);
  const on = (await listPhotos(labId, set.id)).find((p) => p.role === 'on');
  const preview = on?.previewKey ? await storage.get(on.previewKey) : null;
  if (on && preview) {
    const fig = await reportFigure(preview, 'photo', opts.side);
    const sameSize = reading && reading.result.image.width === on.width && reading.result.image.height === on.height;
    figures.push({
      ...fig,
      regions: sameSize ? readingRegions(reading.result) : [],
      caption: name(!reading ? 'on photo (not analysed yet)' : sameSize ? 'on photo with the regions measured' : 'on photo (replaced since the reading: regions not drawn)'),
    });
  } else missing.push(name(on ? 'on photo (its preview is not stored)' : 'on photo (none uploaded)'));
  if (reading) {
    for (const map of opts.maps) {
      const key = map === 'logContrast' ? reading.artifacts.logContrastKey : reading.artifacts.differenceKey;
      const bytes = key ? await storage.get(key) : null;
      if (bytes) figures.push({ ...(await reportFigure(bytes, 'map', opts.side)), caption: name(MAP_CAPTION[map](reading)) });
      else missing.push(name(`${map === 'logContrast' ? 'contrast' : 'display-light'} map (not stored)`));
    }
  }
  return { figures, missing };
}

/** At most this many capture sets get their pictures in a revision report (each has its own report). */
export const REVISION_FIGURE_SETS = 12;

/**
 * A revision's pictures: for each analysed capture set (in the order given, at most
 * REVISION_FIGURE_SETS), its on photo with the regions measured beside its contrast map, smaller
 * than in a capture set's own report.
 */
export async function revisionFigures(labId: string, sets: readonly { captureSetId: string; captureLabel: string }[]): Promise<CaptureFigures & { left: number }> {
  const shown = sets.slice(0, REVISION_FIGURE_SETS);
  const figures: PdfFigure[] = [];
  const missing: string[] = [];
  for (const s of shown) {
    const reading = await getLatestReading(labId, s.captureSetId);
    const one = await captureFigures(labId, { id: s.captureSetId, label: s.captureLabel }, reading, { maps: ['logContrast'], side: 400, prefix: true });
    figures.push(...one.figures);
    missing.push(...one.missing);
  }
  return { figures, missing, left: sets.length - shown.length };
}
