import 'server-only';
import { decodePhoto } from '@/lib/image';
import { detectScreen, downsampleFactor, MAP_MAX_WIDTH, preparePhoto, refineScreenEdges, robustSigma, subtractPlanes } from '@/lib/photometry';
import type { Rect } from '@/lib/photometry/types';

/**
 * The engine's screen detection on the downsampled on − off difference, scaled back to full
 * resolution with its edges put to the pixel (the photos taken as aligned). The editor shows it
 * for the tester to adjust, and the worker measures inside whatever is saved.
 */
export async function detectScreenRect(on: Uint8Array, off: Uint8Array, linear: { on: boolean; off: boolean } = { on: false, off: false }): Promise<Rect | null> {
  // each photo read as the worker will read it (linear 16-bit or sRGB-encoded)
  const [a, b] = await Promise.all([decodePhoto(on, { name: 'the on photo', linear16: linear.on }), decodePhoto(off, { name: 'the off photo', linear16: linear.off })]);
  const width = a.raster.width;
  const height = a.raster.height;
  const diff = subtractPlanes(preparePhoto(a.raster), preparePhoto(b.raster));
  const found = detectScreen(diff, robustSigma(diff.data));
  if (!found) return null;
  const f = downsampleFactor(width, MAP_MAX_WIDTH);
  const x = Math.min(width - 1, found.x * f);
  const y = Math.min(height - 1, found.y * f);
  const coarse = { x, y, w: Math.max(1, Math.min(width - x, found.w * f)), h: Math.max(1, Math.min(height - y, found.h * f)) };
  return refineScreenEdges(coarse, { raster: a.raster, offset: { dx: 0, dy: 0 }, scale: 1 }, { raster: b.raster, offset: { dx: 0, dy: 0 }, scale: 1 }, f);
}
