/**
 * The Content-Security-Policy of a page, with a fresh nonce per request: Next.js reads the nonce
 * from the request's copy of this header and puts it on every script it renders, so no inline
 * script without it runs ('strict-dynamic' lets those scripts load the app's chunks). Styles keep
 * 'unsafe-inline': React's style attributes need it, and styles cannot run code.
 */
export function pageCsp(nonce: string, dev = false): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}

/** 128 random bits, base64: what a nonce-source takes. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

/** A year, subdomains included: sent only on answers that came over https (lib/security/client-ip.ts servedOverHttps). */
export const HSTS = 'max-age=31536000; includeSubDomains';
