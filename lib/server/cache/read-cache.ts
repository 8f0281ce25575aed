import { gzipSync } from 'node:zlib';
import { ByteLru } from './lru';

/** A serialized answer, ready to send as it is. */
export type CachedBody = { body: Uint8Array<ArrayBuffer>; meta: Record<string, string>; gzip?: Uint8Array<ArrayBuffer> };

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

/** Whether the request's Accept-Encoding takes gzip (a q of 0 refuses it). */
export function acceptsGzip(req: Request): boolean {
  const header = req.headers.get('accept-encoding') ?? '';
  return header.split(',').some((part) => {
    const [coding, ...params] = part.trim().toLowerCase().split(';');
    if (coding !== 'gzip' && coding !== '*') return false;
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    return q === undefined || Number(q.slice(2)) > 0;
  });
}

/**
 * Next.js drops a handler's Content-Encoding header, so a body compressed here would reach the
 * client unlabelled. scripts/web.mjs marks every request it forwards with PRECOMPRESSED_OK (after
 * removing any a client sent) and turns ENCODING_HEADER back into Content-Encoding on the way out;
 * without that mark (next dev, plain next start) answers go uncompressed from here.
 */
export const PRECOMPRESSED_OK = 'x-veilmeter-precompressed';
export const ENCODING_HEADER = 'x-veilmeter-encoding';
/** Likewise for Content-Length, which Next.js also drops: a known length spares chunked framing. */
export const LENGTH_HEADER = 'x-veilmeter-length';

/**
 * A cached body as a response: gzip-compressed once per body (and then kept beside it) for clients
 * that take gzip, as browsers and fetch do, instead of compressing the same bytes on every request.
 */
export function cachedAnswer(req: Request, cached: CachedBody, headers: Record<string, string>): Response {
  const vary = { ...headers, vary: 'accept-encoding' };
  const viaWebServer = req.headers.get(PRECOMPRESSED_OK) === '1';
  const length = (bytes: Uint8Array): Record<string, string> => (viaWebServer ? { [LENGTH_HEADER]: String(bytes.byteLength) } : {});
  if (cached.body.byteLength >= 1024 && viaWebServer && acceptsGzip(req)) {
    cached.gzip ??= new Uint8Array(gzipSync(cached.body, { level: 6 }));
    return new Response(cached.gzip, { status: 200, headers: { ...vary, ...length(cached.gzip), [ENCODING_HEADER]: 'gzip' } });
  }
  return new Response(cached.body, { status: 200, headers: { ...vary, ...length(cached.body) } });
}
