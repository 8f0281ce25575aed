import { NextResponse } from 'next/server';
import { readJson, errorResponse } from '@/lib/server/auth/with-auth';
import { requestPasswordReset, RESET_REQUESTED } from '@/lib/server/auth/password-reset';
import { clientAddress } from '@/lib/security/client-ip';
import { RateLimited } from '@/lib/server/security/rate-limit';
import { resetRequestSchema } from '@/lib/schemas/team';

export async function POST(req: Request) {
  try {
    const { email } = resetRequestSchema.parse(await readJson(req));
    await requestPasswordReset(email, clientAddress(req));
    return NextResponse.json({ message: RESET_REQUESTED });
  } catch (err) {
    if (err instanceof RateLimited) {
      return NextResponse.json({ error: { code: 'rate_limited', message: 'Too many reset requests. Wait and try again.' } }, { status: 429, headers: { 'Retry-After': String(err.retryAfterS) } });
    }
    return errorResponse(err);
  }
}
