import { z } from 'zod';
import { isRawFormat } from '../image/raw-formats';
import { optionalStrictNumber, safe } from './common';

export const CAPTURE_PATTERNS = ['full', 'checkerboard', 'slanted-edge', 'orientation'] as const;
export type CapturePatternKey = (typeof CAPTURE_PATTERNS)[number];

/** How each pattern is named: in a sentence ("full-white pattern") and as a choice in a form. */
export const PATTERN_NAMES: Record<CapturePatternKey, { phrase: string; choice: string; short: string }> = {
  full: { phrase: 'full-white pattern', choice: 'Full-field white', short: 'full white' },
  checkerboard: { phrase: '4 × 4 checkerboard', choice: '4 × 4 checkerboard', short: 'checkerboard' },
  'slanted-edge': { phrase: 'slanted-edge pattern', choice: 'Slanted edge (sharpness)', short: 'slanted edge' },
  orientation: { phrase: 'orientation marker', choice: 'Orientation marker (handedness)', short: 'orientation' },
};

/**
 * How the set's 16-bit TIFFs are read: 'auto' lets each photo follow what its file says (see
 * lib/image/encoding.ts), 'linear' reads them as linear light (the CLI's --linear16), 'srgb' as
 * gamma-encoded. Photos that are not 16-bit TIFFs are always gamma-encoded.
 */
export const TIFF_ENCODINGS = ['auto', 'linear', 'srgb'] as const;
export type TiffEncodingSetting = (typeof TIFF_ENCODINGS)[number];
export const tiffEncodingSchema = z.enum(TIFF_ENCODINGS, { message: 'Pick auto, linear or srgb' });

// blank or null is "not known" (never 0); "0x10" or "1_000" is not a number a person typed
const optionalNumber = (label: string, max: number) =>
  optionalStrictNumber(`${label} must be a number`, (n) =>
    n.min(0, { message: `${label} cannot be negative` }).max(max, { message: `${label} above ${max} is not plausible` }),
  );

/** What the tester knows about the shot's lighting; every field is optional. */
export const conditionsSchema = z.object({
  ambientLux: optionalNumber('Ambient illuminance', 200_000),
  backgroundCdm2: optionalNumber('Background luminance', 100_000),
  displayLevel: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).default(''),
});

// Flat fields so one schema serves both HTML forms and JSON bodies.
export const captureSetSchema = z.object({
  label: safe(z.string({ message: 'Enter a label' }).trim().min(1, { message: 'Enter a label' }).max(120, { message: 'Use at most 120 characters' })),
  variant: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).default(''),
  pattern: z.enum(CAPTURE_PATTERNS, { message: 'Pick the pattern shown on the display' }).default('full'),
  tiffEncoding: tiffEncodingSchema.default('auto'),
  notes: safe(z.string().trim().max(4000, { message: 'Use at most 4000 characters' }), { multiline: true }).default(''),
  ...conditionsSchema.shape,
});

export const captureSetCreateSchema = captureSetSchema;
// An update names only what changes. (`.partial()` would keep the defaults, and a PATCH of the label
// alone would put the pattern, variant, notes and TIFF encoding back to them.)
const shape = captureSetSchema.shape;
export const captureSetUpdateSchema = z.object({
  label: shape.label.optional(),
  variant: shape.variant.unwrap().optional(),
  pattern: shape.pattern.unwrap().optional(),
  tiffEncoding: shape.tiffEncoding.unwrap().optional(),
  notes: shape.notes.unwrap().optional(),
  ambientLux: shape.ambientLux,
  backgroundCdm2: shape.backgroundCdm2,
  displayLevel: shape.displayLevel.unwrap().optional(),
});
export type CaptureSetInput = z.infer<typeof captureSetSchema>;
export type Conditions = z.infer<typeof conditionsSchema>;

/** A photo's own declaration: linear, sRGB-encoded, or null to follow its capture set. */
export const photoEncodingSchema = z.object({ encoding: z.enum(['linear', 'srgb'], { message: 'The encoding is linear, srgb or null' }).nullable() });

export type PhotoEncodingFacts = {
  role: string;
  originalName: string;
  format: string;
  bitDepth: number;
  /** What the file said at upload; null for photos stored before files were asked. */
  encodingFile: 'linear' | 'srgb' | null;
  encodingReason: string;
  encodingDeclared: 'linear' | 'srgb' | null;
};

export type PhotoEncodingDecision = {
  linear: boolean;
  /** Who decided: the photo's own declaration, the set's, or the file. */
  by: 'photo' | 'set' | 'file';
  /** Set when the set says linear but the photo cannot be (not a 16-bit TIFF): a message to act on. */
  conflict: string | null;
};

const isSixteenBitTiff = (p: { format: string; bitDepth: number }): boolean => p.format === 'tiff' && p.bitDepth === 16;

/**
 * Whether a photo is read as linear light. A photo's own declaration wins, then the set's; with
 * 'auto' the file decides (photos stored before files were asked keep the old reading, sRGB).
 */
export function photoEncoding(setting: TiffEncodingSetting, p: PhotoEncodingFacts): PhotoEncodingDecision {
  // a camera raw photo is decoded to linear light by the worker, whatever the set or the photo says
  if (isRawFormat(p.format)) return { linear: true, by: 'file', conflict: null };
  if (p.encodingDeclared) return { linear: p.encodingDeclared === 'linear' && isSixteenBitTiff(p), by: 'photo', conflict: null };
  if (setting === 'srgb') return { linear: false, by: 'set', conflict: null };
  if (setting === 'linear') {
    if (isSixteenBitTiff(p)) return { linear: true, by: 'set', conflict: null };
    const what = `${p.bitDepth}-bit ${p.format === 'jpeg' ? 'JPEG' : p.format.toUpperCase()}`;
    return {
      linear: false,
      by: 'set',
      conflict: `The capture set is declared linear 16-bit, but the ${p.role} photo ${p.originalName} is ${p.bitDepth === 8 ? 'an' : 'a'} ${what}: upload its 16-bit TIFF, or set “16-bit TIFF encoding” to “as each file says”`,
    };
  }
  return { linear: p.encodingFile === 'linear' && isSixteenBitTiff(p), by: 'file', conflict: null };
}

/** Re-analyse a whole project, or one of its revisions, with the current engine. */
export const reanalyseSchema = z.object({
  projectId: z.string({ message: 'Say which project' }).uuid({ message: 'Say which project' }),
  revisionId: z.string().uuid({ message: 'That is not a revision' }).nullable().default(null),
});
