import { LUMINANCE_WEIGHTS } from './luminance';
import { linearTable } from './srgb';
import type { PhotoRaster } from './types';

/** Throws RangeError unless the raster's fields agree with each other. */
export function assertRaster(r: PhotoRaster): void {
  if (!Number.isInteger(r.width) || !Number.isInteger(r.height) || r.width < 1 || r.height < 1) {
    throw new RangeError(`raster size must be positive integers, got ${r.width} × ${r.height}`);
  }
  if (r.channels !== 1 && r.channels !== 3) throw new RangeError(`raster must have 1 or 3 channels, got ${String(r.channels)}`);
  if (r.bitDepth !== 8 && r.bitDepth !== 16) throw new RangeError(`bitDepth must be 8 or 16`);
  if (r.bitDepth === 8 ? !(r.data instanceof Uint8Array) : !(r.data instanceof Uint16Array)) {
    throw new RangeError('raster data type does not match its bit depth');
  }
  if (r.data.length !== r.width * r.height * r.channels) throw new RangeError('raster data length does not match its size');
}

export interface LuminanceTables {
  /** Per-code contribution of each channel to Y, the BT.709 weights folded in so a pixel costs three lookups. */
  r: Float64Array;
  g: Float64Array;
  b: Float64Array;
  /** Linear value per code, for colour means. */
  linear: Float64Array;
  /** Lowest code counted as clipped: 98% of full scale (docs/method.md §5.5). */
  clipCode: number;
}

const tableCache = new Map<string, LuminanceTables>();

/** Lookup tables from code value to weighted linear luminance, for 8 or 16 bits, sRGB or linear. */
export function luminanceTables(bitDepth: 8 | 16, encoding: 'srgb' | 'linear'): LuminanceTables {
  const key = `${bitDepth}:${encoding}`;
  const hit = tableCache.get(key);
  if (hit) return hit;
  const linear = linearTable(bitDepth, encoding);
  const n = linear.length;
  const r = new Float64Array(n);
  const g = new Float64Array(n);
  const b = new Float64Array(n);
  for (let v = 0; v < n; v++) {
    const l = linear[v] as number;
    // ITU-R BT.709 weights, applied per channel before the sum
    r[v] = LUMINANCE_WEIGHTS.r * l;
    g[v] = LUMINANCE_WEIGHTS.g * l;
    b[v] = LUMINANCE_WEIGHTS.b * l;
  }
  const tables = { r, g, b, linear, clipCode: Math.ceil(0.98 * (n - 1)) };
  tableCache.set(key, tables);
  return tables;
}

/** Block size that brings an image to at most maxWidth pixels wide (1 when it already fits). */
export function downsampleFactor(width: number, maxWidth: number): number {
  if (!(width >= 1) || !(maxWidth >= 1)) throw new RangeError('width and maxWidth must be positive');
  return Math.max(1, Math.ceil(width / maxWidth));
}
