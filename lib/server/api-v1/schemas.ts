// The shapes of the rig API's answers (/api/v1). Handlers send every JSON answer through its
// schema (lib/server/api-v1/handler.ts), so a field added to an internal type never reaches a rig
// unannounced, and the OpenAPI document (lib/server/api-v1/openapi.ts) is generated from the same
// schemas. Request bodies use the entity schemas of lib/schemas.
import { z } from 'zod';
import { UNCERTAIN_METRICS } from '../../photometry/result';
import { METRIC_KEYS } from '../../targets/metrics';
import { CAPTURE_PATTERNS, TIFF_ENCODINGS } from '../../schemas/capture-set';
import { REGION_KINDS, REGION_SOURCES } from '../../schemas/region';
import { PHOTO_ROLES } from '../../schemas/upload';

const id = z.uuid();
const when = z.iso.datetime().describe('UTC date and time (ISO 8601)');
const nullableNumber = z.number().nullable();

export const errorAnswer = z.object({
  error: z.object({
    code: z.string().describe('A stable, machine-readable code: unauthorized, forbidden, not_found, invalid, too_large, rate_limited, idempotency_mismatch, idempotency_busy, …'),
    message: z.string().describe('One sentence a person can act on'),
    fieldErrors: z.record(z.string(), z.array(z.string())).optional().describe('Messages per field of the request, when fields were at fault'),
  }),
});

export const captureSetAnswerItem = z.object({
  id,
  revisionId: id,
  revisionLabel: z.string(),
  projectId: id,
  projectName: z.string(),
  label: z.string(),
  variant: z.string(),
  pattern: z.enum(CAPTURE_PATTERNS),
  tiffEncoding: z.enum(TIFF_ENCODINGS),
  conditions: z.object({
    ambientLux: z.number().optional().describe('Ambient illuminance, lx'),
    backgroundCdm2: z.number().optional().describe('Background luminance, cd/m²'),
    displayLevel: z.string(),
  }),
  notes: z.string(),
  createdAt: when,
  updatedAt: when,
});

export const photoAnswerItem = z.object({
  id,
  captureSetId: id,
  role: z.enum(PHOTO_ROLES),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  bytes: z.number().int(),
  width: z.number().int(),
  height: z.number().int(),
  format: z.string(),
  bitDepth: z.number().int(),
  encodingFile: z.enum(['linear', 'srgb']).nullable().describe('What the file said about its encoding'),
  encodingDeclared: z.enum(['linear', 'srgb']).nullable().describe('This photo’s own declaration; null follows the capture set'),
  pages: z.number().int(),
  exif: z.object({
    exposureTime: z.number().optional(),
    fNumber: z.number().optional(),
    iso: z.number().optional(),
    make: z.string().optional(),
    model: z.string().optional(),
    lens: z.string().optional(),
    takenAt: z.string().optional(),
    orientation: z.number().optional(),
  }),
  originalName: z.string(),
  createdAt: when,
});

export const regionAnswerItem = z.object({
  kind: z.enum(REGION_KINDS),
  x: z.number().int(),
  y: z.number().int(),
  w: z.number().int(),
  h: z.number().int(),
  source: z.enum(REGION_SOURCES),
});

export const templateAnswerItem = z.object({
  id,
  projectId: id,
  name: z.string(),
  imageWidth: z.number().int(),
  imageHeight: z.number().int(),
  regions: z.array(regionAnswerItem.omit({ source: true })),
  updatedAt: when,
});

export const ANALYSIS_STATUSES = ['queued', 'running', 'done', 'failed'] as const;

export const analysisAnswerItem = z.object({
  id,
  captureSetId: id,
  status: z.enum(ANALYSIS_STATUSES),
  engineVersion: z.string().nullable(),
  attempts: z.number().int(),
  progress: z.number().describe('0 to 1'),
  stage: z.string(),
  stageLabel: z.string().describe('The stage in words, for a progress line'),
  error: z.string().nullable().describe('Why it failed, when it did'),
  queuedAt: when,
  startedAt: when.nullable(),
  finishedAt: when.nullable(),
});

const uncertaintyValues = z
  .object(Object.fromEntries(UNCERTAIN_METRICS.map((k) => [k, z.number().optional()])) as Record<(typeof UNCERTAIN_METRICS)[number], z.ZodOptional<z.ZodNumber>>)
  .describe('Standard uncertainty (k = 1) of each figure that has one, on the figure’s own scale (docs/method.md §5.8); readings before engine 1.2.0 have none');
const metricValues = z.object(Object.fromEntries(METRIC_KEYS.map((k) => [k, nullableNumber])) as Record<(typeof METRIC_KEYS)[number], typeof nullableNumber>);

export const projectsAnswer = z.object({
  projects: z.array(
    z.object({
      id,
      name: z.string(),
      revisions: z.array(z.object({ id, label: z.string(), position: z.number().int(), status: z.enum(['planned', 'built', 'measured', 'retired']) })),
    }),
  ),
});

export const captureSetAnswer = z.object({ captureSet: captureSetAnswerItem });
export const captureSetDetailAnswer = z.object({ captureSet: captureSetAnswerItem, photos: z.array(photoAnswerItem), regions: z.array(regionAnswerItem) });
export const photosAnswer = z.object({ photos: z.array(photoAnswerItem) });
export const photoUploadAnswer = z.object({ photo: photoAnswerItem, duplicate: z.boolean().describe('True when this file was already stored for this role: nothing new was kept') });
export const photoAnswer = z.object({ photo: photoAnswerItem });
export const regionsAnswer = z.object({ regions: z.array(regionAnswerItem) });
export const templatesAnswer = z.object({ templates: z.array(templateAnswerItem) });
export const analysesAnswer = z.object({
  analyses: z.array(analysisAnswerItem.extend({ readingId: id.nullable(), ambientContrastRatio: nullableNumber, warningCount: z.number().int().nullable() })),
});
export const analysisStartedAnswer = z.object({
  analysis: analysisAnswerItem,
  enqueued: z.boolean().describe('False when the job queue was unreachable: the analysis is saved and starts when it is back'),
  message: z.string(),
});
export const analysisAnswer = z.object({
  analysis: analysisAnswerItem,
  reading: z
    .object({
      id,
      ambientContrastRatio: nullableNumber,
      warningCount: z.number().int(),
      result: z
        .looseObject({
          engineVersion: z.string(),
          ambientContrastRatio: nullableNumber.optional(),
          michelson: nullableNumber.optional(),
          transmission: nullableNumber.optional(),
          transmissionOptics: nullableNumber.optional().describe('The optics’ own transmission: the slope of off against ambient (engine 1.2.0 on)'),
          veil: z
            .looseObject({ relative: z.number(), cdm2: nullableNumber, rangeRatio: z.number(), source: z.enum(['background', 'outside-screen']) })
            .nullable()
            .optional()
            .describe('The light the optics add: the intercept of off against ambient, over the mean ambient luminance, and in cd/m² when calibrated (engine 1.2.0 on)'),
          uncertainty: uncertaintyValues.optional(),
          warnings: z.array(z.looseObject({ code: z.string(), message: z.string() })).optional(),
        })
        .describe('The engine’s full reading (docs/method.md §5); further fields may be added'),
    })
    .nullable()
    .describe('Present once the analysis is done'),
});

export const readingsAnswer = z.object({
  readings: z.array(
    z.object({
      readingId: id,
      captureSetId: id,
      captureLabel: z.string(),
      revisionId: id,
      revisionLabel: z.string(),
      variant: z.string(),
      createdAt: when,
      values: metricValues,
      uncertainty: uncertaintyValues,
    }),
  ),
  total: z.number().int().describe('Capture sets with a reading'),
  limit: z.number().int(),
  offset: z.number().int(),
});

const stats = z.object({ n: z.number().int(), mean: nullableNumber, sd: nullableNumber, low: nullableNumber, high: nullableNumber, halfWidth: nullableNumber });
const trendOfMetric = z.object({
  metric: z.enum(METRIC_KEYS),
  revisions: z.array(z.object({ id, stats, points: z.array(z.tuple([z.number().int(), z.number()])).describe('[index into sets, value]') })),
});

export const trendAnswer = z.object({
  revisions: z.array(z.object({ id, label: z.string(), position: z.number().int() })),
  sets: z.array(z.object({ label: z.string(), variant: z.string() })).describe('Each capture set once; points name them by index'),
  trends: z.object(Object.fromEntries(METRIC_KEYS.map((k) => [k, trendOfMetric.optional()])) as Record<(typeof METRIC_KEYS)[number], z.ZodOptional<typeof trendOfMetric>>),
  targets: z.array(
    z.object({
      id,
      metric: z.enum(METRIC_KEYS),
      comparator: z.enum(['>=', '<=']),
      value: z.number(),
      conditionNote: z.string(),
      variants: z.array(z.string()),
    }),
  ),
});

/** GET /openapi.json answers the document itself; described loosely (it validates against OpenAPI 3.1). */
export const openApiAnswer = z.looseObject({ openapi: z.string(), info: z.looseObject({ title: z.string(), version: z.string() }), paths: z.record(z.string(), z.unknown()) });
