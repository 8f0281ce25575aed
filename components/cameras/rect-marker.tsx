'use client';

import { useRef, useState } from 'react';

export type MarkedRect = { x: number; y: number; w: number; h: number };

/** The chosen photo with a rectangle drawn by dragging; reports it in the photo's own pixels. */
export function RectMarker({ src, rect, onRect, label }: { src: string; rect: MarkedRect | null; onRect: (r: MarkedRect) => void; label: string }) {
  const img = useRef<HTMLImageElement>(null);
  const [start, setStart] = useState<{ x: number; y: number } | null>(null);
  const [size, setSize] = useState<{ w: number; h: number } | null>(null);
  // pointer position in the photo's pixels (the image is shown scaled to the panel's width)
  const at = (e: React.PointerEvent) => {
    const el = img.current;
    if (!el) return { x: 0, y: 0 };
    const box = el.getBoundingClientRect();
    const sx = el.naturalWidth / box.width;
    const sy = el.naturalHeight / box.height;
    return { x: Math.max(0, Math.min(el.naturalWidth, Math.round((e.clientX - box.left) * sx))), y: Math.max(0, Math.min(el.naturalHeight, Math.round((e.clientY - box.top) * sy))) };
  };
  const update = (e: React.PointerEvent) => {
    if (!start) return;
    const p = at(e);
    const r = { x: Math.min(start.x, p.x), y: Math.min(start.y, p.y), w: Math.abs(p.x - start.x), h: Math.abs(p.y - start.y) };
    if (r.w >= 1 && r.h >= 1) onRect(r);
  };
  return (
    <div className="relative inline-block max-w-full touch-none select-none" aria-label={label}>
      {/* eslint-disable-next-line @next/next/no-img-element -- a local object URL, not an optimisable asset */}
      <img
        ref={img}
        src={src}
        alt={label}
        draggable={false}
        className="max-h-[420px] max-w-full rounded border border-line"
        onLoad={(e) => setSize({ w: e.currentTarget.naturalWidth, h: e.currentTarget.naturalHeight })}
        onPointerDown={(e) => {
          e.currentTarget.setPointerCapture(e.pointerId);
          setStart(at(e));
        }}
        onPointerMove={update}
        onPointerUp={(e) => {
          update(e);
          setStart(null);
        }}
      />
      {rect && size ? (
        <div
          className="pointer-events-none absolute border-2 border-beam bg-beam/15"
          style={{ left: `${(100 * rect.x) / size.w}%`, top: `${(100 * rect.y) / size.h}%`, width: `${(100 * rect.w) / size.w}%`, height: `${(100 * rect.h) / size.h}%` }}
        />
      ) : null}
    </div>
  );
}
