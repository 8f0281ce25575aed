import { describe, expect, it } from 'vitest';
import { fromDraft, toDraft } from '../../../components/stack/planner-model';
import { degreesPerPixelSchema } from '../../../lib/schemas/camera-profile';
import { displayElementSchema } from '../../../lib/schemas/stack';

const display = { kind: 'display' as const, luminance: 1200, polarisation: { kind: 'none' as const } };

describe('display element: resolution and white point', () => {
  it('keeps an optional resolution and white point through the form and the schema', () => {
    const e = { ...display, resolution: { width: 1920, height: 1080 }, white: { x: 0.2831, y: 0.2971 } };
    const back = displayElementSchema.parse(fromDraft(toDraft(e)));
    expect(back).toEqual(e);
    // both boxes of a pair empty: the field is left out
    const bare = displayElementSchema.parse(fromDraft(toDraft(display)));
    expect(bare.resolution).toBeUndefined();
    expect(bare.white).toBeUndefined();
  });

  it('refuses half a resolution, fractional pixels and a white point off the chromaticity diagram, each with a message', () => {
    const draft = toDraft(display);
    const half = displayElementSchema.safeParse(fromDraft({ ...draft, values: { ...draft.values, resWidth: '1920', resHeight: '' } }));
    expect(half.success).toBe(false);
    expect(JSON.stringify(half.error?.issues)).toMatch(/height/);
    expect(displayElementSchema.safeParse({ ...display, resolution: { width: 1920.5, height: 1080 } }).success).toBe(false);
    const white = displayElementSchema.safeParse({ ...display, white: { x: 0.6, y: 0.5 } });
    expect(white.success).toBe(false);
    expect(white.error?.issues[0]?.message).toMatch(/x \+ y/);
  });
});

describe('camera profile degrees per pixel', () => {
  it('reads a typed angle, clears on a blank and refuses angles no lens gives', () => {
    expect(degreesPerPixelSchema.parse({ degreesPerPixel: '0.0125' }).degreesPerPixel).toBe(0.0125);
    expect(degreesPerPixelSchema.parse({ degreesPerPixel: '' }).degreesPerPixel).toBeUndefined();
    expect(degreesPerPixelSchema.parse({ degreesPerPixel: null }).degreesPerPixel).toBeUndefined();
    expect(degreesPerPixelSchema.safeParse({ degreesPerPixel: '2' }).success).toBe(false);
    expect(degreesPerPixelSchema.safeParse({ degreesPerPixel: '0x10' }).success).toBe(false);
  });
});

describe('display optics from a stored stack', () => {
  it('takes the resolution and white of the display element, and nothing from a stack without a valid one', async () => {
    const { displayOpticsOf } = await import('../../../lib/schemas/stack');
    const stack = { elements: [{ ...display, resolution: { width: 1280, height: 720 }, white: { x: 0.3, y: 0.31 } }, { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.6 }] };
    expect(displayOpticsOf(stack)).toEqual({ displayResolution: { width: 1280, height: 720 }, displayWhite: { x: 0.3, y: 0.31 } });
    expect(displayOpticsOf({ elements: [display] })).toEqual({ displayResolution: null, displayWhite: null });
    expect(displayOpticsOf(null)).toEqual({ displayResolution: null, displayWhite: null });
    expect(displayOpticsOf({ elements: [{ ...display, luminance: -1, resolution: { width: 1280, height: 720 } }] })).toEqual({ displayResolution: null, displayWhite: null });
  });
});
