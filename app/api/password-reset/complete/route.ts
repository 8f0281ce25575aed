import { NextResponse } from 'next/server';
import { completePasswordReset } from '@/lib/server/auth/password-reset';
import { errorResponse, readJson } from '@/lib/server/auth/with-auth';
import { resetCompleteSchema } from '@/lib/schemas/team';

export async function POST(req: Request) {
  try {
    const input = resetCompleteSchema.parse(await readJson(req));
    await completePasswordReset(input.token, input.password);
    return NextResponse.json({ message: 'Password changed. Sign in with the new one.' });
  } catch (err) {
    return errorResponse(err);
  }
}
