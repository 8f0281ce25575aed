import { describe, expect, it } from 'vitest';
import { renderPattern, slantedEdgeLayout, SLANTED_EDGE_ANGLE_DEG } from '@/lib/patterns';
import { decodeSrgb } from '@/lib/patterns/srgb';
import { slantedEdgeMtf, transposePlane } from '@/lib/photometry/sharpness';
import type { Plane } from '@/lib/photometry/types';

/** Linear light of a crop of the pattern's red channel. */
function crop(kind: 'slanted-edge', w: number, h: number, x0: number, y0: number, cw: number, ch: number): Plane {
  const img = renderPattern(kind, w, h);
  const data = new Float32Array(cw * ch);
  for (let y = 0; y < ch; y++) for (let x = 0; x < cw; x++) data[y * cw + x] = decodeSrgb((img.data[((y0 + y) * w + x0 + x) * 3] as number) / 255);
  return { data, width: cw, height: ch };
}

describe('slanted-edge pattern', () => {
  it('is white around a dark square of half the shorter side, centred', () => {
    const img = renderPattern('slanted-edge', 640, 400);
    const at = (x: number, y: number): number => img.data[(y * 640 + x) * 3] as number;
    expect(at(5, 5)).toBe(255);
    expect(at(320, 200)).toBe(0);
    expect(at(320 - 60, 200)).toBe(0);
    expect(at(320 - 120, 200)).toBe(255);
    expect(slantedEdgeLayout(640, 400)).toMatchObject({ side: 200, cx: 320, cy: 200 });
  });

  it('draws its edges turned 5° and sharp to the pixel (the slanted-edge reading of the pattern itself)', () => {
    const { cx, cy, side } = slantedEdgeLayout(1280, 720);
    // the left side of the square, its middle 60%
    const x0 = Math.round(cx - side / 2 - 40);
    const y0 = Math.round(cy - 0.3 * side);
    const r = slantedEdgeMtf(crop('slanted-edge', 1280, 720, x0, y0, 80, Math.round(0.6 * side)));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // the square turns counter-clockwise on screen (y down): its left side leans with x falling as y grows
    expect(Math.abs(Math.abs(r.edge.angleDeg) - SLANTED_EDGE_ANGLE_DEG)).toBeLessThan(0.05);
    // an area-sampled ideal edge: the pixel aperture alone, MTF sinc(f), MTF50 ≈ 0.603 cycles/px (derived)
    expect(r.edge.mtf50).toBeGreaterThan(0.55);
    // the top side, read after turning the crop
    const top = slantedEdgeMtf(transposePlane(crop('slanted-edge', 1280, 720, Math.round(cx - 0.3 * side), Math.round(cy - side / 2 - 40), Math.round(0.6 * side), 80)));
    expect(top.ok && Math.abs(Math.abs(top.edge.angleDeg) - SLANTED_EDGE_ANGLE_DEG)).toBeLessThan(0.05);
  });
});
