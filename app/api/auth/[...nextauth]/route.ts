import NextAuth from 'next-auth';
import { NextResponse } from 'next/server';
import { getAuthOptions } from '@/lib/auth/options';
import { getEnv } from '@/lib/env';
import { clientIp, consume, RateLimited, resetLimit } from '@/lib/security/rate-limit';

type Ctx = { params: Promise<{ nextauth: string[] }> };

function run(req: Request, ctx: Ctx) {
  return NextAuth(req as never, ctx as never, getAuthOptions()) as Promise<Response>;
}

async function GET(req: Request, ctx: Ctx) {
  return run(req, ctx);
}

// Credential sign-ins are limited per address and per client address before next-auth sees
// them; a success clears the address's counter.
async function POST(req: Request, ctx: Ctx) {
  const { nextauth } = await ctx.params;
  if (nextauth.join('/') !== 'callback/credentials') return run(req, ctx);
  const form = await req.clone().formData().catch(() => null);
  const email = String(form?.get('email') ?? '').trim().toLowerCase();
  try {
    await consume([
      ['signInIp', clientIp(req)],
      ['signInAddress', email || '-'],
    ]);
  } catch (err) {
    if (!(err instanceof RateLimited)) throw err;
    const url = `${getEnv().NEXTAUTH_URL}/sign-in?error=TooManyAttempts`;
    return NextResponse.json({ url, error: 'Too many sign-in attempts. Wait and try again.' }, { status: 429, headers: { 'Retry-After': String(err.retryAfterS) } });
  }
  const res = await run(req, ctx);
  const location = res.headers.get('location') ?? '';
  const body = res.headers.get('content-type')?.includes('json') ? ((await res.clone().json().catch(() => ({}))) as { url?: string }) : {};
  const target = body.url ?? location;
  if (target && !target.includes('error=')) await resetLimit('signInAddress', email);
  return res;
}

export { GET, POST };
