'use client';

import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { useApplyTemplate, useDetectScreen, useSaveRegions, useSaveTemplate, useTemplates, type EditableRegion } from '@/lib/hooks/use-regions';
import { REGION_KINDS, type RegionKind } from '@/lib/schemas/region';
import { dragRegion, ghostRect, handleSize, hitTest, nudgeRegion, putRegion, screenToPhoto, strokeWidth, type Drag, type Rect } from './region-editor-model';

const COLOURS: Record<RegionKind, string> = { screen: 'rgb(var(--beam))', background: 'rgb(var(--pass))', ghost: 'rgb(var(--glow))' };
const KIND_TEXT: Record<RegionKind, string> = { screen: 'Screen', background: 'Background', ghost: 'Ghost' };
const ZOOMS = [1, 2, 4, 8];

/** The ghost the shown reading detected: its offset from the screen that reading measured. */
export type DetectedGhost = { screen: Rect; dx: number; dy: number; ratio: number; snr: number | null };

const fmt1 = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));

/**
 * The on photo's preview with the screen, background and ghost rectangles. Everything is kept in
 * full-resolution pixels: the SVG's viewBox is the photo's real size, whatever the preview's.
 */
export function RegionEditor({
  captureSetId,
  photo,
  initial,
  canWrite,
  detectedGhost = null,
}: {
  captureSetId: string;
  photo: { id: string; width: number; height: number };
  initial: EditableRegion[];
  canWrite: boolean;
  detectedGhost?: DetectedGhost | null;
}) {
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

  const handle = handleSize(W);
  const stroke = strokeWidth(W);
  const get = (kind: RegionKind) => regions.find((r) => r.kind === kind) ?? null;
  const put = (r: EditableRegion) => {
    setRegions((all) => putRegion(all, r, W, H));
    setDirty(true);
    setNote(null);
  };

  const toPhoto = (e: React.PointerEvent) => screenToPhoto(e.clientX, e.clientY, (svgRef.current as SVGSVGElement).getBoundingClientRect(), W, H);

  const onSvgDown = (e: React.PointerEvent<SVGSVGElement>) => {
    if (!canWrite) return;
    e.stopPropagation();
    (e.target as Element).setPointerCapture?.(e.pointerId);
    const p = toPhoto(e);
    const hit = hitTest(regions, p, active, handle);
    setActive(hit.kind);
    drag.current = { ...hit, start: p, orig: get(hit.kind) };
  };

  const onMove = (e: React.PointerEvent) => {
    const d = drag.current;
    if (!d) return;
    const next = dragRegion(d, toPhoto(e));
    if (next) put(next);
  };

  const onUp = () => {
    drag.current = null;
  };

  // arrows move the selected rectangle by one pixel (Shift: 10); with Alt they change its size
  const onKey = (e: React.KeyboardEvent) => {
    const r = get(active);
    if (!r || !canWrite) return;
    const next = nudgeRegion(r, e.key, { shift: e.shiftKey, alt: e.altKey });
    if (!next) return;
    e.preventDefault();
    put(next);
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

  const sel = get(active);
  // a ghost the reading detected (a marked one is drawn as a region already)
  const ghostOnPhoto = detectedGhost ? ghostRect(detectedGhost.screen, detectedGhost, W, H) : null;

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
            {ghostOnPhoto && detectedGhost ? (
              <g data-testid="detected-ghost" pointerEvents="none">
                <rect x={ghostOnPhoto.x} y={ghostOnPhoto.y} width={ghostOnPhoto.w} height={ghostOnPhoto.h} fill="none" stroke={COLOURS.ghost} strokeWidth={stroke} strokeDasharray={`${stroke * 2} ${stroke * 3}`} />
                <text x={ghostOnPhoto.x + stroke * 3} y={ghostOnPhoto.y + ghostOnPhoto.h - stroke * 3} fill={COLOURS.ghost} fontSize={stroke * 9}>
                  detected ghost
                </text>
              </g>
            ) : null}
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
      {detectedGhost ? (
        <p className="text-xs text-muted" data-testid="detected-ghost-note">
          <span className="font-semibold" style={{ color: COLOURS.ghost }}>
            Detected ghost
          </span>{' '}
          (dashed): the screen of the reading shown below, moved by ({fmt1(detectedGhost.dx)}, {fmt1(detectedGhost.dy)}) px, {(100 * detectedGhost.ratio).toFixed(2)}% of the display light
          {detectedGhost.snr !== null ? `, ${detectedGhost.snr.toFixed(1)} standard errors above the noise` : ''}.
          {ghostOnPhoto ? '' : ' It lies outside the photo.'} Mark a ghost region only to measure a different one.
        </p>
      ) : null}
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
