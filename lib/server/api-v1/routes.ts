// The rig API's route table: the one description of /api/v1 that the handlers
// (app/api/v1/**, through lib/server/api-v1/handler.ts), the OpenAPI document (lib/server/api-v1/openapi.ts), the
// reference page (app/(lab)/api-reference) and the contract test all read. A route's file is
// app/api/v1/<path with {x} as [x]>/route.ts.
import { z } from 'zod';
import type { Permission } from '../../auth/permissions';
import { captureSetCreateSchema } from '../../schemas/capture-set';
import { photoEncodingSchema } from '../../schemas/capture-set';
import { regionsPutSchema, templateApplySchema } from '../../schemas/region';
import { uuidSchema } from '../../schemas/common';
import { PHOTO_ROLES } from '../../schemas/upload';
import { METRIC_KEYS } from '../../targets/metrics';
import * as A from './schemas';

import type { TokenScope } from './scopes';

export { TOKEN_SCOPES, SCOPE_LABELS, type TokenScope } from './scopes';

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export type V1Body = { kind: 'json'; schema: z.ZodType; name: string } | { kind: 'binary'; description: string };

export type V1Answer = { description: string } & ({ json: z.ZodType; name: string } | { csv: true } | { empty: true });

export type V1Route = {
  method: HttpMethod;
  /** OpenAPI path below /api/v1, parameters as {name}. */
  path: string;
  summary: string;
  description?: string;
  tag: 'Projects' | 'Capture sets' | 'Photos' | 'Regions' | 'Analyses' | 'Document';
  /** The lab permission the acting person's role needs; null for the public document. */
  permission: Permission | null;
  /** The token scope a bearer token needs; null for the public document. */
  scope: TokenScope | null;
  query?: z.ZodObject;
  body?: V1Body;
  /** Successful answers by status. */
  answers: Record<number, V1Answer>;
  /** Error statuses this route itself may answer, beyond those every route shares (401, 403, 429). */
  errors: Partial<Record<number, string>>;
  /** Takes an Idempotency-Key header (every write). */
  idempotent?: boolean;
  /** Answers with an ETag from the project's data version and 304 to If-None-Match. */
  conditional?: boolean;
};

const NOT_FOUND_SET = 'No such capture set in this lab (also for malformed ids and other labs’ sets)';
const INVALID = 'The body or the query is not valid: fieldErrors says which fields';
const TOO_LARGE = 'The body is larger than its limit (counted while it arrives)';

export const V1_ROUTES = {
  openapi: {
    method: 'GET',
    path: '/openapi.json',
    summary: 'This API as an OpenAPI 3.1 document',
    description: 'Public: no token needed. Generated from the same schemas the handlers use.',
    tag: 'Document',
    permission: null,
    scope: null,
    answers: { 200: { description: 'The OpenAPI document', json: A.openApiAnswer, name: 'OpenApiDocument' } },
    errors: {},
  },
  listProjects: {
    method: 'GET',
    path: '/projects',
    summary: 'The lab’s projects and their revisions',
    description: 'Where a rig finds the revision id its captures belong to.',
    tag: 'Projects',
    permission: 'project.read',
    scope: 'read',
    answers: { 200: { description: 'Projects, each with its revisions in order', json: A.projectsAnswer, name: 'ProjectsAnswer' } },
    errors: {},
  },
  getTrend: {
    method: 'GET',
    path: '/projects/{projectId}/trend',
    summary: 'A project’s trend per metric and revision',
    description: 'Statistics per revision and one point per capture set, to 6 significant figures; ?metric= narrows it to one metric.',
    tag: 'Projects',
    permission: 'project.read',
    scope: 'read',
    query: z.object({ metric: z.enum(METRIC_KEYS).optional().describe('One metric only') }),
    answers: { 200: { description: 'The trend', json: A.trendAnswer, name: 'TrendAnswer' } },
    errors: { 404: 'No such project in this lab', 422: INVALID },
    conditional: true,
  },
  listReadings: {
    method: 'GET',
    path: '/projects/{projectId}/readings',
    summary: 'A project’s readings, newest first, a page at a time',
    description: 'The newest reading of each capture set, with every metric at full precision.',
    tag: 'Projects',
    permission: 'project.read',
    scope: 'read',
    query: z.object({
      limit: z.coerce.number().int().min(1).max(500).default(50).describe('Readings per page (1–500)'),
      offset: z.coerce.number().int().min(0).max(10_000_000).default(0).describe('Readings to skip'),
    }),
    answers: { 200: { description: 'One page of readings', json: A.readingsAnswer, name: 'ReadingsAnswer' } },
    errors: { 404: 'No such project in this lab', 422: INVALID },
    conditional: true,
  },
  readingsCsv: {
    method: 'GET',
    path: '/projects/{projectId}/readings.csv',
    summary: 'A project’s readings as CSV',
    description: 'The same file as the app’s export: one row per capture set’s newest reading.',
    tag: 'Projects',
    permission: 'export.create',
    scope: 'export',
    answers: { 200: { description: 'CSV, UTF-8, with a header row', csv: true } },
    errors: { 404: 'No such project in this lab' },
    conditional: true,
  },
  createCaptureSet: {
    method: 'POST',
    path: '/captures',
    summary: 'Create a capture set in a revision',
    tag: 'Capture sets',
    permission: 'capture.write',
    scope: 'capture:write',
    body: { kind: 'json', schema: captureSetCreateSchema.extend({ revisionId: uuidSchema }), name: 'CaptureSetCreate' },
    answers: { 201: { description: 'The new capture set', json: A.captureSetAnswer, name: 'CaptureSetAnswer' } },
    errors: { 404: 'No such revision in this lab', 413: TOO_LARGE, 422: INVALID },
    idempotent: true,
  },
  getCaptureSet: {
    method: 'GET',
    path: '/captures/{captureId}',
    summary: 'A capture set with its photos and regions',
    tag: 'Capture sets',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The capture set', json: A.captureSetDetailAnswer, name: 'CaptureSetDetailAnswer' } },
    errors: { 404: NOT_FOUND_SET },
  },
  deleteCaptureSet: {
    method: 'DELETE',
    path: '/captures/{captureId}',
    summary: 'Delete a capture set this token created',
    description:
      'A token deletes only the capture sets it created itself (its rig’s mistakes), with their photos, analyses and readings; a person whose role may delete capture sets deletes any. Anything else answers 403.',
    tag: 'Capture sets',
    permission: 'capture.write',
    scope: 'capture:delete',
    answers: { 204: { description: 'Deleted', empty: true } },
    errors: { 404: NOT_FOUND_SET },
  },
  listPhotos: {
    method: 'GET',
    path: '/captures/{captureId}/photos',
    summary: 'A capture set’s photos',
    tag: 'Photos',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The photos in role order (on, off, ambient, dark)', json: A.photosAnswer, name: 'PhotosAnswer' } },
    errors: { 404: NOT_FOUND_SET },
  },
  uploadPhoto: {
    method: 'POST',
    path: '/captures/{captureId}/photos',
    summary: 'Upload one photo',
    description:
      'The body is the file itself (JPEG, PNG, TIFF, WebP or camera raw: DNG, CR2, CR3, NEF, ARW, RAF, ORF, RW2, PEF, SRW; at most 60 MB), with ?role=on|off|ambient|dark. X-File-Name may carry its name (percent-encoded). The same file again for the same role answers 200 with duplicate: true.',
    tag: 'Photos',
    permission: 'capture.write',
    scope: 'capture:write',
    query: z.object({
      role: z.enum(PHOTO_ROLES).describe('Which photo this is'),
      encoding: z.enum(['auto', 'linear', 'srgb']).optional().describe('How a 16-bit TIFF encodes light; auto follows the set and the file (camera raw is always linear)'),
    }),
    body: { kind: 'binary', description: 'The photo file' },
    answers: {
      201: { description: 'Stored', json: A.photoUploadAnswer, name: 'PhotoUploadAnswer' },
      200: { description: 'Already stored (the same file for the same role)', json: A.photoUploadAnswer, name: 'PhotoUploadAnswer' },
    },
    errors: { 404: NOT_FOUND_SET, 409: 'This file is already a photo of another capture set', 413: 'The file is larger than 60 MB, or arrived incomplete', 422: 'Not a photo that can be measured, or a bad role or encoding' },
    idempotent: true,
  },
  setPhotoEncoding: {
    method: 'PATCH',
    path: '/captures/{captureId}/photos/{photoId}',
    summary: 'Declare how a photo encodes light',
    tag: 'Photos',
    permission: 'capture.write',
    scope: 'capture:write',
    body: { kind: 'json', schema: photoEncodingSchema, name: 'PhotoEncoding' },
    answers: { 200: { description: 'The photo', json: A.photoAnswer, name: 'PhotoAnswer' } },
    errors: { 404: 'No such photo in this capture set', 413: TOO_LARGE, 422: 'Only a 16-bit TIFF can be linear; or the body is not valid' },
    idempotent: true,
  },
  getRegions: {
    method: 'GET',
    path: '/captures/{captureId}/regions',
    summary: 'A capture set’s regions',
    description: 'Rectangles in the on photo’s full-resolution pixels.',
    tag: 'Regions',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The regions', json: A.regionsAnswer, name: 'RegionsAnswer' } },
    errors: { 404: NOT_FOUND_SET },
  },
  putRegions: {
    method: 'PUT',
    path: '/captures/{captureId}/regions',
    summary: 'Replace a capture set’s regions',
    description: 'At most one region of each kind (screen, background, ghost), inside the on photo; an empty list clears them.',
    tag: 'Regions',
    permission: 'capture.write',
    scope: 'capture:write',
    body: { kind: 'json', schema: regionsPutSchema, name: 'RegionsPut' },
    answers: { 200: { description: 'The regions now', json: A.regionsAnswer, name: 'RegionsAnswer' } },
    errors: { 404: NOT_FOUND_SET, 413: TOO_LARGE, 422: 'A region reaches outside the on photo, a kind repeats, or there is no on photo yet' },
    idempotent: true,
  },
  listTemplates: {
    method: 'GET',
    path: '/captures/{captureId}/templates',
    summary: 'The region templates of the capture set’s project',
    tag: 'Regions',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The templates', json: A.templatesAnswer, name: 'TemplatesAnswer' } },
    errors: { 404: NOT_FOUND_SET },
  },
  applyTemplate: {
    method: 'POST',
    path: '/captures/{captureId}/templates/apply',
    summary: 'Place a project template’s regions on this capture set',
    description: 'Scaled when the on photo’s size differs from the template’s; replaces the set’s regions.',
    tag: 'Regions',
    permission: 'capture.write',
    scope: 'capture:write',
    body: { kind: 'json', schema: templateApplySchema, name: 'TemplateApply' },
    answers: { 200: { description: 'The regions now', json: A.regionsAnswer, name: 'RegionsAnswer' } },
    errors: { 404: 'No such capture set, or no such template in its project', 413: TOO_LARGE, 422: 'No on photo yet, or the body is not valid' },
    idempotent: true,
  },
  listAnalyses: {
    method: 'GET',
    path: '/captures/{captureId}/analyses',
    summary: 'A capture set’s analyses, newest first',
    tag: 'Analyses',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The analyses', json: A.analysesAnswer, name: 'AnalysesAnswer' } },
    errors: { 404: NOT_FOUND_SET },
  },
  startAnalysis: {
    method: 'POST',
    path: '/captures/{captureId}/analyses',
    summary: 'Analyse a capture set',
    description: 'Queues an analysis; while one is waiting or running since the set last changed, that one is answered. Poll GET /analyses/{analysisId}. No body.',
    tag: 'Analyses',
    permission: 'analysis.run',
    scope: 'capture:write',
    answers: { 202: { description: 'Queued (or already queued)', json: A.analysisStartedAnswer, name: 'AnalysisStartedAnswer' } },
    errors: { 404: NOT_FOUND_SET, 422: 'The on or off photo is missing, or the photos’ encodings conflict', 429: 'The lab has too many analyses in flight: retry after Retry-After seconds' },
    idempotent: true,
  },
  getAnalysis: {
    method: 'GET',
    path: '/analyses/{analysisId}',
    summary: 'An analysis’s status, and its reading once done',
    tag: 'Analyses',
    permission: 'capture.read',
    scope: 'read',
    answers: { 200: { description: 'The analysis', json: A.analysisAnswer, name: 'AnalysisAnswer' } },
    errors: { 404: 'No such analysis in this lab' },
  },
} as const satisfies Record<string, V1Route>;

export type V1RouteId = keyof typeof V1_ROUTES;

export const V1_ROUTE_LIST: (V1Route & { id: V1RouteId })[] = (Object.entries(V1_ROUTES) as [V1RouteId, V1Route][]).map(([id, r]) => ({ id, ...r }));

/** The route's file below app/api/v1. */
export const routeFile = (r: Pick<V1Route, 'path'>): string => `${r.path.replace(/^\//, '').replace(/\{(\w+)\}/g, '[$1]')}/route.ts`;

/** The path parameters of a route, in order. */
export const pathParams = (r: Pick<V1Route, 'path'>): string[] => [...r.path.matchAll(/\{(\w+)\}/g)].map((m) => m[1] as string);

/** Errors every route with a token shares. */
export const COMMON_ERRORS: Record<number, string> = {
  401: 'No token, or a token that is unknown or revoked',
  403: 'The token lacks the scope, or its owner’s role in the lab does not allow this',
  429: 'Too many requests for this token: retry after Retry-After seconds',
};

/** Errors every route that takes an Idempotency-Key may answer. */
export const IDEMPOTENCY_ERRORS: Record<number, string> = {
  409: 'A request with this Idempotency-Key is still running: retry after Retry-After seconds',
  422: 'This Idempotency-Key was used with another request or body (or is malformed)',
};

export const IDEMPOTENCY_TTL_HOURS = 24;
