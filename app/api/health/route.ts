import { NextResponse } from 'next/server';
import { checkHealth } from '@/lib/server/health';

export const dynamic = 'force-dynamic';

export async function GET() {
  const h = await checkHealth();
  const ok = h.db === 'up' && h.redis === 'up';
  return NextResponse.json({ ok, ...h }, { status: ok ? 200 : 503 });
}
