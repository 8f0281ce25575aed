import { EngineInputError } from './errors';
import type { EngineWarning } from './result';
import type { PhotoRole, Rect } from './types';

/**
 * Plausibility guards (docs/method.md §5.8): a reading that cannot describe a lit display behind
 * optics is refused or flagged, each with what to do — never a confident number with no warning.
 */

/** Standard error of the mean display light over the screen, from the noise of D's block means. */
export function displayLightError(diffSigma: number, screen: Rect, factor: number): number {
  const blocks = Math.max(1, (screen.w * screen.h) / (factor * factor));
  return diffSigma / Math.sqrt(blocks);
}

/** Display light within this many standard errors of zero: the display looks off, the reading is refused. */
export const NO_LIGHT_SE = 3;
/** Display light below this many standard errors: flagged as weak. */
export const WEAK_LIGHT_SE = 10;
/** A ratio below 1 + this share is within reach of exposure and stray-light changes between the photos. */
export const RATIO_NEAR_ONE = 0.02;

/**
 * A screen with no display light above the noise: refused when `refuse` (nothing else to show),
 * else flagged (a marked screen: the reading is kept, with what to do). A weak one and a ratio near
 * 1 are flagged.
 */
export function checkDisplayLight(lOn: number, lOff: number, se: number, warnings: EngineWarning[], refuse = true): void {
  const light = lOn - lOff;
  if (!(light > NO_LIGHT_SE * se)) {
    const message = `the screen region is no brighter in the on photo than in the off photo (display light ${light.toExponential(2)} ± ${se.toExponential(2)}): the display looks off. Check that it shows the test pattern in the on photo and is dark in the off photo, that the screen region covers it, and that the exposure stayed fixed`;
    if (refuse) throw new EngineInputError('no-display-light', message);
    warnings.push({ code: 'display-off', message: `${message}; the figures below do not describe a display` });
    return;
  }
  if (light <= WEAK_LIGHT_SE * se) {
    warnings.push({ code: 'low-signal', message: 'the screen is barely brighter in the on photo than in the off photo: raise the display level or the exposure, and check the screen region' });
  }
  if (lOff > 0 && lOn / lOff < 1 + RATIO_NEAR_ONE) {
    warnings.push({ code: 'ratio-near-one', message: `the display adds only ${((100 * light) / lOff).toFixed(1)}% to the background it is seen against: a small change of exposure or room light between the photos would move the contrast as much; darken the room or raise the display level` });
  }
}

/** Uniformity over cells with no display light (or negative) means nothing: flagged, and the figure dropped. */
export function checkUniformityCells(cells: number[] | null, name: string, warnings: EngineWarning[]): boolean {
  if (!cells) return true;
  if (cells.every((c) => c > 0)) return true;
  warnings.push({ code: 'uniformity-invalid', message: `part of the screen region shows no display light in the ${name} measurement, so its uniformity is not given: mark the screen region over the lit display only, and check the display shows a full-white field` });
  return false;
}

/** A see-through transmission above 1 cannot come from passive optics: flagged with its likely cause. */
export function checkTransmission(transmission: number | null, backgroundMarked: boolean, warnings: EngineWarning[]): void {
  if (transmission === null || !(transmission > 1)) return;
  warnings.push({
    code: 'transmission-above-one',
    message: `the see-through transmission reads ${(100 * transmission).toFixed(1)}%: optics cannot pass more light than without them, so stray light (veil) from the display or the room adds to the off photo, or the light changed between the off and ambient photos. ${backgroundMarked ? 'Move the background region away from the display and its reflections' : 'Mark a background region away from the display'} and keep the room light steady`,
  });
}

/** Clipped on and off photos: the contrast ratio has neither end measured. */
export function checkBothClipped(byPhoto: Partial<Record<PhotoRole, number>>, warnings: EngineWarning[]): void {
  if ((byPhoto.on ?? 0) > 0.001 && (byPhoto.off ?? 0) > 0.001) {
    warnings.push({ code: 'both-clipped', message: 'both the on and the off photo are clipped in the analysed regions: the contrast ratio compares two clipped levels; lower the exposure until the off photo is well below full scale, and bracket the on photo' });
  }
}
