'use client';

import { useRouter } from 'next/navigation';
import { useCallback, useEffect, useState, useSyncExternalStore } from 'react';
import { PATTERN_KINDS, PATTERN_MAX_SIZE, PATTERN_MIN_SIZE, PATTERN_PRESETS, type PatternKind } from '@/lib/patterns';
import { PATTERN_INFO, patternUrl, showUrl } from './params';

const HINT_MS = 2600;

function subscribeRatio(onChange: () => void) {
  window.addEventListener('resize', onChange);
  return () => window.removeEventListener('resize', onChange);
}
const clampSide = (v: number) => Math.min(PATTERN_MAX_SIZE, Math.max(PATTERN_MIN_SIZE, Math.round(v)));

/**
 * The pattern alone on a black screen. One image pixel is drawn on one device pixel (the CSS
 * size is divided by the device pixel ratio), so a pattern made at the panel's resolution fills
 * it exactly without resampling.
 */
export function PatternShow({ initialKind, width, height }: { initialKind: PatternKind; width: number | null; height: number | null }) {
  const router = useRouter();
  const [kind, setKind] = useState<PatternKind>(initialKind);
  const [hint, setHint] = useState({ visible: true, tick: 0 });
  const ratio = useSyncExternalStore(subscribeRatio, () => window.devicePixelRatio || 1, () => 1);
  // Without a size in the address, the screen's own resolution is the best guess of the panel's.
  const screenSize = useSyncExternalStore(
    subscribeRatio,
    () => `${clampSide(window.screen.width * (window.devicePixelRatio || 1))}x${clampSide(window.screen.height * (window.devicePixelRatio || 1))}`,
    () => '',
  );
  const [sw, sh] = screenSize ? screenSize.split('x').map(Number) : [null, null];
  const w = width ?? sw ?? null;
  const h = height ?? sh ?? null;

  useEffect(() => {
    const t = window.setTimeout(() => setHint((s) => ({ ...s, visible: false })), HINT_MS);
    return () => window.clearTimeout(t);
  }, [hint.tick]);

  useEffect(() => {
    if (!w || !h) return;
    // Warm the neighbours so stepping does not flash black while the next PNG loads.
    const i = PATTERN_KINDS.indexOf(kind);
    for (const d of [1, -1]) {
      const next = PATTERN_KINDS[(i + d + PATTERN_KINDS.length) % PATTERN_KINDS.length];
      if (next) new Image().src = patternUrl(next, w, h);
    }
  }, [kind, w, h]);

  const step = useCallback(
    (delta: number) => {
      const i = PATTERN_KINDS.indexOf(kind);
      const next = PATTERN_KINDS[(i + delta + PATTERN_KINDS.length) % PATTERN_KINDS.length] ?? kind;
      setKind(next);
      setHint((s) => ({ visible: true, tick: s.tick + 1 }));
      if (w && h) window.history.replaceState(null, '', showUrl(next, w, h));
    },
    [kind, w, h],
  );

  const leave = useCallback(() => {
    if (document.fullscreenElement) void document.exitFullscreen().catch(() => undefined);
    const q = new URLSearchParams({ kind });
    const preset = PATTERN_PRESETS.find((p) => p.width === w && p.height === h);
    if (preset) q.set('preset', preset.id);
    else if (w && h) {
      q.set('preset', 'custom');
      q.set('width', String(w));
      q.set('height', String(h));
    }
    router.push(`/patterns?${q.toString()}`);
  }, [kind, w, h, router]);

  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (e.altKey || e.ctrlKey || e.metaKey) return;
      if (e.key === 'ArrowRight' || e.key === ' ' || e.key === 'PageDown') {
        e.preventDefault();
        step(1);
      } else if (e.key === 'ArrowLeft' || e.key === 'PageUp') {
        e.preventDefault();
        step(-1);
      } else if (e.key === 'f' || e.key === 'F') {
        e.preventDefault();
        if (document.fullscreenElement) void document.exitFullscreen().catch(() => undefined);
        else void document.documentElement.requestFullscreen().catch(() => undefined);
      } else if (e.key === 'Escape' || e.key === 'q' || e.key === 'Q') {
        e.preventDefault();
        leave();
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [step, leave]);

  return (
    <div data-testid="pattern-show" data-kind={kind} className="fixed inset-0 flex cursor-none items-center justify-center overflow-hidden bg-black select-none">
      {w && h ? (
        // eslint-disable-next-line @next/next/no-img-element -- exact pixels matter: no resampling, no optimiser
        <img
          data-testid="pattern-image"
          src={patternUrl(kind, w, h)}
          alt={PATTERN_INFO[kind].name}
          width={w}
          height={h}
          draggable={false}
          style={{ width: w / ratio, height: h / ratio, maxWidth: 'none', imageRendering: 'pixelated' }}
        />
      ) : null}
      <div
        data-testid="show-hint"
        aria-live="polite"
        className={`pointer-events-none fixed bottom-6 left-1/2 -translate-x-1/2 rounded-md bg-neutral-900/85 px-4 py-2 text-center text-sm text-neutral-200 transition-opacity duration-700 ${hint.visible ? 'opacity-100' : 'opacity-0'}`}
      >
        <div className="font-medium">
          {PATTERN_INFO[kind].name}
          {w && h ? ` · ${w} × ${h}` : ''}
        </div>
        <div className="text-xs text-neutral-400">← → or space: next pattern · F: fullscreen · Esc or Q: back</div>
      </div>
    </div>
  );
}
