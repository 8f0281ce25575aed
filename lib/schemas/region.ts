import { z } from 'zod';
import { safe } from './common';

export const REGION_KINDS = ['screen', 'background', 'ghost'] as const;
export type RegionKind = (typeof REGION_KINDS)[number];
export const REGION_SOURCES = ['marked', 'detected', 'template'] as const;

const px = z.number({ message: 'Coordinates are numbers of pixels' }).int({ message: 'Coordinates are whole pixels' });

/** A rectangle in the on photo's full-resolution pixels. */
export const rectSchema = z.object({
  x: px.min(0, { message: 'The region starts left of the photo' }),
  y: px.min(0, { message: 'The region starts above the photo' }),
  w: px.min(1, { message: 'The region is empty: give it a width' }),
  h: px.min(1, { message: 'The region is empty: give it a height' }),
});
export type RectInput = z.infer<typeof rectSchema>;

export const regionSchema = rectSchema.extend({
  kind: z.enum(REGION_KINDS, { message: 'Region kind is screen, background or ghost' }),
  source: z.enum(REGION_SOURCES).default('marked'),
});
export type RegionInput = z.infer<typeof regionSchema>;

/** The whole set of a capture's regions, replacing what was there (kinds must not repeat). */
export const regionsPutSchema = z.object({
  regions: z
    .array(regionSchema)
    .max(3)
    .refine((rs) => new Set(rs.map((r) => r.kind)).size === rs.length, { message: 'Each kind of region may appear once' }),
});

export const templateSaveSchema = z.object({
  name: safe(z.string({ message: 'Name the template' }).trim().min(1, { message: 'Name the template' }).max(80, { message: 'Use at most 80 characters' })),
});
export const templateApplySchema = z.object({ templateId: z.string().uuid({ message: 'Pick a template' }) });

/** Regions must lie inside the photo; returns one message per region that does not. */
export function regionsOutside(regions: readonly RegionInput[], width: number, height: number): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const r of regions) {
    if (r.x + r.w > width || r.y + r.h > height) {
      out[r.kind] = [`The ${r.kind} region ${r.x},${r.y} ${r.w}×${r.h} reaches outside the ${width} × ${height} photo`];
    }
  }
  return out;
}
