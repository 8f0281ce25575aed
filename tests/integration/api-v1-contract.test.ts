// The rig API's contract: every route documented in /api/v1/openapi.json is called with a real
// token against its real handler and PostgreSQL, and each answer is validated against the
// document with a JSON Schema validator (ajv, draft 2020-12). A route file under app/api/v1 that
// the document does not list, or a documented route without its file, fails here. Also: retries
// with Idempotency-Key, concurrent duplicates, ETag/304 on project reads, scopes, and deleting only
// a token's own capture sets.
import { readdirSync, rmSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { Validator } from '@seriousme/openapi-schema-validator';
import Ajv2020 from 'ajv/dist/2020';
import addFormats from 'ajv-formats';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderCapture } from '../fixtures/capture-generator';
import { createTestLab } from '../fixtures/test-lab';
import { isolateRun } from '../fixtures/isolated-run';

const root = join(import.meta.dirname, '..', '..');
const { tmp, prefix } = isolateRun('v1');

vi.mock('server-only', () => ({}));
// no session cookie: only tokens act here
vi.mock('next/headers', () => ({ cookies: async () => ({ get: () => undefined, getAll: () => [], set: () => undefined }) }));

const { getDb, closeDb } = await import('../../db/index');
const { createApiToken } = await import('../../db/queries/api-tokens');
const { saveRegionTemplate } = await import('../../db/queries/region-templates');
const { insertReading } = await import('../fixtures/readings-fixture');
const { getAnalysisQueue } = await import('../../lib/server/queue/producer');
const { openApiDocument } = await import('../../lib/server/api-v1/openapi');
const { V1_ROUTE_LIST, routeFile } = await import('../../lib/server/api-v1/routes');
const { dispatch, handlerOf, matchV1 } = await import('../fixtures/v1-server');

type Doc = { paths: Record<string, Record<string, { operationId: string; responses: Record<string, { content?: Record<string, { schema: { $ref?: string } }> }> }>> };
const doc = openApiDocument() as unknown as Doc;
const ajv = new Ajv2020({ strict: false, allErrors: true });
addFormats(ajv);
ajv.addSchema({ $id: 'https://veilmeter.example.test/openapi.json', components: (doc as unknown as { components: unknown }).components });

const called = new Map<string, Set<number>>();
let lab: { labId: string; userId: string; projectId: string; revisionId: string };
const tokens: Record<'full' | 'readOnly' | 'second' | 'noExport', string> = { full: '', readOnly: '', second: '', noExport: '' };
let photos: { on: Buffer; off: Buffer; ambient: Buffer };

type Answer = { status: number; headers: Headers; json: Record<string, unknown> | null; text: string };

/** Calls a v1 route through its handler, then checks the answer against the document. */
async function call(method: string, path: string, o: { token?: string | null; body?: unknown; raw?: Uint8Array; headers?: Record<string, string> } = {}): Promise<Answer> {
  const headers: Record<string, string> = { ...(o.headers ?? {}) };
  const token = o.token === undefined ? tokens.full : o.token;
  if (token) headers.authorization = `Bearer ${token}`;
  let body: BodyInit | undefined;
  if (o.raw) body = o.raw as BodyInit;
  else if (o.body !== undefined) {
    body = JSON.stringify(o.body);
    headers['content-type'] = 'application/json';
  }
  const res = await dispatch(new Request(`http://127.0.0.1/api/v1${path}`, { method, headers, body }));
  const text = res.status === 204 || res.status === 304 ? '' : await res.text();
  const ct = res.headers.get('content-type') ?? '';
  const json = ct.includes('json') && text ? (JSON.parse(text) as Record<string, unknown>) : null;
  conforms(method, new URL(`http://x/api/v1${path}`).pathname, res.status, ct, json, text);
  return { status: res.status, headers: res.headers, json, text };
}

/** The answer's status is documented for the operation, and its body matches the documented schema. */
function conforms(method: string, pathname: string, status: number, contentType: string, json: unknown, text: string): void {
  const found = matchV1(method, pathname);
  expect(found, `${method} ${pathname} is documented`).not.toBeNull();
  const op = doc.paths[found!.route.path]?.[method.toLowerCase()];
  expect(op, `${method} ${found!.route.path} in the document`).toBeDefined();
  const response = op!.responses[String(status)];
  expect(response, `${op!.operationId} documents status ${status} (answer: ${text.slice(0, 300)})`).toBeDefined();
  const set = called.get(op!.operationId) ?? new Set<number>();
  set.add(status);
  called.set(op!.operationId, set);
  const content = response!.content;
  if (!content) {
    expect(text, `${op!.operationId} ${status} has no body`).toBe('');
    return;
  }
  const type = Object.keys(content)[0]!;
  expect(contentType.startsWith(type), `${op!.operationId} ${status} is ${type}, got ${contentType}`).toBe(true);
  if (type === 'application/json') {
    const ref = content[type]!.schema.$ref!;
    const validate = ajv.getSchema(`https://veilmeter.example.test/openapi.json${ref}`);
    expect(validate, ref).toBeDefined();
    const ok = validate!(json);
    expect(ok, `${op!.operationId} ${status}: ${ajv.errorsText(validate!.errors)}\n${text.slice(0, 500)}`).toBe(true);
  }
}

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => (statSync(join(dir, f)).isDirectory() ? walk(join(dir, f)) : [join(dir, f)]));
}

beforeAll(async () => {
  lab = await createTestLab(getDb(), { tag: prefix, name: 'Contract lab', project: 'Contract visor', revision: 'C1' });
  tokens.full = (await createApiToken(lab.labId, lab.userId, 'contract rig', ['read', 'capture:write', 'capture:delete', 'export'])).token;
  tokens.second = (await createApiToken(lab.labId, lab.userId, 'second rig', ['read', 'capture:write', 'capture:delete', 'export'])).token;
  tokens.readOnly = (await createApiToken(lab.labId, lab.userId, 'reader', ['read'])).token;
  tokens.noExport = (await createApiToken(lab.labId, lab.userId, 'no export', ['read', 'capture:write'])).token;
  const capture = await renderCapture({ width: 320, height: 240, seed: 24 });
  photos = { on: capture.on, off: capture.off, ambient: capture.ambient };
});

afterAll(async () => {
  await getAnalysisQueue().close().catch(() => undefined);
  if (lab) {
    await getDb()('labs').where({ id: lab.labId }).delete();
    await getDb()('users').where({ id: lab.userId }).delete();
  }
  await closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('the rig API document', () => {
  it('is a valid OpenAPI 3.1 document', async () => {
    const result = await new Validator().validate(openApiDocument() as never);
    expect(result, JSON.stringify(result.errors)).toMatchObject({ valid: true });
  });

  it('lists every route file and method under app/api/v1, and every documented route has its handler', async () => {
    const dir = join(root, 'app', 'api', 'v1');
    const onDisk: string[] = [];
    for (const file of walk(dir).filter((f) => f.endsWith('route.ts'))) {
      const mod = (await import(file)) as Record<string, unknown>;
      for (const m of ['GET', 'POST', 'PUT', 'PATCH', 'DELETE']) if (typeof mod[m] === 'function') onDisk.push(`${m} ${relative(dir, file)}`);
    }
    const documented = V1_ROUTE_LIST.map((r) => `${r.method} ${routeFile(r)}`);
    expect(onDisk.sort()).toEqual(documented.sort());
    for (const r of V1_ROUTE_LIST) expect(await handlerOf(r), `${r.method} ${r.path}`).toBeTypeOf('function');
    // the document and the table agree path by path
    const inDoc = Object.entries(doc.paths).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`));
    expect(inDoc.sort()).toEqual(V1_ROUTE_LIST.map((r) => `${r.method} ${r.path}`).sort());
  });

  it('is served without a token at /api/v1/openapi.json', async () => {
    const res = await call('GET', '/openapi.json', { token: null });
    expect(res.status).toBe(200);
    expect(res.json).toEqual(openApiDocument());
  });
});

describe('every documented route, with a real token', () => {
  it('answers as documented through a whole capture, and each route is called', async () => {
    const projects = await call('GET', '/projects');
    expect(projects.status).toBe(200);
    const project = (projects.json!.projects as { id: string; revisions: { id: string }[] }[]).find((p) => p.id === lab.projectId)!;
    expect(project.revisions[0]!.id).toBe(lab.revisionId);

    const created = await call('POST', '/captures', { body: { revisionId: lab.revisionId, label: 'Contract set', variant: 'left eye', ambientLux: 500 } });
    expect(created.status).toBe(201);
    const setId = (created.json!.captureSet as { id: string }).id;

    for (const role of ['on', 'off', 'ambient'] as const) {
      const up = await call('POST', `/captures/${setId}/photos?role=${role}`, { raw: new Uint8Array(photos[role]), headers: { 'x-file-name': `contract-${role}.jpg` } });
      expect(up.status, up.text).toBe(201);
    }
    const again = await call('POST', `/captures/${setId}/photos?role=on`, { raw: new Uint8Array(photos.on) });
    expect(again.status).toBe(200);
    expect(again.json!.duplicate).toBe(true);

    const list = await call('GET', `/captures/${setId}/photos`);
    expect((list.json!.photos as { role: string }[]).map((p) => p.role)).toEqual(['on', 'off', 'ambient']);
    const photoId = (list.json!.photos as { id: string }[])[0]!.id;
    expect((await call('PATCH', `/captures/${setId}/photos/${photoId}`, { body: { encoding: null } })).status).toBe(200);
    const notLinear = await call('PATCH', `/captures/${setId}/photos/${photoId}`, { body: { encoding: 'linear' } });
    expect(notLinear.status).toBe(422);

    const put = await call('PUT', `/captures/${setId}/regions`, { body: { regions: [{ kind: 'screen', x: 80, y: 60, w: 160, h: 120 }, { kind: 'background', x: 4, y: 4, w: 40, h: 30 }] } });
    expect(put.status, put.text).toBe(200);
    expect((await call('GET', `/captures/${setId}/regions`)).json!.regions).toHaveLength(2);
    const outside = await call('PUT', `/captures/${setId}/regions`, { body: { regions: [{ kind: 'screen', x: 300, y: 60, w: 160, h: 120 }] } });
    expect(outside.status).toBe(422);

    const template = await saveRegionTemplate(lab.labId, lab.userId, { projectId: lab.projectId, name: 'Jig A', imageWidth: 640, imageHeight: 480, regions: [{ kind: 'screen', x: 160, y: 120, w: 320, h: 240 }] });
    const templates = await call('GET', `/captures/${setId}/templates`);
    expect((templates.json!.templates as { name: string }[]).map((t) => t.name)).toEqual(['Jig A']);
    const applied = await call('POST', `/captures/${setId}/templates/apply`, { body: { templateId: template.id } });
    expect(applied.status).toBe(200);
    // scaled from the template's 640 × 480 to the photo's 320 × 240
    expect(applied.json!.regions).toEqual([{ kind: 'screen', x: 80, y: 60, w: 160, h: 120, source: 'template' }]);

    const detail = await call('GET', `/captures/${setId}`);
    expect((detail.json!.photos as unknown[]).length).toBe(3);

    const started = await call('POST', `/captures/${setId}/analyses`);
    expect(started.status).toBe(202);
    const analysisId = (started.json!.analysis as { id: string }).id;
    expect((await call('GET', `/captures/${setId}/analyses`)).json!.analyses).toHaveLength(1);
    const polled = await call('GET', `/analyses/${analysisId}`);
    expect(polled.json!.reading).toBeNull();

    // a reading for the project reads (invented values, written as the worker would)
    await insertReading(lab.labId, lab.projectId, lab.revisionId, setId, { acr: 4.2, ghost: 0.01, transmission: 0.8 });
    const trend = await call('GET', `/projects/${lab.projectId}/trend`);
    expect(trend.status).toBe(200);
    expect(((trend.json!.trends as Record<string, { revisions: { stats: { n: number } }[] }>).ambientContrastRatio!.revisions[0]!.stats.n)).toBe(1);
    const one = await call('GET', `/projects/${lab.projectId}/trend?metric=transmission`);
    expect(Object.keys(one.json!.trends as object)).toEqual(['transmission']);
    const readings = await call('GET', `/projects/${lab.projectId}/readings?limit=10`);
    expect(readings.json!.total).toBe(1);
    expect((readings.json!.readings as { values: { ambientContrastRatio: number } }[])[0]!.values.ambientContrastRatio).toBe(4.2);
    const csv = await call('GET', `/projects/${lab.projectId}/readings.csv`);
    expect(csv.status).toBe(200);
    expect(csv.text.split('\n').filter(Boolean)).toHaveLength(2);

    const removed = await call('DELETE', `/captures/${setId}`);
    expect(removed.status).toBe(204);
    expect((await call('GET', `/captures/${setId}`)).status).toBe(404);

    // every documented operation was called and answered a documented success
    for (const r of V1_ROUTE_LIST) {
      const statuses = [...(called.get(r.id) ?? [])];
      expect(statuses.some((s) => s < 300), `${r.id} answered a success (got ${statuses.join(', ') || 'no call'})`).toBe(true);
    }
  });

  it('refuses as documented: no token, a revoked or unknown token, a missing scope, another lab, bad input', async () => {
    expect((await call('GET', '/projects', { token: null })).status).toBe(401);
    expect((await call('GET', '/projects', { token: 'vmk_nosuchtoken_0000000000000000' })).status).toBe(401);
    const write = await call('POST', '/captures', { token: tokens.readOnly, body: { revisionId: lab.revisionId, label: 'x' } });
    expect(write.status).toBe(403);
    expect((write.json!.error as { message: string }).message).toContain('capture:write');
    expect((await call('GET', `/projects/${lab.projectId}/readings.csv`, { token: tokens.noExport })).status).toBe(403);
    expect((await call('GET', '/captures/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await call('GET', '/captures/not-a-uuid/regions')).status).toBe(404);
    expect((await call('GET', '/analyses/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await call('GET', '/projects/00000000-0000-4000-8000-000000000000/trend')).status).toBe(404);
    const bad = await call('POST', '/captures', { body: { revisionId: lab.revisionId, label: '', pattern: 'stripes' } });
    expect(bad.status).toBe(422);
    expect(Object.keys((bad.json!.error as { fieldErrors: object }).fieldErrors).sort()).toEqual(['label', 'pattern']);
    expect((await call('GET', `/projects/${lab.projectId}/readings?limit=0`)).status).toBe(422);
    expect((await call('GET', `/projects/${lab.projectId}/trend?metric=colour`)).status).toBe(422);
    expect((await call('POST', '/captures', { body: { revisionId: '00000000-0000-4000-8000-000000000000', label: 'x' } })).status).toBe(404);
    const badRole = await call('POST', `/captures/00000000-0000-4000-8000-000000000000/photos?role=side`, { raw: new Uint8Array(photos.on) });
    expect(badRole.status).toBe(422);
    const tooBig = await call('PUT', '/captures/00000000-0000-4000-8000-000000000000/regions', { body: { regions: [], pad: 'x'.repeat(70 * 1024) } });
    expect(tooBig.status).toBe(413);
  });
});

describe('safe retries with Idempotency-Key', () => {
  const countSets = async () => Number((await getDb()('capture_sets').where({ lab_id: lab.labId, label: 'Retried set' }).count<{ n: string }[]>('id as n'))[0]!.n);

  it('the same key and body answer the first answer again; another body with the key is 422', async () => {
    const body = { revisionId: lab.revisionId, label: 'Retried set' };
    const first = await call('POST', '/captures', { body, headers: { 'idempotency-key': 'rig-7-run-1' } });
    const second = await call('POST', '/captures', { body, headers: { 'idempotency-key': 'rig-7-run-1' } });
    expect(first.status).toBe(201);
    expect(second.status).toBe(201);
    expect(second.text).toBe(first.text);
    expect(second.headers.get('idempotent-replayed')).toBe('true');
    expect(await countSets()).toBe(1);
    const other = await call('POST', '/captures', { body: { ...body, variant: 'other' }, headers: { 'idempotency-key': 'rig-7-run-1' } });
    expect(other.status).toBe(422);
    expect((other.json!.error as { code: string }).code).toBe('idempotency_mismatch');
    // another token's same key is its own
    const elsewhere = await call('POST', '/captures', { token: tokens.second, body, headers: { 'idempotency-key': 'rig-7-run-1' } });
    expect(elsewhere.status).toBe(201);
    expect(await countSets()).toBe(2);
    // without a key, every request runs
    await call('POST', '/captures', { body });
    expect(await countSets()).toBe(3);
  });

  it('copies sent at the same moment run once', async () => {
    const body = { revisionId: lab.revisionId, label: 'Concurrent set' };
    const answers = await Promise.all(Array.from({ length: 6 }, () => call('POST', '/captures', { body, headers: { 'idempotency-key': 'burst-1' } })));
    const n = Number((await getDb()('capture_sets').where({ lab_id: lab.labId, label: 'Concurrent set' }).count<{ n: string }[]>('id as n'))[0]!.n);
    expect(n).toBe(1);
    const ids = new Set(answers.filter((a) => a.status === 201).map((a) => (a.json!.captureSet as { id: string }).id));
    expect(ids.size).toBe(1);
    for (const a of answers) expect([201, 409]).toContain(a.status);
  });

  it('an error answer is not kept: the same key works once the cause is fixed', async () => {
    const created = await call('POST', '/captures', { body: { revisionId: lab.revisionId, label: 'Fix later' } });
    const setId = (created.json!.captureSet as { id: string }).id;
    const early = await call('POST', `/captures/${setId}/analyses`, { headers: { 'idempotency-key': 'analyse-fix' } });
    expect(early.status).toBe(422);
    for (const role of ['on', 'off'] as const) {
      const fresh = await renderCapture({ width: 200, height: 150, seed: role === 'on' ? 71 : 72 });
      expect((await call('POST', `/captures/${setId}/photos?role=${role}`, { raw: new Uint8Array(fresh[role]) })).status).toBe(201);
    }
    const later = await call('POST', `/captures/${setId}/analyses`, { headers: { 'idempotency-key': 'analyse-fix' } });
    expect(later.status).toBe(202);
    const replay = await call('POST', `/captures/${setId}/analyses`, { headers: { 'idempotency-key': 'analyse-fix' } });
    expect((replay.json!.analysis as { id: string }).id).toBe((later.json!.analysis as { id: string }).id);
    expect(Number((await getDb()('analyses').where({ capture_set_id: setId }).count<{ n: string }[]>('id as n'))[0]!.n)).toBe(1);
  });
});

describe('conditional project reads', () => {
  it('trend, readings and CSV carry an ETag, answer 304 to it, and a new one after a write', async () => {
    for (const path of [`/projects/${lab.projectId}/trend`, `/projects/${lab.projectId}/readings`, `/projects/${lab.projectId}/readings.csv`]) {
      const first = await call('GET', path);
      const etag = first.headers.get('etag');
      expect(etag, path).toMatch(/^W\/".+"$/);
      const same = await call('GET', path, { headers: { 'if-none-match': etag! } });
      expect(same.status, path).toBe(304);
      expect(same.headers.get('etag')).toBe(etag);
      // a capture set added to the project moves its data version
      await call('POST', '/captures', { body: { revisionId: lab.revisionId, label: `Moves ${path}` } });
      const after = await call('GET', path, { headers: { 'if-none-match': etag! } });
      expect(after.status, path).toBe(200);
      expect(after.headers.get('etag')).not.toBe(etag);
    }
    // the readings pages are representations of their own
    const a = (await call('GET', `/projects/${lab.projectId}/readings?limit=5`)).headers.get('etag');
    const b = (await call('GET', `/projects/${lab.projectId}/readings?limit=6`)).headers.get('etag');
    expect(a).not.toBe(b);
  });
});

describe('deleting capture sets', () => {
  it('a token deletes the sets it created, not another token’s nor the app’s', async () => {
    const mine = (await call('POST', '/captures', { body: { revisionId: lab.revisionId, label: 'Mine' } })).json!.captureSet as { id: string };
    const theirs = (await call('POST', '/captures', { token: tokens.second, body: { revisionId: lab.revisionId, label: 'Theirs' } })).json!.captureSet as { id: string };
    const [fromApp] = await getDb()('capture_sets').insert({ lab_id: lab.labId, revision_id: lab.revisionId, label: 'From the app', created_by: lab.userId }).returning<{ id: string }[]>('id');
    expect((await call('DELETE', `/captures/${theirs.id}`)).status).toBe(403);
    expect((await call('DELETE', `/captures/${fromApp!.id}`)).status).toBe(403);
    expect((await call('DELETE', `/captures/${mine.id}`, { token: tokens.noExport })).status).toBe(403);
    expect((await call('DELETE', `/captures/${mine.id}`)).status).toBe(204);
    expect(await getDb()('capture_sets').where({ id: theirs.id }).first('id')).toBeTruthy();
    expect(await getDb()('capture_sets').where({ id: fromApp!.id }).first('id')).toBeTruthy();
  });
});
