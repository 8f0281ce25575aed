'use client';

import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useCallback, useEffect, useLayoutEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { ApiRequestError } from '@/lib/hooks/api';
import { useApplyTemplate, useDetectScreen, useSaveRegions, useSaveTemplate, useTemplates, type EditableRegion } from '@/lib/hooks/use-regions';
import { REGION_KINDS, regionsOutside, type RegionKind } from '@/lib/schemas/region';
import { useRegionDraft, type FlushResult } from './region-editor-draft';
import {
  applyDrag,
  checkDraft,
  cursorFor,
  dashArray,
  draftChanged,
  draftOf,
  dragHint,
  ghostRect,
  drawingUnits,
  hitTest,
  KEY_HINT,
  keyAction,
  putRegion,
  RECT_FIELDS,
  REGION_STYLE,
  sameRegions,
  screenToPhoto,
  toolTarget,
  TOOLS,
  type Drag,
  type Hit,
  type KeyMode,
  type Rect,
  type RectDraft,
  type RectField,
  type Tool,
} from './region-editor-model';

const ZOOMS = [1, 2, 4, 8];
const FIELD_TEXT: Record<RectField, string> = { x: 'x', y: 'y', w: 'width', h: 'height' };
const UNMARKED: Record<RegionKind, string> = {
  screen: 'not marked: the worker will detect it',
  background: 'not marked: transmission is taken over the screen',
  ghost: 'not marked: the worker looks for one',
};
// a drawing shorter than this many screen pixels on both axes is a click, not a rectangle
const MIN_DRAW_SCREEN_PX = 4;

/** The ghost the shown reading detected: its offset from the screen that reading measured. */
export type DetectedGhost = { screen: Rect; dx: number; dy: number; ratio: number; snr: number | null };

const fmt1 = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));

/** A short line in a kind's colour and dash pattern, on black as on the photo: the legend's key. */
export function RegionSwatch({ kind }: { kind: RegionKind }) {
  const s = REGION_STYLE[kind];
  return (
    <svg width="30" height="12" viewBox="0 0 30 12" aria-hidden="true" className="inline-block shrink-0 rounded-sm bg-black align-middle" data-pattern={s.pattern}>
      <line x1="3" y1="6" x2="27" y2="6" stroke={s.colour} strokeWidth="2.5" strokeDasharray={dashArray(s.pattern, 2.5)} />
    </svg>
  );
}

/**
 * The on photo's preview with the screen, background and ghost rectangles. Everything is kept in
 * full-resolution pixels: the SVG's viewBox is the photo's real size, whatever the preview's.
 * The chosen tool decides what a drag does (`hitTest`), and the line above the photo says it.
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
  const [saved, setSaved] = useState<EditableRegion[]>(initial);
  const [tool, setTool] = useState<Tool>(() => (initial.some((r) => r.kind === 'screen') ? 'select' : 'screen'));
  const [selected, setSelected] = useState<RegionKind | null>(() => (initial.some((r) => r.kind === 'screen') ? 'screen' : null));
  const [keyMode, setKeyMode] = useState<KeyMode>('move');
  const [hover, setHover] = useState<Hit | null>(null);
  const [zoom, setZoom] = useState(1);
  const [drafts, setDrafts] = useState<Partial<Record<RegionKind, RectDraft>>>({});
  const [draftErrors, setDraftErrors] = useState<Partial<Record<RegionKind, Partial<Record<RectField, string>>>>>({});
  const [note, setNote] = useState<{ tone: 'ok' | 'bad'; text: string } | null>(null);
  const [templateName, setTemplateName] = useState('');
  const svgRef = useRef<SVGSVGElement>(null);
  const canvasRef = useRef<HTMLDivElement>(null);
  const drag = useRef<(Drag & { before: EditableRegion[]; minDraw: number }) | null>(null);
  const { mutateAsync: saveRegions, isPending: saving } = useSaveRegions(captureSetId);
  const detect = useDetectScreen(captureSetId);
  const templates = useTemplates(captureSetId);
  const saveTemplate = useSaveTemplate(captureSetId);
  const applyTemplate = useApplyTemplate(captureSetId);
  const draft = useRegionDraft();

  // sizes on the drawing follow the width it is shown at (page width, zoom)
  const [shownWidth, setShownWidth] = useState(0);
  useEffect(() => {
    const el = svgRef.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver((entries) => setShownWidth(entries[0]?.contentRect.width ?? 0));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  const { handle, stroke, font } = drawingUnits(W, shownWidth);
  const get = (kind: RegionKind) => regions.find((r) => r.kind === kind) ?? null;
  const target = toolTarget(tool, selected);
  const pendingKinds = REGION_KINDS.filter((k) => drafts[k] && draftChanged(drafts[k] as RectDraft, get(k)));
  const unsaved = !sameRegions(regions, saved) || pendingKinds.length > 0;

  // the page's Analyse button saves what is shown here first
  const latest = useRef({ regions, saved, drafts });
  useLayoutEffect(() => {
    latest.current = { regions, saved, drafts };
  }, [regions, saved, drafts]);
  useEffect(() => {
    draft?.setUnsaved(unsaved);
  }, [draft, unsaved]);

  const change = (next: EditableRegion[]) => {
    setRegions(next);
    setNote(null);
  };

  const toPhoto = (e: React.PointerEvent) => screenToPhoto(e.clientX, e.clientY, (svgRef.current as SVGSVGElement).getBoundingClientRect(), W, H);

  const onDown = (e: React.PointerEvent<SVGSVGElement>) => {
    if (!canWrite || e.button !== 0) return;
    // no text selection or image drag; the keys then act on the photo (Escape cancels this drag)
    e.preventDefault();
    canvasRef.current?.focus({ preventScroll: true });
    e.currentTarget.setPointerCapture?.(e.pointerId);
    const p = toPhoto(e);
    const hit = hitTest(regions, p, tool, handle, selected);
    if (hit.mode === 'none') {
      setSelected(null);
      return;
    }
    if (tool === 'select') setSelected(hit.kind);
    const box = (svgRef.current as SVGSVGElement).getBoundingClientRect();
    const minDraw = box.width > 0 ? (MIN_DRAW_SCREEN_PX * W) / box.width : 0;
    drag.current = { ...hit, start: p, orig: get(hit.kind), before: regions, minDraw };
  };

  const onMove = (e: React.PointerEvent) => {
    const p = toPhoto(e);
    const d = drag.current;
    if (!d) {
      if (canWrite) setHover(hitTest(regions, p, tool, handle, selected));
      return;
    }
    change(applyDrag(regions, d, p, W, H, d.minDraw));
  };

  const onUp = () => {
    drag.current = null;
  };

  const onKey = (e: React.KeyboardEvent) => {
    if (!canWrite) return;
    const a = keyAction(e, target ? get(target) : null, keyMode, W, H);
    if (!a) return;
    e.preventDefault();
    if (a.type === 'toggle-mode') setKeyMode((m) => (m === 'move' ? 'resize' : 'move'));
    else if (a.type === 'cancel') {
      if (drag.current) change(drag.current.before);
      drag.current = null;
    } else change(putRegion(regions, a.region, W, H, keyMode === 'move' ? 'move' : 'crop'));
  };

  const pickTool = (t: Tool) => {
    setTool(t);
    if (t !== 'select') setSelected(t);
    setHover(null);
  };

  // typed values: kept as text while typed, applied on Enter or when the focus leaves the region's fields
  const typeField = (kind: RegionKind, f: RectField, value: string) => {
    setDrafts((all) => ({ ...all, [kind]: { ...(all[kind] ?? draftOf(get(kind))), [f]: value } }));
    setDraftErrors((all) => ({ ...all, [kind]: { ...all[kind], [f]: undefined } }));
  };

  const commitDraft = (kind: RegionKind) => {
    const d = drafts[kind];
    if (!d || !draftChanged(d, get(kind))) {
      setDrafts((all) => ({ ...all, [kind]: undefined }));
      setDraftErrors((all) => ({ ...all, [kind]: undefined }));
      return;
    }
    const c = checkDraft(d, W, H);
    if (!c.ok) {
      setDraftErrors((all) => ({ ...all, [kind]: c.errors }));
      return;
    }
    change(putRegion(regions, { ...c.rect, kind, source: 'marked' }, W, H, 'crop'));
    setDrafts((all) => ({ ...all, [kind]: undefined }));
    setDraftErrors((all) => ({ ...all, [kind]: undefined }));
    if (tool === 'select') setSelected(kind);
  };

  const storeRegions = useCallback(
    async (next: EditableRegion[]): Promise<FlushResult> => {
      try {
        const out = await saveRegions(next);
        setRegions(out.regions);
        setSaved(out.regions);
        setDrafts({});
        setDraftErrors({});
        setNote({ tone: 'ok', text: 'Regions saved' });
        router.refresh();
        return { ok: true, saved: true };
      } catch (e) {
        const fields = e instanceof ApiRequestError && e.fieldErrors ? Object.values(e.fieldErrors).flat() : [];
        const text = [(e as Error).message, ...fields].join(': ');
        setNote({ tone: 'bad', text: `The regions were not saved. ${text}` });
        return { ok: false, message: text };
      }
    },
    [saveRegions, router],
  );

  /** Saves every edit shown, typed values not yet applied included; refuses when a typed value is wrong. */
  const flush = useCallback(async (): Promise<FlushResult> => {
    const { regions: shown, saved: stored, drafts: typed } = latest.current;
    let next = shown;
    for (const kind of REGION_KINDS) {
      const d = typed[kind];
      const current = shown.find((r) => r.kind === kind) ?? null;
      if (!d || !draftChanged(d, current)) continue;
      const c = checkDraft(d, W, H);
      if (!c.ok) {
        setDraftErrors((all) => ({ ...all, [kind]: c.errors }));
        const first = Object.values(c.errors)[0] ?? 'a value is not valid';
        return { ok: false, message: `The typed ${REGION_STYLE[kind].name.toLowerCase()} values are not valid: ${first}` };
      }
      next = putRegion(next, { ...c.rect, kind, source: 'marked' }, W, H, 'crop');
    }
    if (sameRegions(next, stored)) return { ok: true, saved: false };
    setRegions(next);
    return storeRegions(next);
  }, [W, H, storeRegions]);

  useEffect(() => {
    if (!draft || !canWrite) return;
    draft.register(flush);
    return () => draft.register(null);
  }, [draft, flush, canWrite]);

  const doDetect = async () => {
    try {
      const { screen } = await detect.mutateAsync();
      change(putRegion(regions, { ...screen, kind: 'screen', source: 'detected' }, W, H));
      pickTool('screen');
      setNote({ tone: 'ok', text: `Screen found at ${screen.x}, ${screen.y}, ${screen.w} × ${screen.h} px: check it, then save` });
    } catch (e) {
      setNote({ tone: 'bad', text: (e as Error).message });
    }
  };

  const sel = target ? get(target) : null;
  // a ghost the reading detected (a marked one is drawn as a region already)
  const ghostOnPhoto = detectedGhost ? ghostRect(detectedGhost.screen, detectedGhost, W, H) : null;
  const hint = hover
    ? dragHint(hover, regions)
    : tool === 'select'
      ? 'Select: drag a rectangle to move it, a corner of the selected one to resize it.'
      : `${REGION_STYLE[tool].name} tool: drag anywhere, also over another rectangle, to draw the ${tool}; drag inside the ${tool} to move it, a corner to resize it.`;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Region tools">
        {canWrite
          ? TOOLS.map((t) => (
              <button
                key={t}
                type="button"
                onClick={() => pickTool(t)}
                aria-pressed={tool === t}
                data-tool={t}
                className={clsx('inline-flex items-center gap-1.5 rounded-md border px-2.5 py-1 text-xs', tool === t ? 'border-beam bg-beam/15 text-ink' : 'border-line text-muted hover:text-ink')}
              >
                {t === 'select' ? (
                  'Select / move'
                ) : (
                  <>
                    {REGION_STYLE[t].name}
                    <RegionSwatch kind={t} />
                    {get(t) ? '' : ' (none)'}
                  </>
                )}
              </button>
            ))
          : null}
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
            {sel && target ? (
              <Button
                type="button"
                tone="quiet"
                onClick={() => {
                  change(regions.filter((r) => r.kind !== target));
                  setDrafts((all) => ({ ...all, [target]: undefined }));
                }}
              >
                Remove {REGION_STYLE[target].name.toLowerCase()}
              </Button>
            ) : null}
            <Button
              type="button"
              onClick={async () => {
                const out = await flush();
                if (!out.ok) setNote({ tone: 'bad', text: `The regions were not saved. ${out.message}` });
              }}
              disabled={saving || !unsaved}
            >
              {saving ? 'Saving…' : unsaved ? 'Save regions' : 'Saved'}
            </Button>
          </>
        ) : null}
      </div>

      {canWrite ? (
        <div className="flex flex-wrap items-center justify-between gap-2 text-xs">
          <p className="text-ink" data-testid="drag-hint">
            {hint}
          </p>
          <div className="flex items-center gap-1" role="group" aria-label="Arrow keys">
            <span className="text-muted">Arrow keys (R):</span>
            {(['move', 'resize'] as const).map((m) => (
              <button key={m} type="button" onClick={() => setKeyMode(m)} aria-pressed={keyMode === m} className={clsx('rounded px-2 py-0.5', keyMode === m ? 'bg-raised text-ink' : 'text-muted hover:text-ink')}>
                {m === 'move' ? 'Move' : 'Resize'}
              </button>
            ))}
          </div>
        </div>
      ) : null}

      <div
        ref={canvasRef}
        className="max-h-[70vh] overflow-auto rounded-md border border-line bg-black outline-none focus-visible:ring-2 focus-visible:ring-beam"
        tabIndex={0}
        onKeyDown={onKey}
        aria-label={`On photo, ${W} × ${H} pixels. ${canWrite ? KEY_HINT : ''}`}
        data-testid="region-canvas"
      >
        <div className="relative" style={{ width: `${zoom * 100}%` }}>
          {/* eslint-disable-next-line @next/next/no-img-element -- a private, session-bound preview; next/image would cache it publicly */}
          <img src={`/api/captures/${captureSetId}/photos/${photo.id}/preview`} alt="On photo preview" className="block w-full select-none" draggable={false} />
          <svg
            ref={svgRef}
            viewBox={`0 0 ${W} ${H}`}
            preserveAspectRatio="none"
            className="absolute inset-0 h-full w-full touch-none"
            style={{ cursor: canWrite ? cursorFor(hover ?? (tool === 'select' ? { mode: 'none', kind: null } : { mode: 'draw', kind: tool })) : undefined }}
            onPointerDown={onDown}
            onPointerMove={onMove}
            onPointerUp={onUp}
            onPointerCancel={onUp}
            onPointerLeave={() => setHover(null)}
            data-testid="region-svg"
            data-tool={tool}
          >
            {ghostOnPhoto && detectedGhost ? (
              <g data-testid="detected-ghost" pointerEvents="none">
                <rect x={ghostOnPhoto.x} y={ghostOnPhoto.y} width={ghostOnPhoto.w} height={ghostOnPhoto.h} fill="none" stroke={REGION_STYLE.ghost.colour} strokeWidth={stroke} strokeDasharray={`${stroke * 4} ${stroke * 2} ${stroke} ${stroke * 2}`} />
                <text
                  x={ghostOnPhoto.x + ghostOnPhoto.w}
                  y={ghostOnPhoto.y + ghostOnPhoto.h + font * 1.1 <= H ? ghostOnPhoto.y + ghostOnPhoto.h + font * 1.1 : ghostOnPhoto.y + ghostOnPhoto.h - stroke * 2}
                  textAnchor="end"
                  fill={REGION_STYLE.ghost.colour}
                  stroke="black"
                  strokeWidth={stroke}
                  paintOrder="stroke"
                  fontSize={font}
                >
                  detected ghost
                </text>
              </g>
            ) : null}
            {regions.map((r) => {
              const s = REGION_STYLE[r.kind];
              const on = r.kind === target;
              const w = on ? stroke * 1.5 : stroke;
              // labels at different corners, since a ghost nearly covers the screen
              const atEnd = r.kind === 'ghost';
              return (
                <g key={r.kind} data-testid={`region-${r.kind}`} pointerEvents="none">
                  <rect x={r.x} y={r.y} width={r.w} height={r.h} fill="none" stroke="black" strokeOpacity={0.6} strokeWidth={w * 2.5} />
                  <rect
                    x={r.x}
                    y={r.y}
                    width={r.w}
                    height={r.h}
                    fill={s.colour}
                    fillOpacity={on ? 0.14 : 0.05}
                    stroke={s.colour}
                    strokeWidth={w}
                    strokeDasharray={dashArray(s.pattern, w)}
                    data-kind={r.kind}
                    data-pattern={s.pattern}
                    data-testid={`rect-${r.kind}`}
                  />
                  <text
                    x={atEnd ? r.x + r.w - stroke * 3 : r.x + stroke * 3}
                    y={atEnd ? r.y + r.h - stroke * 3 : r.y + stroke * 2 + font}
                    textAnchor={atEnd ? 'end' : 'start'}
                    fill={s.colour}
                    stroke="black"
                    strokeWidth={stroke}
                    paintOrder="stroke"
                    fontSize={font}
                    fontWeight={600}
                    data-testid={`label-${r.kind}`}
                  >
                    {s.name}
                    {r.source === 'marked' ? '' : ` (${r.source})`}
                  </text>
                  {canWrite && on
                    ? (['nw', 'ne', 'sw', 'se'] as const).map((c) => (
                        <rect
                          key={c}
                          x={(c.endsWith('w') ? r.x : r.x + r.w) - handle / 2}
                          y={(c.startsWith('n') ? r.y : r.y + r.h) - handle / 2}
                          width={handle}
                          height={handle}
                          fill="black"
                          stroke={s.colour}
                          strokeWidth={stroke}
                          data-corner={c}
                        />
                      ))
                    : null}
                </g>
              );
            })}
          </svg>
        </div>
      </div>
      {canWrite ? <p className="text-xs text-muted">{KEY_HINT}</p> : null}

      <div className="grid gap-2 text-xs lg:grid-cols-3" aria-label="Regions, in the photo’s pixels">
        {REGION_KINDS.map((k) => {
          const r = get(k);
          const s = REGION_STYLE[k];
          const d = drafts[k] ?? draftOf(r);
          const errs = draftErrors[k] ?? {};
          return (
            <div
              key={k}
              className={clsx('rounded border px-2 py-1.5', k === target ? 'border-beam/60' : 'border-line')}
              data-testid={`coords-${k}`}
              onBlur={(e) => {
                if (canWrite && !e.currentTarget.contains(e.relatedTarget as Node | null)) commitDraft(k);
              }}
            >
              <div className="flex flex-wrap items-center gap-2">
                <RegionSwatch kind={k} />
                <span className="font-semibold text-ink">{s.name}</span>
                <span className="text-muted">
                  {s.colourName}, {s.pattern}
                </span>
                {r ? <span className="text-muted">({r.source})</span> : null}
              </div>
              {canWrite ? (
                <div className="mt-1.5 grid grid-cols-4 gap-1.5">
                  {RECT_FIELDS.map((f) => (
                    <label key={f} className="block">
                      <span className="block text-[10px] uppercase tracking-wider text-muted">{f}</span>
                      <input
                        type="number"
                        inputMode="numeric"
                        step={1}
                        min={f === 'w' || f === 'h' ? 1 : 0}
                        max={f === 'x' ? W - 1 : f === 'y' ? H - 1 : f === 'w' ? W : H}
                        value={d[f]}
                        aria-label={`${s.name} ${FIELD_TEXT[f]} (px)`}
                        aria-invalid={errs[f] ? true : undefined}
                        aria-describedby={errs[f] ? `${captureSetId}-${k}-${f}-err` : undefined}
                        onChange={(e) => typeField(k, f, e.target.value)}
                        onKeyDown={(e) => {
                          if (e.key === 'Enter') {
                            e.preventDefault();
                            commitDraft(k);
                          }
                        }}
                        className={clsx('w-full rounded border bg-canvas px-1.5 py-0.5 font-mono text-ink', errs[f] ? 'border-fail' : 'border-line')}
                      />
                    </label>
                  ))}
                </div>
              ) : r ? (
                <div className="mt-1 font-mono text-ink">
                  x {r.x} · y {r.y} · {r.w} × {r.h} px
                </div>
              ) : null}
              {RECT_FIELDS.map((f) =>
                errs[f] ? (
                  <p key={f} id={`${captureSetId}-${k}-${f}-err`} role="alert" className="mt-1 text-fail">
                    {errs[f]}
                  </p>
                ) : null,
              )}
              {r ? null : <p className="mt-1 text-muted">{UNMARKED[k]}</p>}
            </div>
          );
        })}
      </div>
      {Object.values(regionsOutside(regions, W, H)).flat().map((m) => (
        // regions drawn on an earlier on photo of another size
        <p key={m} role="alert" className="text-sm text-fail" data-testid="region-outside">
          {m}: move or resize it, or type new values.
        </p>
      ))}
      {canWrite ? <p className="text-xs text-muted">Type a region’s x, y, width and height in the photo’s pixels (the photo is {W} × {H}); Enter or leaving its fields applies them.</p> : null}
      {detectedGhost ? (
        <p className="text-xs text-muted" data-testid="detected-ghost-note">
          <span className="font-semibold text-ink">Detected ghost</span> (dash-dot): the screen of the reading shown below, moved by ({fmt1(detectedGhost.dx)}, {fmt1(detectedGhost.dy)}) px, {(100 * detectedGhost.ratio).toFixed(2)}% of the display light
          {detectedGhost.snr !== null ? `, ${detectedGhost.snr.toFixed(1)} standard errors above the noise` : ''}.
          {ghostOnPhoto ? '' : ' It lies outside the photo.'} Mark a ghost region only to measure a different one.
        </p>
      ) : null}
      {note ? (
        <p role={note.tone === 'ok' ? 'status' : 'alert'} className={clsx('text-sm', note.tone === 'ok' ? 'text-pass' : 'text-fail')} data-testid="region-note">
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
            disabled={!templateName.trim() || saveTemplate.isPending || unsaved}
            title={unsaved ? 'Save the regions first' : undefined}
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
                    setSaved(out.regions);
                    setDrafts({});
                    setDraftErrors({});
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
