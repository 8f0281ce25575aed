// Requests and limits, against the real route handlers, PostgreSQL and Redis: bodies are counted
// while they stream, cookie writes need the app's Origin, analyses coalesce, queue within a per-lab
// limit and take turns between labs, patterns are drawn once per size within a per-client budget,
// bad text, numbers and dates are field errors, and a corrupt photo is refused at upload.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'bullmq';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { jar, sessionToken } from '../fixtures/request-context';
import { addCaptureSet } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-limits-'));
process.env.STORAGE_DIR = join(tmp, 'storage');
// a queue and limiter namespace of this run alone: no other test's jobs or budgets
process.env.QUEUE_PREFIX = `vmlimits${process.pid}${Date.now().toString(36)}`;
// one reverse proxy in front of the app, whose X-Forwarded-* headers count (nobody else's do)
process.env.TRUSTED_PROXIES = '10.0.0.1';

vi.mock('server-only', () => ({}));
vi.mock('next/cache', () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));

const { getDb, closeDb } = await import('../../db/index');
const { getEnv } = await import('../../lib/env');
const { createApiToken } = await import('../../db/queries/api-tokens');
const producer = await import('../../lib/server/queue/producer');
const { getAnalysisQueue, requestAnalysis } = producer;
// the per-lab limit; 50 where the module that sets it cannot be loaded
const LAB_ANALYSIS_LIMIT: number = ((await import('../../db/queries/analysis-requests').catch(() => ({}))) as { LAB_ANALYSIS_LIMIT?: number }).LAB_ANALYSIS_LIMIT ?? 50;
const { workerConnection } = await import('../../lib/server/queue/connection');
const projects = await import('../../app/api/projects/route');
const project = await import('../../app/api/projects/[projectId]/route');
const captures = await import('../../app/api/captures/route');
const analyses = await import('../../app/api/captures/[captureId]/analyses/route');
const photos = await import('../../app/api/captures/[captureId]/photos/route');
const v1captures = await import('../../app/api/v1/captures/route');
const reset = await import('../../app/api/password-reset/route');
const calibrate = await import('../../app/api/cameras/calibrate/route');
const patterns = await import('../../app/api/patterns/[kind]/route');
const { clearPatternCache = () => undefined } = (await import('../../app/api/patterns/[kind]/render-cache').catch(() => ({}))) as { clearPatternCache?: () => void };
const { createRevisionAction } = await import('../../app/(lab)/projects/[projectId]/revisions/actions');
const { createTargetAction } = await import('../../app/(lab)/projects/[projectId]/targets/actions');
const { proxy } = await import('../../proxy');
const { NextRequest } = await import('next/server');

const APP = new URL(getEnv().NEXTAUTH_URL).origin;
const tag = `${process.pid}-${Date.now().toString(36)}`;
type Lab = { labId: string; userId: string; projectId: string; revisionId: string; cookie: string };
const labs: Lab[] = [];
let capture: RenderedCapture;

async function makeLab(name: string): Promise<Lab> {
  const db = getDb();
  const [lab] = await db('labs').insert({ name: `${name} ${tag}` }).returning<{ id: string }[]>('id');
  const [user] = await db('users').insert({ email: `${name.toLowerCase().replace(/\W+/g, '-')}-${tag}@example.test`, name, password_hash: 'x' }).returning<{ id: string }[]>('id');
  const labId = lab!.id;
  const userId = user!.id;
  // accounts prove their address before acting in a lab (when the installation asks for it)
  await db('users').where({ id: userId }).update({ email_verified_at: db.fn.now() }).catch(() => undefined);
  await db('memberships').insert({ lab_id: labId, user_id: userId, role: 'admin' });
  const [p] = await db('projects').insert({ lab_id: labId, name: `Visor ${tag}` }).returning<{ id: string }[]>('id');
  const [r] = await db('revisions').insert({ lab_id: labId, project_id: p!.id, label: 'R1', position: 1 }).returning<{ id: string }[]>('id');
  const row = (await db('users').where({ id: userId }).first()) as { session_version?: number };
  const token = await sessionToken(userId, row.session_version ?? 0);
  const out = { labId, userId, projectId: p!.id, revisionId: r!.id, cookie: `next-auth.session-token=${token}; vm-lab=${labId}` };
  labs.push(out);
  return out;
}

function actAs(lab: Lab): void {
  jar.clear();
  for (const part of lab.cookie.split('; ')) {
    const i = part.indexOf('=');
    jar.set(part.slice(0, i), part.slice(i + 1));
  }
}

type Handler = (req: Request, ctx: never) => Promise<Response>;
async function call(handler: Handler, method: string, path: string, init: { lab?: Lab; params?: Record<string, string>; body?: BodyInit | null; headers?: Record<string, string>; origin?: string | null } = {}): Promise<Response> {
  if (init.lab) actAs(init.lab);
  else jar.clear();
  const headers: Record<string, string> = { ...(init.headers ?? {}) };
  if (init.lab) headers.cookie = init.lab.cookie;
  if (init.origin !== null && method !== 'GET') headers.origin = init.origin ?? APP;
  const req = new Request(`${APP}${path}`, { method, headers, body: init.body ?? null, duplex: 'half' } as RequestInit);
  return handler(req, { params: Promise.resolve(init.params ?? {}) } as never);
}
const json = (v: unknown) => ({ body: JSON.stringify(v), headers: { 'content-type': 'application/json' } });

/** A body that produces `total` bytes on demand, counting how many the reader actually pulled. */
function countedStream(total: number, chunk: Uint8Array): { stream: ReadableStream<Uint8Array>; pulled: () => number } {
  let sent = 0;
  const stream = new ReadableStream<Uint8Array>({
    pull(ctrl) {
      if (sent >= total) return ctrl.close();
      const piece = chunk.subarray(0, Math.min(chunk.length, total - sent));
      sent += piece.length;
      ctrl.enqueue(piece);
    },
  });
  return { stream, pulled: () => sent };
}

/** `head`, then everything `rest` yields. */
function prefixed(head: Uint8Array, rest: ReadableStream<Uint8Array>): ReadableStream<Uint8Array> {
  const reader = rest.getReader();
  let first = true;
  return new ReadableStream<Uint8Array>({
    async pull(ctrl) {
      if (first) {
        first = false;
        return ctrl.enqueue(head);
      }
      const r = await reader.read();
      if (r.done) ctrl.close();
      else ctrl.enqueue(r.value);
    },
    cancel: (why) => reader.cancel(why),
  });
}

let a: Lab;
let b: Lab;

beforeAll(async () => {
  capture = await renderCapture({ width: 320, height: 240, seed: 7, ghost: null });
  a = await makeLab('Limits A');
  b = await makeLab('Limits B');
});

afterAll(async () => {
  const q = getAnalysisQueue();
  await q.obliterate({ force: true }).catch(() => undefined);
  await q.close().catch(() => undefined);
  const db = getDb();
  await db('labs').whereIn('id', labs.map((l) => l.labId)).delete();
  await db('users').whereIn('id', labs.map((l) => l.userId)).delete();
  await closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('request bodies', () => {
  it('a JSON route stops reading a chunked body at its limit and answers 413', async () => {
    // valid JSON of 20 MB, sent without a length: a name far too long, but JSON all the same
    const head = new TextEncoder().encode('{"name":"');
    const { stream, pulled } = countedStream(20 * 1024 * 1024, new Uint8Array(64 * 1024).fill(0x61));
    const body = prefixed(head, stream);
    const res = await call(projects.POST as Handler, 'POST', '/api/projects', { lab: a, body, headers: { 'content-type': 'application/json' } });
    expect(res.status).toBe(413);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('too_large');
    expect(pulled()).toBeLessThan(256 * 1024);
  });

  it('a declared length over the limit is refused before reading, on the public reset route too', async () => {
    const big = JSON.stringify({ email: `${'x'.repeat(200_000)}@example.test` });
    const res = await call(reset.POST as unknown as Handler, 'POST', '/api/password-reset', { body: big, headers: { 'content-type': 'application/json', 'content-length': String(big.length) } });
    expect(res.status).toBe(413);
    // a small body still goes through to the schema (422 for a malformed address)
    const small = await call(reset.POST as unknown as Handler, 'POST', '/api/password-reset', json({ email: 'not-an-address' }));
    expect(small.status).toBe(422);
  });

  it('a camera form sent chunked stops at 60 MB instead of being buffered whole', async () => {
    const boundary = 'vmlimitsboundary';
    const head = new TextEncoder().encode(`--${boundary}\r\nContent-Disposition: form-data; name="photo"; filename="huge.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`);
    const { stream, pulled } = countedStream(90 * 1024 * 1024, new Uint8Array(1024 * 1024).fill(0xff));
    const body = prefixed(head, stream);
    const res = await call(calibrate.POST as Handler, 'POST', '/api/cameras/calibrate', { lab: a, body, headers: { 'content-type': `multipart/form-data; boundary=${boundary}` } });
    expect(res.status).toBe(413);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/larger than 60 MB/);
    expect(pulled()).toBeLessThanOrEqual(62 * 1024 * 1024);
  });
});

describe('Origin on cookie writes', () => {
  it('refuses a write from another site or without Origin, and takes one from the app', async () => {
    const rename = (origin: string | null, name: string) =>
      call(project.PATCH as Handler, 'PATCH', `/api/projects/${a.projectId}`, { lab: a, params: { projectId: a.projectId }, origin, ...json({ name }) });
    const evil = await rename('https://evil.example', 'Taken over');
    expect(evil.status).toBe(403);
    expect(((await evil.json()) as { error: { code: string } }).error.code).toBe('cross_origin');
    expect((await rename(null, 'Taken over')).status).toBe(403);
    expect((await getDb()('projects').where({ id: a.projectId }).first()).name).toBe(`Visor ${tag}`);
    const ok = await rename(APP, `Visor ${tag}`);
    expect(ok.status).toBe(200);
  });

  it('lets a bearer-token call under /api/v1 write without Origin', async () => {
    const { token } = await createApiToken(a.labId, a.userId, 'rig', ['read', 'capture:write']);
    jar.clear();
    const req = new Request(`${APP}/api/v1/captures`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify({ revisionId: a.revisionId, label: 'From the rig' }) });
    const res = await (v1captures.POST as Handler)(req, { params: Promise.resolve({}) } as never);
    expect(res.status).toBe(201);
  });
});

describe('strict input', () => {
  it('NUL characters and lone surrogates are field errors (422), not 500', async () => {
    const nul = await call(projects.POST as Handler, 'POST', '/api/projects', { lab: a, ...json({ name: 'Visor\u0000 2' }) });
    expect(nul.status).toBe(422);
    expect(((await nul.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.name?.[0]).toMatch(/control characters/);
    // JSON.stringify would escape the half pair the same way; written out so the test says what is sent
    const lone = await call(projects.POST as Handler, 'POST', '/api/projects', { lab: a, body: '{"name":"Visor \\ud800 2","description":"ok"}', headers: { 'content-type': 'application/json' } });
    expect(lone.status).toBe(422);
    expect(((await lone.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.name?.[0]).toMatch(/surrogate/);
    const notes = await call(captures.POST as Handler, 'POST', '/api/captures', { lab: a, ...json({ revisionId: a.revisionId, label: 'Notes', notes: 'line one\nline two\u0000' }) });
    expect(notes.status).toBe(422);
  });

  it('"0x10" is not 16 lux, and null is no luminance rather than 0 cd/m²', async () => {
    const hex = await call(captures.POST as Handler, 'POST', '/api/captures', { lab: a, ...json({ revisionId: a.revisionId, label: 'Hex', ambientLux: '0x10' }) });
    expect(hex.status).toBe(422);
    expect(((await hex.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.ambientLux).toEqual(['Ambient illuminance must be a number']);
    const nulled = await call(captures.POST as Handler, 'POST', '/api/captures', { lab: a, ...json({ revisionId: a.revisionId, label: 'Null', backgroundCdm2: null, ambientLux: '250' }) });
    expect(nulled.status).toBe(201);
    const { captureSet } = (await nulled.json()) as { captureSet: { id: string } };
    const stored = (await getDb()('capture_sets').where({ id: captureSet.id }).first()) as { conditions: Record<string, unknown> };
    expect(stored.conditions.backgroundCdm2).toBeUndefined();
    expect(stored.conditions.ambientLux).toBe(250);
  });

  it('a target of "0x10" or with a "1e400" bound is a field error of the form, and nothing is stored', async () => {
    actAs(a);
    const form = new FormData();
    for (const [k, v] of Object.entries({ projectId: a.projectId, metric: 'ambientContrastRatio', comparator: '>=', value: '0x10', conditionNote: '', ambientLuxMin: '1e400' })) form.set(k, v);
    const state = await createTargetAction(form);
    expect(state.ok).toBe(false);
    expect(state.fieldErrors?.value).toEqual(['Enter a number']);
    expect(state.fieldErrors?.ambientLuxMin).toEqual(['The lowest ambient illuminance must be a number']);
    expect(await getDb()('targets').where({ lab_id: a.labId }).first()).toBeUndefined();
  });

  it('a date that does not exist (2026-02-30) is a field error of the form, and nothing is stored', async () => {
    actAs(a);
    const form = new FormData();
    form.set('projectId', a.projectId);
    form.set('label', 'Leap');
    form.set('builtOn', '2026-02-30');
    const state = await createRevisionAction(form);
    expect(state.ok).toBe(false);
    expect(state.fieldErrors?.builtOn).toEqual(['That date does not exist']);
    expect(await getDb()('revisions').where({ lab_id: a.labId, label: 'Leap' }).first()).toBeUndefined();
    form.set('builtOn', '2028-02-29');
    expect((await createRevisionAction(form)).ok).toBe(true);
  });
});

/** The first SOF header of a JPEG rewritten to declare w × h over the same few kilobytes of data. */
function redeclareJpeg(jpeg: Buffer, w: number, h: number): Buffer {
  const out = Buffer.from(jpeg);
  for (let i = 2; i + 9 < out.length; ) {
    const marker = out[i + 1] as number;
    const len = out.readUInt16BE(i + 2);
    if (marker >= 0xc0 && marker <= 0xc3) {
      out.writeUInt16BE(h, i + 5);
      out.writeUInt16BE(w, i + 7);
      return out;
    }
    i += 2 + len;
  }
  throw new Error('no SOF marker');
}

describe('corrupt photos', () => {
  it('a JPEG that declares 9999 × 9999 over a small image is refused at upload with what is wrong', async () => {
    const [set] = await getDb()('capture_sets').insert({ lab_id: a.labId, revision_id: a.revisionId, label: 'Corrupt' }).returning<{ id: string }[]>('id');
    // photos of their own: a photo may be in one capture set of a lab only
    const shot = await renderCapture({ width: 320, height: 240, seed: 8, ghost: null });
    const bytes = redeclareJpeg(shot.on, 9999, 9999);
    const res = await call(photos.POST as Handler, 'POST', `/api/captures/${set!.id}/photos?role=on`, { lab: a, params: { captureId: set!.id }, body: new Uint8Array(bytes), headers: { 'content-type': 'image/jpeg', 'x-file-name': 'visor-on.jpg' } });
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as { error: { message: string } };
    expect(error.message).toMatch(/^visor-on\.jpg is damaged or cut short: it declares 9999 × 9999 pixels/);
    expect(await getDb()('photos').where({ lab_id: a.labId, capture_set_id: set!.id }).first()).toBeUndefined();
    // the same photo undamaged goes in
    const good = await call(photos.POST as Handler, 'POST', `/api/captures/${set!.id}/photos?role=on`, { lab: a, params: { captureId: set!.id }, body: new Uint8Array(shot.on), headers: { 'content-type': 'image/jpeg', 'x-file-name': 'visor-on.jpg' } });
    expect(good.status).toBe(201);
  });
});

describe('analyses', () => {
  it('fifty concurrent requests for one capture set make one analysis and one job, and all answer with it', async () => {
    const setId = await addCaptureSet(getDb(), a, 'Coalesce', capture, { regions: false });
    const answers = await Promise.all(Array.from({ length: 50 }, () => call(analyses.POST as Handler, 'POST', `/api/captures/${setId}/analyses`, { lab: a, params: { captureId: setId } })));
    expect(answers.map((r) => r.status)).toEqual(Array(50).fill(202));
    const ids = new Set(await Promise.all(answers.map(async (r) => ((await r.json()) as { analysis: { id: string } }).analysis.id)));
    expect(ids.size).toBe(1);
    expect(await getDb()('analyses').where({ lab_id: a.labId, capture_set_id: setId }).count<{ n: string }[]>('* as n')).toEqual([{ n: '1' }]);
    const jobs = await getAnalysisQueue().getJobs(['wait', 'prioritized', 'active', 'delayed']);
    expect(jobs.filter((j) => j.data.analysisId === [...ids][0])).toHaveLength(1);
  });

  it(`a lab may have ${LAB_ANALYSIS_LIMIT} in flight: beyond that the route answers 429 with Retry-After, other labs go on`, async () => {
    const lab = await makeLab('Limits C');
    const sets = await getDb()('capture_sets')
      .insert(Array.from({ length: LAB_ANALYSIS_LIMIT }, (_, i) => ({ lab_id: lab.labId, revision_id: lab.revisionId, label: `Busy ${i}` })))
      .returning<{ id: string }[]>('id');
    // the lab's analyses in flight: half waiting, half running
    await getDb()('analyses').insert(sets.map((x, i) => ({ lab_id: lab.labId, capture_set_id: x.id, status: i % 2 ? 'running' : 'queued', stage: 'queued', started_at: i % 2 ? new Date() : null })));
    const setId = await addCaptureSet(getDb(), lab, 'One more', capture, { regions: false });
    const res = await call(analyses.POST as Handler, 'POST', `/api/captures/${setId}/analyses`, { lab, params: { captureId: setId } });
    expect(res.status).toBe(429);
    expect(res.headers.get('retry-after')).toBe('30');
    expect(((await res.json()) as { error: { message: string } }).error.message).toContain(`already has ${LAB_ANALYSIS_LIMIT} analyses waiting or running`);
    expect(await getDb()('analyses').where({ lab_id: lab.labId, capture_set_id: setId }).first()).toBeUndefined();
    // another lab is not limited by this one
    const other = await addCaptureSet(getDb(), b, 'Other lab', capture, { regions: false });
    expect((await call(analyses.POST as Handler, 'POST', `/api/captures/${other}/analyses`, { lab: b, params: { captureId: other } })).status).toBe(202);
    // one finishes: the lab may queue again
    await getDb()('analyses').where({ lab_id: lab.labId, capture_set_id: sets[1]!.id }).update({ status: 'done', finished_at: new Date() });
    expect((await call(analyses.POST as Handler, 'POST', `/api/captures/${setId}/analyses`, { lab, params: { captureId: setId } })).status).toBe(202);
  });

  it('the bulk form (a whole revision re-analysed) queues up to the lab limit, coalesces, and refuses the rest with a wait', async () => {
    expect(typeof producer.requestAnalyses).toBe('function');
    const lab = await makeLab('Limits F');
    const sets = await getDb()('capture_sets')
      .insert(Array.from({ length: LAB_ANALYSIS_LIMIT + 5 }, (_, i) => ({ lab_id: lab.labId, revision_id: lab.revisionId, label: `Bulk ${i}` })))
      .returning<{ id: string }[]>('id');
    const ids = sets.map((x) => x.id);
    const outcomes = await producer.requestAnalyses(lab.labId, lab.userId, [...ids, ids[0]!]);
    expect(outcomes.map((o) => o.captureSetId)).toEqual([...ids, ids[0]]);
    expect(outcomes.filter((o) => o.kind === 'created')).toHaveLength(LAB_ANALYSIS_LIMIT);
    expect(outcomes.at(-1)?.kind).toBe('coalesced');
    const refused = outcomes.filter((o) => o.kind === 'refused');
    expect(refused).toHaveLength(5);
    expect(refused[0]).toMatchObject({ retryAfterS: 30 });
    // asking again for the same sets coalesces with those in flight and creates nothing
    const again = await producer.requestAnalyses(lab.labId, lab.userId, ids.slice(0, 3));
    expect(again.map((o) => o.kind)).toEqual(['coalesced', 'coalesced', 'coalesced']);
    expect(await getDb()('analyses').where({ lab_id: lab.labId }).count<{ n: string }[]>('* as n')).toEqual([{ n: String(LAB_ANALYSIS_LIMIT) }]);
  });

  it("one lab's burst does not hold back another lab: the other lab's job runs second, not after the burst", async () => {
    const queue = getAnalysisQueue();
    await queue.obliterate({ force: true });
    await getDb()('analyses').whereIn('lab_id', labs.map((l) => l.labId)).delete();
    const burst = await makeLab('Limits D');
    const quiet = await makeLab('Limits E');
    const burstSets = await getDb()('capture_sets')
      .insert(Array.from({ length: 12 }, (_, i) => ({ lab_id: burst.labId, revision_id: burst.revisionId, label: `Burst ${i}` })))
      .returning<{ id: string }[]>('id');
    // the re-analyse button of a revision asks for each of its sets in turn
    for (const x of burstSets) await requestAnalysis(burst.labId, burst.userId, x.id);
    const [quietSet] = await getDb()('capture_sets').insert({ lab_id: quiet.labId, revision_id: quiet.revisionId, label: 'Quiet' }).returning<{ id: string }[]>('id');
    await requestAnalysis(quiet.labId, quiet.userId, quietSet!.id);
    // a worker that only notes whose job it was given, one at a time
    const order: string[] = [];
    const worker = new Worker(
      'analysis',
      async (job) => {
        order.push(job.data.labId as string);
      },
      { connection: workerConnection(), prefix: getEnv().QUEUE_PREFIX, concurrency: 1 },
    );
    const deadline = Date.now() + 20_000;
    while (order.length < 13 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
    await worker.close();
    expect(order).toHaveLength(13);
    expect(order.indexOf(quiet.labId)).toBeLessThanOrEqual(1);
  });
});

describe('public patterns', () => {
  const get = (kind: string, w: number, h: number, peer: string, extra: Record<string, string> = {}) =>
    call(patterns.GET as unknown as Handler, 'GET', `/api/patterns/${kind}.png?width=${w}&height=${h}`, { params: { kind: `${kind}.png` }, headers: { 'x-veilmeter-peer': peer, ...extra } });

  it('draws a size once and answers the same bytes from memory after', async () => {
    clearPatternCache();
    const t0 = performance.now();
    const first = await get('checkerboard', 4096, 4096, '198.51.100.1');
    const t1 = performance.now();
    const second = await get('checkerboard', 4096, 4096, '198.51.100.2');
    const t2 = performance.now();
    expect(first.status).toBe(200);
    expect(first.headers.get('x-veilmeter-cache')).toBe('miss');
    expect(second.headers.get('x-veilmeter-cache')).toBe('hit');
    expect(Buffer.from(await second.arrayBuffer()).equals(Buffer.from(await first.arrayBuffer()))).toBe(true);
    expect(t2 - t1).toBeLessThan((t1 - t0) / 5);
  });

  it("limits the drawing a client may ask for, whatever X-Forwarded-For it sends, and not other clients' cached sizes", async () => {
    clearPatternCache();
    const peer = '198.51.100.7';
    const spoof = { 'x-forwarded-for': '203.0.113.9' };
    expect((await get('white', 8192, 8192, peer, spoof)).status).toBe(200);
    expect((await get('black', 8192, 8192, peer, spoof)).status).toBe(200);
    const refused = await get('checkerboard', 8192, 8192, peer, { 'x-forwarded-for': '203.0.113.10' });
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(0);
    // the sizes already drawn cost no drawing, for this client or another
    expect((await get('white', 8192, 8192, peer)).status).toBe(200);
    expect((await get('checkerboard', 8192, 8192, '198.51.100.8')).status).toBe(200);
  });
});

describe('page headers', () => {
  const page = (headers: Record<string, string>) => proxy(new NextRequest(`${APP}/sign-in`, { headers }));

  it('give every page a script policy with a fresh nonce and no unsafe-inline, handed to the renderer too', async () => {
    const one = await page({ 'x-veilmeter-peer': '198.51.100.30' });
    const two = await page({ 'x-veilmeter-peer': '198.51.100.30' });
    const csp = one.headers.get('content-security-policy') ?? '';
    const script = csp.split('; ').find((d) => d.startsWith('script-src')) ?? '';
    const nonce = /'nonce-([^']+)'/.exec(script)?.[1];
    expect(nonce).toBeTruthy();
    expect(script).not.toContain("'unsafe-inline'");
    expect(two.headers.get('content-security-policy')).not.toBe(csp);
    // what the renderer reads to stamp the nonce on its scripts
    expect(one.headers.get('x-middleware-request-content-security-policy')).toBe(csp);
    expect(one.headers.get('x-middleware-request-x-nonce')).toBe(nonce);
  });

  it('send HSTS only over https: a trusted proxy saying so, never a client saying so', async () => {
    expect((await page({ 'x-veilmeter-peer': '10.0.0.1', 'x-forwarded-proto': 'https' })).headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
    expect((await page({ 'x-veilmeter-peer': '10.0.0.1', 'x-forwarded-proto': 'http' })).headers.get('strict-transport-security')).toBeNull();
    expect((await page({ 'x-veilmeter-peer': '198.51.100.31', 'x-forwarded-proto': 'https' })).headers.get('strict-transport-security')).toBeNull();
  });
});
