// The rig API's OpenAPI 3.1 document, generated from the route table (lib/server/api-v1/routes.ts) and
// its zod schemas with zod's own JSON Schema output (draft 2020-12, the dialect OpenAPI 3.1 uses).
import { z } from 'zod';
import pkg from '../../../package.json';
import { RAW_KINDS, RAW_TYPES } from '../../image/raw-formats';
import { errorAnswer } from './schemas';
import { COMMON_ERRORS, IDEMPOTENCY_ERRORS, IDEMPOTENCY_TTL_HOURS, SCOPE_LABELS, TOKEN_SCOPES, V1_ROUTE_LIST, pathParams, type V1Route } from './routes';

type Json = Record<string, unknown>;

/** A zod schema as a standalone JSON Schema (no $schema key; shared parts written out in place). */
export function jsonSchemaOf(schema: z.ZodType, io: 'input' | 'output'): Json {
  const out = z.toJSONSchema(schema, { io, unrepresentable: 'any', reused: 'inline', cycles: 'throw' }) as Json;
  delete out.$schema;
  return out;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });

function errorStatuses(r: V1Route): Record<number, string> {
  const out: Record<number, string> = {};
  if (r.permission) Object.assign(out, COMMON_ERRORS);
  if (r.idempotent) Object.assign(out, IDEMPOTENCY_ERRORS);
  for (const [status, text] of Object.entries(r.errors)) {
    const s = Number(status);
    out[s] = out[s] && out[s] !== text ? `${text}; or: ${out[s]}` : (text as string);
  }
  return out;
}

/** Every documented error answer of a route, by status, with its meaning. */
export const routeErrors = errorStatuses;

function operation(r: V1Route & { id: string }, schemas: Record<string, Json>): Json {
  const parameters: Json[] = pathParams(r).map((name) => ({ name, in: 'path', required: true, schema: { type: 'string', format: 'uuid' } }));
  if (r.query) {
    const q = jsonSchemaOf(r.query, 'output') as { properties?: Record<string, Json>; required?: string[] };
    const required = new Set(q.required ?? []);
    for (const [name, schema] of Object.entries(q.properties ?? {})) {
      const description = typeof schema.description === 'string' ? schema.description : undefined;
      // a default makes a parameter optional for the caller even though the parsed value always has it
      parameters.push({ name, in: 'query', required: required.has(name) && !('default' in schema), schema, ...(description ? { description } : {}) });
    }
  }
  if (r.idempotent) {
    parameters.push({
      name: 'Idempotency-Key',
      in: 'header',
      required: false,
      description: `Makes a retry safe: the same key with the same request and body answers the first success again (for ${IDEMPOTENCY_TTL_HOURS} hours, marked Idempotent-Replayed: true), with another body 422. Error answers are not kept.`,
      schema: { type: 'string', minLength: 1, maxLength: 255, pattern: '^[\\x21-\\x7e]+$' },
    });
  }
  if (r.conditional) {
    parameters.push({ name: 'If-None-Match', in: 'header', required: false, description: 'An ETag from an earlier answer: 304 while the project’s data is unchanged', schema: { type: 'string' } });
  }

  const responses: Json = {};
  for (const [status, a] of Object.entries(r.answers)) {
    const headers: Json = {};
    if (r.conditional) headers.ETag = { description: 'Changes when the project’s data changes', schema: { type: 'string' } };
    if (r.idempotent) headers['Idempotent-Replayed'] = { description: 'true on an answer replayed for a repeated Idempotency-Key', schema: { type: 'string', enum: ['true'] } };
    const withHeaders = Object.keys(headers).length ? { headers } : {};
    if ('json' in a) {
      schemas[a.name] = jsonSchemaOf(a.json, 'output');
      responses[status] = { description: a.description, ...withHeaders, content: { 'application/json': { schema: ref(a.name) } } };
    } else if ('csv' in a) {
      responses[status] = { description: a.description, ...withHeaders, content: { 'text/csv': { schema: { type: 'string' } } } };
    } else {
      responses[status] = { description: a.description, ...withHeaders };
    }
  }
  if (r.conditional) responses['304'] = { description: 'Not modified: the If-None-Match ETag is current', headers: { ETag: { schema: { type: 'string' } } } };
  for (const [status, text] of Object.entries(errorStatuses(r))) {
    const headers = status === '429' || status === '409' ? { headers: { 'Retry-After': { description: 'Seconds to wait', schema: { type: 'integer' } } } } : {};
    responses[status] = { description: text, ...headers, content: { 'application/json': { schema: ref('Error') } } };
  }

  const op: Json = {
    operationId: r.id,
    summary: r.summary,
    tags: [r.tag],
    parameters,
    responses,
    'x-permission': r.permission,
    security: r.scope ? [{ bearerToken: [r.scope] }, { session: [] }] : [],
  };
  if (r.description) op.description = r.description;
  if (r.body?.kind === 'json') {
    schemas[r.body.name] = jsonSchemaOf(r.body.schema, 'input');
    op.requestBody = { required: true, content: { 'application/json': { schema: ref(r.body.name) } } };
  } else if (r.body?.kind === 'binary') {
    op.requestBody = {
      required: true,
      description: r.body.description,
      // camera raw files too, under their usual media types (sent as octet-stream they are accepted alike)
      content: Object.fromEntries(['image/jpeg', 'image/png', 'image/tiff', 'image/webp', ...RAW_KINDS.map((k) => RAW_TYPES[k].contentType), 'application/octet-stream'].map((t) => [t, { schema: {} }])),
    };
  }
  return op;
}

let cached: Json | null = null;

/** The document (built once per process: it depends on code only). */
export function openApiDocument(): Json {
  if (cached) return cached;
  const schemas: Record<string, Json> = { Error: jsonSchemaOf(errorAnswer, 'output') };
  const paths: Record<string, Json> = {};
  for (const r of V1_ROUTE_LIST) {
    paths[r.path] ??= {};
    (paths[r.path] as Json)[r.method.toLowerCase()] = operation(r, schemas);
  }
  cached = {
    openapi: '3.1.1',
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    info: {
      title: 'Veilmeter rig API',
      version: `1 (app ${pkg.version})`,
      description:
        'What capture rigs and lab scripts use: capture sets, photos, regions, analyses and project readings. Authenticate with a lab API token (Settings → API tokens) as `Authorization: Bearer vmk_…`; each route names the token scope it needs. Every write takes an Idempotency-Key; project reads answer 304 to If-None-Match.',
    },
    servers: [{ url: '/api/v1' }],
    tags: [...new Set(V1_ROUTE_LIST.map((r) => r.tag))].map((name) => ({ name })),
    paths,
    components: {
      schemas,
      securitySchemes: {
        bearerToken: { type: 'http', scheme: 'bearer', description: `A lab API token (vmk_…). Scopes: ${TOKEN_SCOPES.map((s) => `${s} — ${SCOPE_LABELS[s]}`).join('; ')}.` },
        session: { type: 'apiKey', in: 'cookie', name: 'next-auth.session-token', description: 'A signed-in browser session (writes must carry the app’s Origin)' },
      },
    },
  };
  return cached;
}
