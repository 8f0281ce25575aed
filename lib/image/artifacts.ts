import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import { falseColour } from '../photometry/false-colour';
import { percentile } from '../photometry/percentile';
import type { AnalysisMaps } from '../photometry/result';
import type { Plane } from '../photometry/types';

export interface Artifacts {
  /** False-colour PNG of log10(on/off) per pixel. */
  logContrastPng: Buffer;
  /** False-colour PNG of D = on − off. */
  differencePng: Buffer;
  /** Scales of the two maps and each photo's luminance histogram. */
  data: {
    logContrast: { min: number; max: number; unit: 'log10(on/off)' };
    difference: { min: number; max: number; unit: 'relative luminance' };
    factor: number;
    histograms: AnalysisMaps['histograms'];
  };
}

function sampled(p: Plane): Float32Array {
  const step = Math.max(1, Math.floor(p.data.length / 250_000));
  const out = new Float32Array(Math.ceil(p.data.length / step));
  for (let i = 0, k = 0; i < p.data.length; i += step, k++) out[k] = p.data[i] as number;
  return out;
}

async function png(p: Plane, min: number, max: number): Promise<Buffer> {
  const rgb = falseColour(p, min, max);
  // low compression: these are previews, and deflate at level 9 costs more than the whole analysis
  return sharp(rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).png({ compressionLevel: 2, adaptiveFiltering: false }).toBuffer();
}

export interface MapImages {
  /** The planes the images were made from (an analysis of the full set may reuse them when it holds the same planes). */
  logContrast: Plane;
  difference: Plane;
  lcMax: number;
  dMax: number;
  logContrastPng: Buffer;
  differencePng: Buffer;
}

/** The two false-colour PNGs of the maps, with their scales. */
export async function renderMapImages(maps: Pick<AnalysisMaps, 'logContrast' | 'difference'>): Promise<MapImages> {
  const lcMax = Math.max(0.05, percentile(sampled(maps.logContrast), 99.5) || 0);
  const dMax = Math.max(1e-6, percentile(sampled(maps.difference), 99.5) || 0);
  const [logContrastPng, differencePng] = await Promise.all([png(maps.logContrast, 0, lcMax), png(maps.difference, 0, dMax)]);
  return { logContrast: maps.logContrast, difference: maps.difference, lcMax, dMax, logContrastPng, differencePng };
}

/** Encodes the map planes as false-colour PNGs and gathers the histogram data; `images` made earlier from the same planes are reused. */
export async function renderArtifacts(maps: AnalysisMaps, images?: MapImages | null): Promise<Artifacts> {
  const same = images && images.logContrast.data === maps.logContrast.data && images.difference.data === maps.difference.data;
  const { lcMax, dMax, logContrastPng, differencePng } = same ? images : await renderMapImages(maps);
  return {
    logContrastPng,
    differencePng,
    data: {
      logContrast: { min: 0, max: lcMax, unit: 'log10(on/off)' },
      difference: { min: 0, max: dMax, unit: 'relative luminance' },
      factor: maps.factor,
      histograms: maps.histograms,
    },
  };
}

/** Writes the artifacts into a folder: log-contrast.png, difference.png, maps.json. Returns their paths. */
export async function writeArtifacts(dir: string, artifacts: Artifacts): Promise<{ logContrast: string; difference: string; data: string }> {
  await mkdir(dir, { recursive: true });
  const paths = { logContrast: join(dir, 'log-contrast.png'), difference: join(dir, 'difference.png'), data: join(dir, 'maps.json') };
  await Promise.all([
    writeFile(paths.logContrast, artifacts.logContrastPng),
    writeFile(paths.difference, artifacts.differencePng),
    writeFile(paths.data, JSON.stringify(artifacts.data)),
  ]);
  return paths;
}
