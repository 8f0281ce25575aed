// A target's condition: the lighting and pattern under which the team means it. Judged against
// each capture set's stated conditions; a capture set that does not state a value the condition
// bounds cannot be shown to meet it and is left out (docs/method.md §7).
import { formatIlluminance, formatLuminance } from '../format';

export type CapturePattern = 'full' | 'checkerboard' | 'slanted-edge' | 'orientation';

export type TargetCondition = {
  ambientLuxMin?: number;
  ambientLuxMax?: number;
  backgroundCdm2Min?: number;
  backgroundCdm2Max?: number;
  pattern?: CapturePattern;
};

/** What a capture set states about its shot. */
export type StatedConditions = { pattern: CapturePattern; ambientLux: number | null; backgroundCdm2: number | null };

const has = (v: number | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

export function isEmptyCondition(c: TargetCondition): boolean {
  return !has(c.ambientLuxMin) && !has(c.ambientLuxMax) && !has(c.backgroundCdm2Min) && !has(c.backgroundCdm2Max) && !c.pattern;
}

/** A stored condition with only the fields that make sense (anything else in the JSON is dropped). */
export function toCondition(raw: unknown): TargetCondition {
  const o = (raw && typeof raw === 'object' ? raw : {}) as Record<string, unknown>;
  const out: TargetCondition = {};
  for (const k of ['ambientLuxMin', 'ambientLuxMax', 'backgroundCdm2Min', 'backgroundCdm2Max'] as const) {
    const v = o[k];
    if (typeof v === 'number' && Number.isFinite(v)) out[k] = v;
  }
  if (o.pattern === 'full' || o.pattern === 'checkerboard' || o.pattern === 'slanted-edge' || o.pattern === 'orientation') out.pattern = o.pattern;
  return out;
}

function inRange(v: number | null, min: number | undefined, max: number | undefined): 'ok' | 'unstated' | 'out' {
  if (!has(min) && !has(max)) return 'ok';
  if (v === null || !Number.isFinite(v)) return 'unstated';
  if (has(min) && v < min) return 'out';
  if (has(max) && v > max) return 'out';
  return 'ok';
}

/** Whether a capture set's stated conditions meet the target's, and if not, why in a few words. */
export function meetsCondition(c: TargetCondition, s: StatedConditions | undefined): { ok: true } | { ok: false; why: string } {
  if (isEmptyCondition(c)) return { ok: true };
  if (!s) return { ok: false, why: 'conditions not stated' };
  if (c.pattern && s.pattern !== c.pattern) return { ok: false, why: `${PATTERN_WORDS[s.pattern]} pattern` };
  const lux = inRange(s.ambientLux, c.ambientLuxMin, c.ambientLuxMax);
  if (lux === 'unstated') return { ok: false, why: 'ambient illuminance not stated' };
  if (lux === 'out') return { ok: false, why: `ambient ${formatIlluminance(s.ambientLux)}` };
  const bg = inRange(s.backgroundCdm2, c.backgroundCdm2Min, c.backgroundCdm2Max);
  if (bg === 'unstated') return { ok: false, why: 'background luminance not stated' };
  if (bg === 'out') return { ok: false, why: `background ${formatLuminance(s.backgroundCdm2)}` };
  return { ok: true };
}

export const PATTERN_WORDS: Record<CapturePattern, string> = { full: 'full-white', checkerboard: 'checkerboard', 'slanted-edge': 'slanted-edge', orientation: 'orientation' };

function range(min: number | undefined, max: number | undefined, fmt: (v: number) => string): string | null {
  if (has(min) && has(max)) return `${fmt(min).replace(/ [^ ]+$/, '')}–${fmt(max)}`;
  if (has(min)) return `at least ${fmt(min)}`;
  if (has(max)) return `at most ${fmt(max)}`;
  return null;
}

/** "ambient 300–700 lx · background at least 1,000 cd/m² · full-white pattern"; '' without a condition. */
export function describeCondition(c: TargetCondition): string {
  const parts = [
    range(c.ambientLuxMin, c.ambientLuxMax, formatIlluminance),
    range(c.backgroundCdm2Min, c.backgroundCdm2Max, (v) => formatLuminance(v)),
    c.pattern ? `${PATTERN_WORDS[c.pattern]} pattern` : null,
  ];
  const [lux, bg, pattern] = parts;
  return [lux ? `ambient ${lux}` : null, bg ? `background ${bg}` : null, pattern].filter(Boolean).join(' · ');
}
