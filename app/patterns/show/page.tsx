import type { Metadata } from 'next';
import Link from 'next/link';
import { parsePatternSize } from '@/components/patterns/params';
import { PatternShow } from '@/components/patterns/pattern-show';
import { isPatternKind, type PatternKind } from '@/lib/patterns';

export const metadata: Metadata = { title: 'Pattern' };

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

// Outside the signed-in layout on purpose: the device's display shows nothing but the pattern.
export default async function PatternShowPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const kindParam = one(sp.kind);
  const kind: PatternKind = kindParam && isPatternKind(kindParam) ? kindParam : 'white';
  const widthParam = one(sp.width);
  const heightParam = one(sp.height);
  const asked = widthParam !== undefined || heightParam !== undefined;
  const size = asked ? parsePatternSize(widthParam, heightParam) : null;

  if (size && !size.ok) {
    return (
      <div className="fixed inset-0 flex items-center justify-center bg-black p-6 text-neutral-200">
        <div role="alert" className="max-w-md text-center">
          <p className="font-medium">This pattern size cannot be shown</p>
          <p className="mt-2 text-sm text-neutral-400">{[...(size.errors.width ?? []), ...(size.errors.height ?? [])].join('. ')}.</p>
          <Link href="/patterns" className="mt-4 inline-block text-sm text-neutral-200 underline">
            Back to the pattern generator
          </Link>
        </div>
      </div>
    );
  }
  return <PatternShow initialKind={kind} width={size?.ok ? size.width : null} height={size?.ok ? size.height : null} />;
}
