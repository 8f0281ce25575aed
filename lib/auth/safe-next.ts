/**
 * Where to go after sign-in: `next` resolved against this origin, as a path, only when it stays on
 * this origin; otherwise null. Browsers read `/\evil.example` and `//evil.example` as other hosts,
 * so a check on the raw text is not enough: the URL is resolved the way a browser resolves it. A
 * path that would itself start with two slashes (`http://here//evil.example`) keeps one.
 */
export function sameOriginPath(next: string | null | undefined, origin: string): string | null {
  if (!next) return null;
  try {
    const base = new URL(origin);
    const url = new URL(next, base);
    if (url.origin !== base.origin) return null;
    const path = `${url.pathname.replace(/^\/+/, '/')}${url.search}${url.hash}`;
    return path.startsWith('/') ? path : null;
  } catch {
    return null;
  }
}
