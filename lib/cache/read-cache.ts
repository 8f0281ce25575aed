import { ByteLru } from './lru';

/** A serialized answer, ready to send as it is. */
export type CachedBody = { body: Uint8Array<ArrayBuffer>; meta: Record<string, string> };

// Large enough for a handful of big projects' trend and CSV answers (≈1 MB each at 2,000 sets),
// small enough not to matter beside the Node heap.
const MAX_BYTES = 16 * 1024 * 1024;

const g = globalThis as unknown as { __veilmeterReadCache?: { lru: ByteLru<{ version: string; value: CachedBody }>; building: Map<string, Promise<CachedBody>> } };

function state() {
  g.__veilmeterReadCache ??= { lru: new ByteLru(MAX_BYTES), building: new Map() };
  return g.__veilmeterReadCache;
}

/**
 * The answer for one (kind, lab, project) at one data version: from memory when the version is
 * the one it was built at, otherwise built once however many requests ask at the same moment.
 * The lab is part of the key, so one lab's body can never answer another lab's request; the
 * caller still runs its own lab and permission checks before asking.
 */
export async function cachedBody(kind: string, labId: string, projectId: string, version: string, build: () => Promise<CachedBody>): Promise<CachedBody> {
  const { lru, building } = state();
  const slot = `${kind}\u0000${labId}\u0000${projectId}`;
  const hit = lru.get(slot);
  if (hit && hit.version === version) return hit.value;
  const flight = `${slot}\u0000${version}`;
  let pending = building.get(flight);
  if (!pending) {
    // The caller read the version before build() reads the data, so a body is never older than
    // its version: a write in between only makes it fresher, and the next version check rebuilds.
    pending = build().then((value) => {
      lru.set(slot, { version, value }, value.body.byteLength + 256);
      return value;
    });
    pending.finally(() => building.delete(flight)).catch(() => undefined);
    building.set(flight, pending);
  }
  return pending;
}

/** Forgets every cached answer (tests; a process never needs it to stay correct). */
export function clearReadCache(): void {
  const s = state();
  s.lru.clear();
  s.building.clear();
}

export function readCacheStats(): { entries: number; bytes: number } {
  const { lru } = state();
  return { entries: lru.size, bytes: lru.bytes };
}
