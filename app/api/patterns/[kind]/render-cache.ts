import 'server-only';
import { ByteLru } from '@/lib/server/cache/lru';
import { TooBusy } from '@/lib/errors';
import { patternPng } from '@/lib/image/pattern-png';
import type { PatternKind } from '@/lib/patterns';
import { spend } from '@/lib/server/security/work-limit';

// Rendered PNGs by kind and size. A pattern's pixels depend on nothing else, so an entry never goes
// stale; 64 MB holds every size a lab uses many times over (an 8192 × 8192 white PNG is well under 1 MB).
const CACHE_BYTES = 64 * 1024 * 1024;
// renders run one at a time per process, a few more wait; beyond that the server is busy
const MAX_WAITING = 6;

type State = { lru: ByteLru<Buffer>; inflight: Map<string, Promise<Buffer>>; running: number; queue: (() => void)[] };
const g = globalThis as unknown as { __veilmeterPatternCache?: State };
const state: State = (g.__veilmeterPatternCache ??= { lru: new ByteLru<Buffer>(CACHE_BYTES), inflight: new Map(), running: 0, queue: [] });

async function oneAtATime<T>(work: () => Promise<T>): Promise<T> {
  if (state.running > 0) {
    if (state.queue.length >= MAX_WAITING) throw new TooBusy('The server is drawing other patterns right now: try again in a few seconds', 5, 'busy');
    await new Promise<void>((resolve) => state.queue.push(resolve));
  }
  state.running++;
  try {
    return await work();
  } finally {
    state.running--;
    state.queue.shift()?.();
  }
}

/**
 * The PNG of a pattern at a size, and whether it came from the cache. A miss spends the client's
 * megapixel budget (lib/server/security/work-limit.ts) before drawing; requests for a size being drawn
 * wait for that one drawing instead of starting their own.
 */
export async function cachedPatternPng(kind: PatternKind, width: number, height: number, client: string): Promise<{ png: Buffer; cache: 'hit' | 'miss' }> {
  const key = `${kind}:${width}x${height}`;
  const hit = state.lru.get(key);
  if (hit) return { png: hit, cache: 'hit' };
  const pending = state.inflight.get(key);
  if (pending) return { png: await pending, cache: 'hit' };
  await spend('patternMegapixels', client, (width * height) / 1e6);
  const drawing = oneAtATime(() => patternPng(kind, width, height));
  state.inflight.set(key, drawing);
  try {
    const png = await drawing;
    state.lru.set(key, png, png.length);
    return { png, cache: 'miss' };
  } finally {
    state.inflight.delete(key);
  }
}

/** For tests: forget every drawn pattern. */
export function clearPatternCache(): void {
  state.lru.clear();
}
