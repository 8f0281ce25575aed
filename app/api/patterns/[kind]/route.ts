import { NextResponse } from 'next/server';
import { kindFromSegment, parsePatternSize } from '@/components/patterns/params';
import { patternPng } from '@/lib/image/pattern-png';
import { PATTERN_KINDS } from '@/lib/patterns';

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
    const png = await patternPng(kind, size.width, size.height);
    return new Response(new Uint8Array(png), {
      status: 200,
      headers: {
        'Content-Type': 'image/png',
        'Content-Length': String(png.length),
        // The same URL always yields the same pixels; a day keeps room for a fix to reach devices.
        'Cache-Control': 'public, max-age=86400, stale-while-revalidate=604800, immutable',
        'Content-Disposition': `inline; filename="${kind}-${size.width}x${size.height}.png"`,
      },
    });
  } catch (err) {
    console.error('[veilmeter] pattern render failed', err);
    return NextResponse.json({ error: { code: 'internal', message: 'The pattern could not be drawn. Try again.' } }, { status: 500 });
  }
}
