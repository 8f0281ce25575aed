import type { Stack, StackElement } from '../schemas/stack';
import { assertFraction } from './assert';
import { detectLayout, reflectionCount, type StackLayout } from './layout';
import { type ChainElement, linearLight, throughChain, unpolarisedLight } from './light';

/** Birdbath display efficiency η = R_bs·R_c·T_bs: reflect off the splitter, off the combiner, back through the splitter. */
export function birdbathDisplayEfficiency(Rbs: number, Tbs: number, Rc: number): number {
  // Source: birdbath optical budget, docs/references.md (common practice; values derived).
  assertFraction('Rbs', Rbs);
  assertFraction('Tbs', Tbs);
  assertFraction('Rc', Rc);
  return Rbs * Rc * Tbs;
}

/** Birdbath see-through transmission τ = T_c·T_bs: the world crosses the combiner, then the splitter. */
export function birdbathSeeThrough(Tbs: number, Tc: number): number {
  // Source: birdbath optical budget, docs/references.md (common practice; values derived).
  assertFraction('Tbs', Tbs);
  assertFraction('Tc', Tc);
  return Tc * Tbs;
}

/** Predicted light budget of a stack. */
export interface StackBudget {
  layout: StackLayout;
  /** Reflections on the display's path (odd: mirrored image). */
  reflections: number;
  /** Efficiency of the reflecting parts alone: R_bs·R_c·T_bs (birdbath) or R (single combiner). */
  etaReflectors: number;
  /** Whole display efficiency η: reflecting parts and every other element on the display's path, polarisation included. */
  eta: number;
  /** See-through transmission τ for unpolarised world light. */
  tau: number;
  /** Display luminance at the eye, η·L_display, in cd/m². */
  displayAtEye: number;
}

function asChain(e: StackElement): ChainElement | null {
  switch (e.kind) {
    case 'linear-polariser':
      return { kind: 'polariser', T1: e.T1, T2: e.T2, axisDeg: e.axisDeg };
    case 'neutral-filter':
    case 'magnifier':
      return { kind: 'neutral', T: e.T };
    default:
      return null;
  }
}

const isWorldOnly = (e: StackElement) =>
  (e.kind === 'linear-polariser' || e.kind === 'neutral-filter') && e.worldOnly === true;

/**
 * Display efficiency η and see-through transmission τ of a validated stack. Elements are listed
 * in the order the display's light meets them. The display's light crosses everything except
 * world-only parts; the world's light enters through the outermost reflector (the combiner in a
 * birdbath) and crosses everything after it, plus the splitter on its way back in a birdbath.
 * Parts listed between a birdbath's splitter and combiner are crossed twice by the display's
 * light. Polarisation angles are all in the viewer's frame, so reflections do not rotate them.
 */
export function stackBudget(stack: Stack): StackBudget {
  const layout = detectLayout(stack);
  const els = stack.elements;
  const display = els[0];
  if (display?.kind !== 'display') throw new RangeError('The display must be the first element');

  const displayChain: ChainElement[] = [];
  const worldChain: ChainElement[] = [];
  let etaReflectors: number;

  const worldOnly = els.filter(isWorldOnly).map(asChain).filter((c): c is ChainElement => c !== null);
  // World-only parts sit outside the combiner, so the world crosses them first.
  worldChain.push(...worldOnly);

  if (layout.kind === 'single-combiner') {
    const r = els[layout.reflectorIndex];
    if (r?.kind !== 'plate-beam-splitter' && r?.kind !== 'combiner') throw new RangeError('No reflector found');
    // Source: single combiner, η = R and τ = T (docs/references.md budget notes, common practice).
    etaReflectors = r.R;
    worldChain.push({ kind: 'neutral', T: r.T });
    els.forEach((e, i) => {
      if (isWorldOnly(e)) return;
      const c = asChain(e);
      if (!c) return;
      displayChain.push(c);
      if (i > layout.reflectorIndex) worldChain.push(c);
    });
    // A scalar R commutes with every polariser matrix, so it may be applied last.
    displayChain.push({ kind: 'neutral', T: r.R });
  } else {
    const bs = els[layout.splitterIndex];
    const cb = els[layout.combinerIndex];
    if (bs?.kind !== 'plate-beam-splitter' || cb?.kind !== 'combiner') throw new RangeError('No birdbath found');
    etaReflectors = birdbathDisplayEfficiency(bs.R, bs.T, cb.R);
    const before: ChainElement[] = [];
    const between: ChainElement[] = [];
    const after: ChainElement[] = [];
    els.forEach((e, i) => {
      if (isWorldOnly(e)) return;
      const c = asChain(e);
      if (!c) return;
      if (i < layout.splitterIndex) before.push(c);
      else if (i < layout.combinerIndex) between.push(c);
      else after.push(c);
    });
    displayChain.push(
      ...before,
      { kind: 'neutral', T: bs.R },
      ...between,
      { kind: 'neutral', T: cb.R },
      ...[...between].reverse(),
      { kind: 'neutral', T: bs.T },
      ...after,
    );
    worldChain.push({ kind: 'neutral', T: cb.T }, ...[...between].reverse(), { kind: 'neutral', T: bs.T }, ...after);
  }

  const source =
    display.polarisation.kind === 'linear' ? linearLight(1, display.polarisation.angleDeg) : unpolarisedLight(1);
  const eta = throughChain(source, displayChain).s0;
  const tau = throughChain(unpolarisedLight(1), worldChain).s0;
  return {
    layout,
    reflections: reflectionCount(layout),
    etaReflectors,
    eta,
    tau,
    displayAtEye: eta * display.luminance,
  };
}
