import type { Preview } from '@/db/queries/comparisons';

const KIND_STYLE = {
  screen: { stroke: 'rgb(var(--beam))', label: 'screen' },
  background: { stroke: 'rgb(var(--pass))', label: 'background' },
  ghost: { stroke: 'rgb(var(--glow))', label: 'ghost' },
} as const;

/** A capture's on-photo preview with the rectangles its reading was measured in. */
function PreviewCard({ p }: { p: Preview }) {
  const sw = Math.max(2, p.width / 300);
  return (
    <figure className="overflow-hidden rounded-md border border-line bg-canvas" data-testid="compare-preview">
      <div className="relative">
        {/* eslint-disable-next-line @next/next/no-img-element -- a private, session-bound preview; next/image would cache it publicly */}
        <img src={`/api/captures/${p.captureSetId}/photos/${p.photoId}/preview`} alt={`On photo of ${p.captureLabel}`} className="block w-full" />
        <svg viewBox={`0 0 ${p.width} ${p.height}`} className="absolute inset-0 h-full w-full" aria-hidden preserveAspectRatio="none">
          {(['background', 'ghost', 'screen'] as const).map((kind) => {
            const r = p[kind];
            if (!r) return null;
            return <rect key={kind} x={r.x} y={r.y} width={r.w} height={r.h} fill="none" stroke={KIND_STYLE[kind].stroke} strokeWidth={sw} strokeDasharray={kind === 'ghost' ? `${sw * 3} ${sw * 2}` : undefined} data-region={kind} />;
          })}
        </svg>
      </div>
      <figcaption className="px-2 py-1 text-xs text-muted">
        <a href={`/captures/${p.captureSetId}`} className="hover:text-beam">
          {p.captureLabel}
        </a>
      </figcaption>
    </figure>
  );
}

export function PreviewStrip({ title, previews, total }: { title: string; previews: Preview[]; total: number }) {
  return (
    <div>
      <h3 className="mb-2 text-sm font-semibold text-ink">{title}</h3>
      {previews.length ? (
        <div className="grid grid-cols-2 gap-2">
          {previews.map((p) => (
            <PreviewCard key={p.captureSetId} p={p} />
          ))}
        </div>
      ) : (
        <p className="text-sm text-muted">No stored on photo to show for these readings.</p>
      )}
      {total > previews.length ? <p className="mt-1 text-xs text-muted">First {previews.length} of {total} capture sets.</p> : null}
      <p className="mt-2 flex gap-3 text-xs text-muted">
        {Object.entries(KIND_STYLE).map(([k, s]) => (
          <span key={k} className="inline-flex items-center gap-1">
            <span className="inline-block h-2 w-3 border-2" style={{ borderColor: s.stroke }} />
            {s.label}
          </span>
        ))}
      </p>
    </div>
  );
}
