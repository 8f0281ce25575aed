'use client';

import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { useApplyTemplate, useDetectScreen, useSaveRegions, useSaveTemplate, useTemplates, type EditableRegion } from '@/lib/hooks/use-regions';
import { REGION_KINDS, type RegionKind } from '@/lib/schemas/region';

const COLOURS: Record<RegionKind, string> = { screen: 'rgb(var(--beam))', background: 'rgb(var(--pass))', ghost: 'rgb(var(--glow))' };
const KIND_TEXT: Record<RegionKind, string> = { screen: 'Screen', background: 'Background', ghost: 'Ghost' };
const ZOOMS = [1, 2, 4, 8];

type Drag = { mode: 'draw' | 'move' | 'resize'; kind: RegionKind; startX: number; startY: number; orig: EditableRegion | null; corner?: 'nw' | 'ne' | 'sw' | 'se' };

function clampRect(r: EditableRegion, W: number, H: number): EditableRegion {
  const w = Math.max(1, Math.min(W, Math.round(r.w)));
  const h = Math.max(1, Math.min(H, Math.round(r.h)));
  return { ...r, x: Math.max(0, Math.min(W - w, Math.round(r.x))), y: Math.max(0, Math.min(H - h, Math.round(r.y))), w, h };
}

/**
 * The on photo's preview with the screen, background and ghost rectangles. Everything is kept in
 * full-resolution pixels: the SVG's viewBox is the photo's real size, whatever the preview's.
 */
export function RegionEditor({ captureSetId, photo, initial, canWrite }: { captureSetId: string; photo: { id: string; width: number; height: number }; initial: EditableRegion[]; canWrite: boolean }) {
  const router = useRouter();
  const W = photo.width;
  const H = photo.height;
  const [regions, setRegions] = useState<EditableRegion[]>(initial);
  const [active, setActive] = useState<RegionKind>('screen');
  const [zoom, setZoom] = useState(1);
  const [dirty, setDirty] = useState(false);
  const [note, setNote] = useState<{ tone: 'ok' | 'bad'; text: string } | null>(null);
  const [templateName, setTemplateName] = useState('');
  const svgRef = useRef<SVGSVGElement>(null);
  const drag = useRef<Drag | null>(null);
  const save = useSaveRegions(captureSetId);
  const detect = useDetectScreen(captureSetId);
  const templates = useTemplates(captureSetId);
  const saveTemplate = useSaveTemplate(captureSetId);
  const applyTemplate = useApplyTemplate(captureSetId);

  const get = (kind: RegionKind) => regions.find((r) => r.kind === kind) ?? null;
  const put = (r: EditableRegion) => {
    setRegions((all) => [...all.filter((x) => x.kind !== r.kind), clampRect(r, W, H)]);
    setDirty(true);
    setNote(null);
  };

  const toPhoto = (e: React.PointerEvent) => {
    const box = (svgRef.current as SVGSVGElement).getBoundingClientRect();
    return { x: ((e.clientX - box.left) / box.width) * W, y: ((e.clientY - box.top) / box.height) * H };
  };

  const onDown = (e: React.PointerEvent, mode: Drag['mode'], kind: RegionKind, corner?: Drag['corner']) => {
    if (!canWrite) return;
    e.stopPropagation();
    (e.target as Element).setPointerCapture?.(e.pointerId);
    const p = toPhoto(e);
    setActive(kind);
    drag.current = { mode, kind, startX: p.x, startY: p.y, orig: get(kind), corner };
  };

  // one handler for the whole drawing: the target's data attributes say what was grabbed
  const onSvgDown = (e: React.PointerEvent<SVGSVGElement>) => {
    const t = (e.target as SVGElement).dataset;
    const kind = (REGION_KINDS as readonly string[]).includes(t.kind ?? '') ? (t.kind as RegionKind) : active;
    const mode: Drag['mode'] = t.mode === 'move' || t.mode === 'resize' ? t.mode : 'draw';
    onDown(e, mode, kind, t.corner as Drag['corner']);
  };

  const onMove = (e: React.PointerEvent) => {
    const d = drag.current;
    if (!d) return;
    const p = toPhoto(e);
    const dx = p.x - d.startX;
    const dy = p.y - d.startY;
    if (d.mode === 'draw') {
      put({ kind: d.kind, x: Math.min(d.startX, p.x), y: Math.min(d.startY, p.y), w: Math.abs(dx), h: Math.abs(dy), source: 'marked' });
    } else if (d.orig) {
      const o = d.orig;
      if (d.mode === 'move') put({ ...o, x: o.x + dx, y: o.y + dy, source: 'marked' });
      else {
        const left = d.corner === 'nw' || d.corner === 'sw';
        const top = d.corner === 'nw' || d.corner === 'ne';
        const x0 = left ? Math.min(o.x + dx, o.x + o.w - 1) : o.x;
        const y0 = top ? Math.min(o.y + dy, o.y + o.h - 1) : o.y;
        const x1 = left ? o.x + o.w : Math.max(o.x + 1, o.x + o.w + dx);
        const y1 = top ? o.y + o.h : Math.max(o.y + 1, o.y + o.h + dy);
        put({ ...o, x: x0, y: y0, w: x1 - x0, h: y1 - y0, source: 'marked' });
      }
    }
  };

  const onUp = () => {
    drag.current = null;
  };

  // arrows move the selected rectangle by one pixel (Shift: 10); with Alt they change its size
  const onKey = (e: React.KeyboardEvent) => {
    const r = get(active);
    if (!r || !canWrite) return;
    const step = e.shiftKey ? 10 : 1;
    const d: Record<string, [number, number]> = { ArrowLeft: [-step, 0], ArrowRight: [step, 0], ArrowUp: [0, -step], ArrowDown: [0, step] };
    const v = d[e.key];
    if (!v) return;
    e.preventDefault();
    put(e.altKey ? { ...r, w: r.w + v[0], h: r.h + v[1], source: 'marked' } : { ...r, x: r.x + v[0], y: r.y + v[1], source: 'marked' });
  };

  const doSave = async () => {
    try {
      const out = await save.mutateAsync(regions);
      setRegions(out.regions);
      setDirty(false);
      setNote({ tone: 'ok', text: 'Regions saved' });
      router.refresh();
    } catch (e) {
      setNote({ tone: 'bad', text: (e as Error).message });
    }
  };

  const doDetect = async () => {
    try {
      const { screen } = await detect.mutateAsync();
      put({ ...screen, kind: 'screen', source: 'detected' });
      setActive('screen');
      setNote({ tone: 'ok', text: `Screen found at ${screen.x}, ${screen.y}, ${screen.w} × ${screen.h} px: check it, then save` });
    } catch (e) {
      setNote({ tone: 'bad', text: (e as Error).message });
    }
  };

  const handle = 12 * Math.max(1, W / 1600);
  const stroke = 2 * Math.max(1, W / 1600);
  const sel = get(active);

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Region tools">
        {REGION_KINDS.map((k) => (
          <button
            key={k}
            type="button"
            onClick={() => setActive(k)}
            aria-pressed={active === k}
            className={clsx('rounded-md border px-2.5 py-1 text-xs', active === k ? 'border-beam bg-beam/15 text-ink' : 'border-line text-muted hover:text-ink')}
          >
            <span className="mr-1 inline-block h-2 w-2 rounded-sm" style={{ background: COLOURS[k] }} />
            {KIND_TEXT[k]}
            {get(k) ? '' : ' (none)'}
          </button>
        ))}
        <span className="mx-1 h-5 w-px bg-line" />
        <span className="text-xs text-muted">Zoom</span>
        {ZOOMS.map((z) => (
          <button key={z} type="button" onClick={() => setZoom(z)} aria-pressed={zoom === z} className={clsx('rounded px-2 py-0.5 text-xs', zoom === z ? 'bg-raised text-ink' : 'text-muted hover:text-ink')}>
            {z}×
          </button>
        ))}
        {canWrite ? (
          <>
            <span className="mx-1 h-5 w-px bg-line" />
            <Button type="button" tone="quiet" onClick={doDetect} disabled={detect.isPending}>
              {detect.isPending ? 'Detecting…' : 'Detect screen'}
            </Button>
            {sel ? (
              <Button type="button" tone="quiet" onClick={() => { setRegions((all) => all.filter((r) => r.kind !== active)); setDirty(true); }}>
                Remove {KIND_TEXT[active].toLowerCase()}
              </Button>
            ) : null}
            <Button type="button" onClick={doSave} disabled={save.isPending || !dirty}>
              {save.isPending ? 'Saving…' : dirty ? 'Save regions' : 'Saved'}
            </Button>
          </>
        ) : null}
      </div>

      <div
        className="max-h-[70vh] overflow-auto rounded-md border border-line bg-black outline-none focus-visible:ring-2 focus-visible:ring-beam"
        tabIndex={0}
        onKeyDown={onKey}
        aria-label={`On photo, ${W} × ${H} pixels. Drag to draw the ${KIND_TEXT[active].toLowerCase()}; arrow keys move it, Alt+arrows resize, Shift for 10 px.`}
        data-testid="region-canvas"
      >
        <div className="relative" style={{ width: `${zoom * 100}%` }}>
          {/* eslint-disable-next-line @next/next/no-img-element -- a private, session-bound preview; next/image would cache it publicly */}
          <img src={`/api/captures/${captureSetId}/photos/${photo.id}/preview`} alt="On photo preview" className="block w-full select-none" draggable={false} />
          <svg
            ref={svgRef}
            viewBox={`0 0 ${W} ${H}`}
            preserveAspectRatio="none"
            className={clsx('absolute inset-0 h-full w-full', canWrite && 'cursor-crosshair')}
            onPointerDown={onSvgDown}
            onPointerMove={onMove}
            onPointerUp={onUp}
            onPointerCancel={onUp}
            data-testid="region-svg"
          >
            {regions.map((r) => (
              <g key={r.kind} data-testid={`region-${r.kind}`}>
                <rect
                  x={r.x}
                  y={r.y}
                  width={r.w}
                  height={r.h}
                  fill={COLOURS[r.kind]}
                  fillOpacity={r.kind === active ? 0.18 : 0.08}
                  stroke={COLOURS[r.kind]}
                  strokeWidth={r.kind === active ? stroke * 1.5 : stroke}
                  strokeDasharray={r.source === 'detected' ? `${stroke * 4} ${stroke * 2}` : undefined}
                  className={canWrite ? 'cursor-move' : undefined}
                  data-mode="move"
                  data-kind={r.kind}
                />
                {canWrite && r.kind === active
                  ? (['nw', 'ne', 'sw', 'se'] as const).map((c) => (
                      <rect
                        key={c}
                        x={(c.endsWith('w') ? r.x : r.x + r.w) - handle / 2}
                        y={(c.startsWith('n') ? r.y : r.y + r.h) - handle / 2}
                        width={handle}
                        height={handle}
                        fill="rgb(var(--canvas))"
                        stroke={COLOURS[r.kind]}
                        strokeWidth={stroke}
                        className={c === 'nw' || c === 'se' ? 'cursor-nwse-resize' : 'cursor-nesw-resize'}
                        data-mode="resize"
                        data-kind={r.kind}
                        data-corner={c}
                      />
                    ))
                  : null}
              </g>
            ))}
          </svg>
        </div>
      </div>

      <div className="grid gap-2 text-xs sm:grid-cols-3">
        {REGION_KINDS.map((k) => {
          const r = get(k);
          return (
            <div key={k} className="rounded border border-line px-2 py-1.5" data-testid={`coords-${k}`}>
              <span className="font-semibold" style={{ color: COLOURS[k] }}>
                {KIND_TEXT[k]}
              </span>{' '}
              {r ? (
                <span className="font-mono text-ink">
                  x {r.x} · y {r.y} · {r.w} × {r.h} px <span className="text-muted">({r.source})</span>
                </span>
              ) : (
                <span className="text-muted">{k === 'screen' ? 'not marked: the worker will detect it' : k === 'background' ? 'not marked: transmission is taken over the screen' : 'not marked: the worker looks for one'}</span>
              )}
            </div>
          );
        })}
      </div>
      {note ? (
        <p role={note.tone === 'ok' ? 'status' : 'alert'} className={clsx('text-sm', note.tone === 'ok' ? 'text-pass' : 'text-fail')}>
          {note.text}
        </p>
      ) : null}

      {canWrite ? (
        <div className="flex flex-wrap items-end gap-3 border-t border-line pt-3 text-sm">
          <label className="block">
            <span className="mb-1 block text-xs text-muted">Save the saved regions as a project template</span>
            <input value={templateName} onChange={(e) => setTemplateName(e.target.value)} placeholder="e.g. Bench jig A" maxLength={80} className="rounded-md border border-line bg-canvas px-2 py-1 text-ink" />
          </label>
          <Button
            type="button"
            tone="quiet"
            disabled={!templateName.trim() || saveTemplate.isPending || dirty}
            title={dirty ? 'Save the regions first' : undefined}
            onClick={async () => {
              try {
                await saveTemplate.mutateAsync(templateName.trim());
                setNote({ tone: 'ok', text: `Template “${templateName.trim()}” saved` });
                setTemplateName('');
                void templates.refetch();
              } catch (e) {
                setNote({ tone: 'bad', text: (e as Error).message });
              }
            }}
          >
            Save template
          </Button>
          {templates.data?.templates.length ? (
            <label className="block">
              <span className="mb-1 block text-xs text-muted">Apply a template</span>
              <select
                defaultValue=""
                className="rounded-md border border-line bg-canvas px-2 py-1 text-ink"
                onChange={async (e) => {
                  const id = e.target.value;
                  if (!id) return;
                  try {
                    const out = await applyTemplate.mutateAsync(id);
                    setRegions(out.regions);
                    setDirty(false);
                    setNote({ tone: 'ok', text: 'Template applied and saved' });
                    router.refresh();
                  } catch (err) {
                    setNote({ tone: 'bad', text: (err as Error).message });
                  }
                  e.target.value = '';
                }}
              >
                <option value="">Choose…</option>
                {templates.data.templates.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name} ({t.imageWidth} × {t.imageHeight})
                  </option>
                ))}
              </select>
            </label>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
