import { decode } from 'next-auth/jwt';

/** What reads cookies here: next/headers' jar in handlers, NextRequest's cookies in the proxy. */
export type CookieSource = { getAll(): { name: string; value: string }[] };

/**
 * The session token as next-auth stores it: one cookie, or several numbered chunks when long.
 * Mirrors next-auth's SessionStore so a chunked token reads back the same.
 */
export function sessionToken(jar: CookieSource, secureCookies: boolean): string {
  const name = `${secureCookies ? '__Secure-' : ''}next-auth.session-token`;
  const suffix = (n: string) => parseInt(n.split('.').pop() ?? '0');
  return jar
    .getAll()
    .filter((c) => c.name.startsWith(name))
    .sort((a, b) => suffix(a.name) - suffix(b.name))
    .map((c) => c.value)
    .join('');
}

// jose's leeway on exp/nbf in next-auth's decode, repeated for tokens answered from memory
const CLOCK_TOLERANCE_S = 15;
const DECODED_MAX = 1000;
type Claims = { sub: string | null; sv: number; exp?: number; nbf?: number };
const g = globalThis as unknown as { __veilmeterDecoded?: Map<string, Claims> };

/**
 * The signed-in user's id from the session JWT, or null. A decoded token is remembered by its
 * exact text: the text is authenticated ciphertext, so the same text always decodes to the same
 * claims, and decoding (an HKDF key derivation and an AES-GCM decryption) was the largest single
 * cost of a cached read. Expiry is still checked on every request.
 */
export async function sessionUserId(jar: CookieSource, secureCookies: boolean, secret: string): Promise<string | null> {
  return (await sessionClaims(jar, secureCookies, secret))?.sub ?? null;
}

/**
 * The user id and session version of the session JWT, or null. The version is compared with the
 * user's row on every request (lib/server/auth/session.ts): a token issued before the last sign-out,
 * password reset or removal from the last lab carries an older one. A token without one (issued
 * before versions existed) counts as version 0.
 */
export async function sessionClaims(jar: CookieSource, secureCookies: boolean, secret: string): Promise<{ sub: string; sv: number } | null> {
  const token = sessionToken(jar, secureCookies);
  if (!token) return null;
  const memo = (g.__veilmeterDecoded ??= new Map());
  let claims = memo.get(token);
  if (!claims) {
    try {
      const payload = await decode({ token, secret });
      const sv = payload?.sv;
      claims = {
        sub: typeof payload?.sub === 'string' && payload.sub ? payload.sub : null,
        sv: typeof sv === 'number' && Number.isInteger(sv) ? sv : 0,
        exp: payload?.exp as number | undefined,
        nbf: payload?.nbf as number | undefined,
      };
    } catch {
      return null;
    }
    if (memo.size >= DECODED_MAX) memo.delete(memo.keys().next().value as string);
    memo.set(token, claims);
  }
  const now = Math.floor(Date.now() / 1000);
  if (typeof claims.exp === 'number' && claims.exp <= now - CLOCK_TOLERANCE_S) {
    memo.delete(token);
    return null;
  }
  if (typeof claims.nbf === 'number' && claims.nbf > now + CLOCK_TOLERANCE_S) return null;
  return claims.sub ? { sub: claims.sub, sv: claims.sv } : null;
}
