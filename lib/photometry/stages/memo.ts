import type { PhotoRaster, Plane } from '../types';

/**
 * Memo of one capture's pure analysis steps. A caller that decodes photos one by one can run the
 * analysis on the on and off photos while the others still decode, then run it again on the full
 * set with the same memo: each stage's result on the same inputs is found in it instead of computed
 * twice. Use one memo per capture, never across captures.
 */
export type AnalysisMemo = Map<string, unknown>;

const objectIds = new WeakMap<object, number>();
let nextObjectId = 1;

/** A number standing for one object (a raster, a plane) for as long as it lives. */
export function idOf(o: PhotoRaster | Plane | object): number {
  let id = objectIds.get(o);
  if (id === undefined) {
    id = nextObjectId++;
    objectIds.set(o, id);
  }
  return id;
}

/** `compute()` once per key and memo; without a memo, every time. */
export function cached<T>(memo: AnalysisMemo | null, key: string, compute: () => T): T {
  if (!memo) return compute();
  if (memo.has(key)) return memo.get(key) as T;
  const v = compute();
  memo.set(key, v);
  return v;
}
