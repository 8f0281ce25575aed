import type { ExposureTags } from './types';

function positiveFinite(v: number | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

/** Exposure factor E = t·S/N², or null when EXIF lacks any of the three tags. */
export function exposureFactor(tags: ExposureTags | null | undefined): number | null {
  if (!tags) return null;
  const { exposureTime: t, iso: s, fNumber: n } = tags;
  if (!positiveFinite(t) || !positiveFinite(s) || !positiveFinite(n)) return null;
  // ISO 2720 / ISO 12232: the linear signal is proportional to L·t·S/N²
  return (t * s) / (n * n);
}

/**
 * Multiplier that brings each photo onto the `on` photo's scale (E_on / E_photo).
 * When any photo lacks a factor, all photos are assumed equal (scale 1) and `known` is false.
 */
export function exposureScales<K extends string>(
  tags: Record<K, ExposureTags | null | undefined>,
  reference: K,
): { scales: Record<K, number>; known: boolean; missing: K[] } {
  const keys = Object.keys(tags) as K[];
  const factors = new Map<K, number | null>();
  for (const k of keys) factors.set(k, exposureFactor(tags[k]));
  const missing = keys.filter((k) => factors.get(k) === null);
  const scales = {} as Record<K, number>;
  const ref = factors.get(reference);
  const known = missing.length === 0 && typeof ref === 'number';
  for (const k of keys) {
    const f = factors.get(k);
    scales[k] = known && typeof f === 'number' && typeof ref === 'number' ? ref / f : 1;
  }
  return { scales, known, missing };
}
