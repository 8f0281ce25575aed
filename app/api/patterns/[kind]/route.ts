import { NextResponse } from 'next/server';
import { kindFromSegment, parsePatternSize } from '@/components/patterns/params';
import { errorResponse } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { PATTERN_KINDS } from '@/lib/patterns';
import { clientAddress } from '@/lib/security/client-ip';
import { RateLimited } from '@/lib/server/security/rate-limit';
import { spend } from '@/lib/server/security/work-limit';
import { cachedPatternPng } from './render-cache';

// Public on purpose: a pattern holds no lab data, and the device showing it is often not signed in.
export async function GET(req: Request, ctx: { params: Promise<{ kind: string }> }): Promise<Response> {
  const { kind: segment } = await ctx.params;
  const kind = kindFromSegment(segment);
  if (!kind) {
    return NextResponse.json(
      { error: { code: 'not_found', message: `No such pattern. Known patterns: ${PATTERN_KINDS.join(', ')}` } },
      { status: 404 },
    );
  }
  const url = new URL(req.url);
  const size = parsePatternSize(url.searchParams.get('width'), url.searchParams.get('height'));
  if (!size.ok) {
    return NextResponse.json(
      { error: { code: 'invalid_size', message: [...(size.errors.width ?? []), ...(size.errors.height ?? [])].join('; '), fieldErrors: size.errors } },
      { status: 422 },
    );
  }
  try {
    // each client has a budget of requests and of megapixels drawn (cached sizes cost no drawing)
    const client = clientAddress(req);
    await spend('patternRequests', client);
    const { png, cache } = await cachedPatternPng(kind, size.width, size.height, client);
    return new Response(new Uint8Array(png), {
      status: 200,
      headers: {
        'Content-Type': 'image/png',
        'Content-Length': String(png.length),
        'X-Veilmeter-Cache': cache,
        // The same URL always yields the same pixels; a day keeps room for a fix to reach devices.
        'Cache-Control': 'public, max-age=86400, stale-while-revalidate=604800, immutable',
        'Content-Disposition': `inline; filename="${kind}-${size.width}x${size.height}.png"`,
      },
    });
  } catch (err) {
    if (err instanceof AppError || err instanceof RateLimited) return errorResponse(err);
    console.error('[veilmeter] pattern render failed', err);
    return NextResponse.json({ error: { code: 'internal', message: 'The pattern could not be drawn. Try again.' } }, { status: 500 });
  }
}
