import NextAuth from 'next-auth';
import { NextRequest, NextResponse } from 'next/server';
import { addressKey, clear, giveBack, signInDelayMs, spend, spent } from '@/lib/server/auth/limits';
import { getAuthOptions } from '@/lib/server/auth/options';
import { sameOriginPath } from '@/lib/auth/safe-next';
import { getEnv } from '@/lib/env';
import { clientAddress } from '@/lib/security/client-ip';
import { consume, RateLimited } from '@/lib/server/security/rate-limit';

type Ctx = { params: Promise<{ nextauth: string[] }> };

// A credentials sign-in is a few short fields; anything longer is not one.
const SIGN_IN_BODY_MAX = 16 * 1024;

function run(req: Request, ctx: Ctx) {
  return NextAuth(req as never, ctx as never, getAuthOptions()) as Promise<Response>;
}

/**
 * The request with a callbackUrl query parameter that leads off this origin replaced by the
 * origin: next-auth answers 500 to one no URL parser accepts (`http://localhost:3000.evil.example/`)
 * on every route but its HTML pages, and would carry any other into its callback-url cookie.
 */
async function withSafeCallback(req: Request): Promise<Request> {
  const url = new URL(req.url);
  const wanted = url.searchParams.get('callbackUrl');
  if (wanted === null) return req;
  const origin = new URL(getEnv().NEXTAUTH_URL).origin;
  const path = sameOriginPath(wanted, origin);
  const safe = path ? `${origin}${path}` : origin;
  if (safe === wanted) return req;
  url.searchParams.set('callbackUrl', safe);
  const body = req.method === 'GET' || req.method === 'HEAD' ? undefined : await bodyText(req, SIGN_IN_BODY_MAX);
  return new NextRequest(url, { method: req.method, headers: req.headers, body });
}

/**
 * next-auth keeps the return address in a cookie too, and answers 500 when that cookie holds one
 * it cannot parse (a cookie set for this host from a sibling site): such a cookie is cleared, with
 * a 400 that says why, before next-auth reads it. Null when the cookie is absent or on this origin.
 */
function clearForeignCallbackCookie(req: Request): Response | null {
  const secure = getAuthOptions().useSecureCookies === true;
  const name = `${secure ? '__Secure-' : ''}next-auth.callback-url`;
  const pair = (req.headers.get('cookie') ?? '').split(/;\s*/).find((c) => c.startsWith(`${name}=`));
  if (!pair) return null;
  let value = pair.slice(name.length + 1);
  try {
    value = decodeURIComponent(value);
  } catch {
    // kept as sent; it fails the check below
  }
  if (sameOriginPath(value, new URL(getEnv().NEXTAUTH_URL).origin)) return null;
  const res = NextResponse.json({ error: { code: 'bad_callback', message: 'This browser held a return address of another site; it has been cleared. Try again.' } }, { status: 400 });
  res.cookies.set(name, '', { path: '/', maxAge: 0, httpOnly: true, sameSite: 'lax', secure });
  return res;
}

async function GET(req: Request, ctx: Ctx) {
  return clearForeignCallbackCookie(req) ?? run(await withSafeCallback(req), ctx);
}

class BadBody extends Error {
  constructor(readonly status: number, message: string) {
    super(message);
  }
}

/** The body as text, counted as it streams, refused past `max` bytes. */
async function bodyText(req: Request, max: number): Promise<string> {
  if (!req.body) return '';
  const reader = req.body.getReader();
  const parts: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > max) {
      await reader.cancel().catch(() => undefined);
      throw new BadBody(413, 'A sign-in is a few short fields; this body is too large');
    }
    parts.push(value);
  }
  return Buffer.concat(parts).toString('utf8');
}

/**
 * The fields of a sign-in as next-auth reads them (JSON, or a URL-encoded form where the last of
 * repeated fields wins), flattened to one string each. The request next-auth then sees is rebuilt
 * from exactly these fields, with the address in the form the limits count it under, so the
 * address limited is the address authenticated, whatever the client sent.
 */
async function signInFields(req: Request): Promise<Record<string, string>> {
  const type = req.headers.get('content-type') ?? '';
  const text = await bodyText(req, SIGN_IN_BODY_MAX);
  let raw: Record<string, unknown>;
  if (type.includes('application/json')) {
    try {
      const parsed: unknown = JSON.parse(text);
      raw = parsed && typeof parsed === 'object' && !Array.isArray(parsed) ? (parsed as Record<string, unknown>) : {};
    } catch {
      throw new BadBody(422, 'The request body is not valid JSON');
    }
  } else if (type.includes('application/x-www-form-urlencoded')) {
    raw = Object.fromEntries(new URLSearchParams(text));
  } else {
    throw new BadBody(415, 'Send the sign-in as a form (application/x-www-form-urlencoded) or as JSON');
  }
  const fields: Record<string, string> = {};
  for (const [k, v] of Object.entries(raw)) if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') fields[k] = String(v);
  fields.email = addressKey(fields.email);
  return fields;
}

// next-auth reads the query through NextRequest's nextUrl, so the copy is one too
function rebuilt(req: Request, fields: Record<string, string>): NextRequest {
  const headers = new Headers(req.headers);
  headers.set('content-type', 'application/x-www-form-urlencoded');
  headers.delete('content-length');
  headers.delete('transfer-encoding');
  return new NextRequest(req.url, { method: 'POST', headers, body: new URLSearchParams(fields).toString() });
}

function tooMany(retryAfterS: number): Response {
  const url = `${getEnv().NEXTAUTH_URL}/sign-in?error=TooManyAttempts`;
  return NextResponse.json({ url, error: 'Too many sign-in attempts. Wait and try again.' }, { status: 429, headers: { 'Retry-After': String(retryAfterS) } });
}

/** Whether next-auth's answer to a credentials sign-in is a success (its target carries no error). */
async function succeeded(res: Response): Promise<boolean> {
  if (res.status >= 400) return false;
  const location = res.headers.get('location') ?? '';
  const body = res.headers.get('content-type')?.includes('json') ? ((await res.clone().json().catch(() => ({}))) as { url?: string }) : {};
  const target = body.url ?? location;
  return !!target && !target.includes('error=');
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

// Credential sign-ins are limited per client and address before next-auth sees them
// (lib/server/auth/limits.ts says how); the client is the socket's peer, or what a trusted proxy reports.
async function POST(req: Request, ctx: Ctx) {
  const foreign = clearForeignCallbackCookie(req);
  if (foreign) return foreign;
  const { nextauth } = await ctx.params;
  let fields: Record<string, string>;
  try {
    req = await withSafeCallback(req);
    if (nextauth.join('/') !== 'callback/credentials') return run(req, ctx);
    fields = await signInFields(req);
  } catch (err) {
    if (err instanceof BadBody) return NextResponse.json({ error: { code: 'bad_request', message: err.message } }, { status: err.status });
    throw err;
  }
  const address = fields.email || '-';
  const client = clientAddress(req);
  try {
    await consume([['signInIp', client]]);
    await spend([
      ['signInPair', `${address}|${client}`],
      ['signInClient', client],
    ]);
  } catch (err) {
    if (err instanceof RateLimited) return tooMany(err.retryAfterS);
    throw err;
  }
  const wait = signInDelayMs(await spent('signInAddress', address));
  if (wait > 0) await sleep(wait);
  const res = await run(rebuilt(req, fields), ctx);
  if (await succeeded(res)) {
    await Promise.all([clear('signInPair', `${address}|${client}`), giveBack('signInClient', client), clear('signInAddress', address)]);
  } else {
    await spend([['signInAddress', address]]).catch(() => undefined);
  }
  return res;
}

export { GET, POST };
