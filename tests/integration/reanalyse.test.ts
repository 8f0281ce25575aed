// Re-analysing readings an older engine made: a revision or a whole project at once, through the
// route handlers (a real session), the producer and a real worker process; progress n of m; only
// for roles that may analyse; another lab's data is neither counted, touched nor shown.
import type { ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderCapture } from '../fixtures/capture-generator';
import { insertReading } from '../fixtures/readings-fixture';
import { signInAs as signInWithVersion } from '../fixtures/request-context';
import { addCaptureSet, createTestLab } from '../fixtures/test-lab';
import { removeWorkerBuild, spawnReady, stopWorkers, workerArgs } from '../fixtures/worker-process';
import { isolateRun } from '../fixtures/isolated-run';

const { tmp, prefix } = isolateRun('reanalyse');

vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));

const { getDb, closeDb } = await import('../../db/index');
const { ENGINE_VERSION } = await import('../../lib/photometry/version');
const { getAnalysisQueue } = await import('../../lib/server/queue/producer');
const { compareVersions } = await import('../../db/queries/reanalyses');
const start = await import('../../app/api/captures/reanalyses/route');
const progress = await import('../../app/api/captures/reanalyses/[batchId]/route');

type Handler = (req: Request, ctx: never) => Promise<Response>;
type Batch = { id: string; total: number; done: number; failed: number; inFlight: number; waiting: number; finished: boolean; failures: unknown[] };

// older than any engine this test may run with
const OLD = '0.9.0';
const workers: ChildProcess[] = [];
const logs: string[] = [];
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
type Lab = { labId: string; userId: string; projectId: string; revisionId: string };
let a: Lab;
let b: Lab;
let viewerId = '';
let rev2 = '';
const sets: Record<string, string> = {};

async function signInAs(userId: string): Promise<void> {
  await getDb()('users').where({ id: userId }).update({ email_verified_at: new Date() });
  const { session_version: sv } = await getDb()('users').where({ id: userId }).first<{ session_version: number }>('session_version');
  await signInWithVersion(userId, { sessionVersion: sv });
}

async function post(body: unknown): Promise<{ status: number; json: { batch: Batch | null; message?: string; error?: { message: string } } }> {
  const res = await (start.POST as Handler)(new Request('http://127.0.0.1/api/captures/reanalyses', { method: 'POST', body: JSON.stringify(body) }), { params: Promise.resolve({}) } as never);
  return { status: res.status, json: await res.json() };
}

async function poll(batchId: string): Promise<{ status: number; batch: Batch }> {
  const res = await (progress.GET as Handler)(new Request(`http://127.0.0.1/api/captures/reanalyses/${batchId}`), { params: Promise.resolve({ batchId }) } as never);
  const json = (await res.json()) as { batch: Batch };
  return { status: res.status, batch: json.batch };
}

async function untilFinished(batchId: string, timeoutMs = 120_000): Promise<Batch[]> {
  const seen: Batch[] = [];
  const t0 = Date.now();
  for (;;) {
    const { batch } = await poll(batchId);
    seen.push(batch);
    if (batch.finished) return seen;
    if (Date.now() - t0 > timeoutMs) throw new Error(`batch still ${JSON.stringify(batch)}\n${logs.slice(-20).join('')}`);
    await sleep(300);
  }
}

/** A capture set with real photos whose only reading says an older engine made it. */
async function oldSet(lab: Lab, revisionId: string, label: string, seed: number, engine = OLD): Promise<string> {
  const capture = await renderCapture({ width: 320, height: 240, seed, ghost: null });
  const id = await addCaptureSet(getDb(), { ...lab, revisionId }, label, capture);
  const readingId = await insertReading(lab.labId, lab.projectId, revisionId, id, { acr: 9.99 });
  const { analysis_id: analysisId } = await getDb()('readings').where({ id: readingId }).first<{ analysis_id: string }>('analysis_id');
  await getDb()('readings').where({ id: readingId }).update({ engine_version: engine });
  await getDb()('analyses').where({ id: analysisId }).update({ engine_version: engine });
  return id;
}

const newestEngine = async (captureSetId: string) =>
  (await getDb()('readings').where({ capture_set_id: captureSetId }).orderBy('created_at', 'desc').first<{ engine_version: string }>('engine_version')).engine_version;
const readingCount = async (captureSetId: string) => Number((await getDb()('readings').where({ capture_set_id: captureSetId }).count<{ count: string }[]>('* as count'))[0]?.count);

beforeAll(async () => {
  const db = getDb();
  a = await createTestLab(db, { tag: `${prefix}a`, name: 'Re-analyse A', project: 'Visor re-run', revision: 'R1' });
  b = await createTestLab(db, { tag: `${prefix}b`, name: 'Re-analyse B', project: 'Other lab visor', revision: 'B1' });
  const [viewer] = await db('users').insert({ email: `${prefix}-viewer@example.test`, name: 'Re-analyse viewer', password_hash: 'x' }).returning<{ id: string }[]>('id');
  viewerId = (viewer as { id: string }).id;
  await db('memberships').insert({ lab_id: a.labId, user_id: viewerId, role: 'viewer' });
  const [r2] = await db('revisions').insert({ lab_id: a.labId, project_id: a.projectId, label: 'R2', position: 2 }).returning<{ id: string }[]>('id');
  rev2 = (r2 as { id: string }).id;
  sets.r1a = await oldSet(a, a.revisionId, 'R1 window', 401);
  sets.r1b = await oldSet(a, a.revisionId, 'R1 lamp', 402);
  sets.r2old = await oldSet(a, rev2, 'R2 window', 403);
  sets.r2current = await oldSet(a, rev2, 'R2 current', 404, ENGINE_VERSION);
  sets.other = await oldSet(b, b.revisionId, 'Other lab window', 405);
  const env = { ...process.env, QUEUE_PREFIX: prefix, STORAGE_DIR: join(tmp, 'storage'), STORAGE_DRIVER: 'local', WORKER_CONCURRENCY: '2' };
  await spawnReady(workerArgs('--sweep-every=1', '--sweep-grace=1'), { env, what: 'worker', log: logs, track: workers });
}, 120_000);

afterAll(async () => {
  await stopWorkers(workers);
  await getAnalysisQueue().close().catch(() => undefined);
  const db = getDb();
  for (const lab of [a, b]) if (lab) await db('labs').where({ id: lab.labId }).delete();
  await db('users').whereIn('id', [a?.userId, b?.userId, viewerId].filter(Boolean)).delete();
  await closeDb();
  rmSync(tmp, { recursive: true, force: true });
  removeWorkerBuild();
});

describe('re-analysing readings of an older engine', () => {
  it('compares engine versions part by part', () => {
    expect(compareVersions('1.0.1', '1.1.0')).toBe(-1);
    expect(compareVersions('1.10.0', '1.9.9')).toBe(1);
    expect(compareVersions('1.1', '1.1.0')).toBe(0);
    expect(compareVersions('fixture', '1.0.0')).toBe(-1);
  });

  it('is refused to a viewer and answers 404 for another lab’s project', async () => {
    await signInAs(viewerId);
    expect((await post({ projectId: a.projectId, revisionId: a.revisionId })).status).toBe(403);
    await signInAs(a.userId);
    const other = await post({ projectId: b.projectId, revisionId: null });
    expect(other.status).toBe(404);
    const mixed = await post({ projectId: a.projectId, revisionId: b.revisionId });
    expect(mixed.status).toBe(404);
    expect(await getDb()('reanalysis_batches').where({ lab_id: a.labId })).toHaveLength(0);
    expect((await post({ projectId: 'not-a-uuid' })).status).toBe(422);
  });

  it('re-analyses one revision with the current engine, n of m done, and nothing else', async () => {
    await signInAs(a.userId);
    const started = await post({ projectId: a.projectId, revisionId: a.revisionId });
    expect(started.status).toBe(202);
    const batch = started.json.batch as Batch;
    expect(batch.total).toBe(2);
    expect(batch.done + batch.failed + batch.inFlight + batch.waiting).toBe(2);
    const seen = await untilFinished(batch.id);
    const last = seen.at(-1) as Batch;
    expect(last).toMatchObject({ total: 2, done: 2, failed: 0, inFlight: 0, waiting: 0, finished: true });
    // done never goes back
    for (let k = 1; k < seen.length; k++) expect((seen[k] as Batch).done).toBeGreaterThanOrEqual((seen[k - 1] as Batch).done);
    expect(await newestEngine(sets.r1a as string)).toBe(ENGINE_VERSION);
    expect(await newestEngine(sets.r1b as string)).toBe(ENGINE_VERSION);
    // the other revision, the current reading and the other lab are untouched
    expect(await readingCount(sets.r2old as string)).toBe(1);
    expect(await readingCount(sets.r2current as string)).toBe(1);
    expect(await readingCount(sets.other as string)).toBe(1);
    expect(await getDb()('analyses').where({ lab_id: b.labId })).toHaveLength(1);
  }, 150_000);

  it('re-analyses the rest of the project, and then has nothing left to do', async () => {
    await signInAs(a.userId);
    const started = await post({ projectId: a.projectId, revisionId: null });
    expect(started.status).toBe(202);
    expect((started.json.batch as Batch).total).toBe(1);
    const last = (await untilFinished((started.json.batch as Batch).id)).at(-1) as Batch;
    expect(last).toMatchObject({ total: 1, done: 1, finished: true });
    expect(await newestEngine(sets.r2old as string)).toBe(ENGINE_VERSION);
    expect(await readingCount(sets.r2current as string)).toBe(1);
    expect(await readingCount(sets.other as string)).toBe(1);
    const again = await post({ projectId: a.projectId, revisionId: null });
    expect(again.status).toBe(200);
    expect(again.json.batch).toBeNull();
    expect(again.json.message).toMatch(new RegExp(`engine ${ENGINE_VERSION.replace(/\./g, '\\.')}`));
  }, 150_000);

  it('keeps sets the lab’s queue cannot take yet waiting, and the worker queues them as room frees (reading progress changes nothing)', async () => {
    const db = getDb();
    const [r3] = await db('revisions').insert({ lab_id: a.labId, project_id: a.projectId, label: 'R3', position: 3 }).returning<{ id: string }[]>('id');
    const rev3 = (r3 as { id: string }).id;
    const first = await oldSet(a, rev3, 'R3 window', 406);
    const second = await oldSet(a, rev3, 'R3 lamp', 407);
    // the lab has all but one of its places in flight (rows the sweeper leaves alone: touched in the future)
    const { LAB_ANALYSIS_LIMIT } = await import('../../db/queries/analysis-requests');
    const future = new Date(Date.now() + 3_600_000);
    const fillers = await db('analyses')
      .insert(Array.from({ length: LAB_ANALYSIS_LIMIT - 1 }, () => ({ lab_id: a.labId, capture_set_id: sets.r2current, status: 'running', stage: 'measure', updated_at: future })))
      .returning<{ id: string }[]>('id');
    await signInAs(a.userId);
    const started = await post({ projectId: a.projectId, revisionId: rev3 });
    expect(started.status).toBe(202);
    expect(started.json.batch).toMatchObject({ total: 2, waiting: 1 });
    const batchId = (started.json.batch as Batch).id;
    await db('analyses').whereIn('id', fillers.map((f) => f.id)).delete();
    // nobody reads the progress meanwhile: the worker's sweeper queues the waiting set on its own
    const t0 = Date.now();
    for (;;) {
      const items: { analysis_id: string | null; status: string | null }[] = await db('reanalysis_items as i').leftJoin('analyses as n', 'n.id', 'i.analysis_id').where('i.batch_id', batchId).select('i.analysis_id', 'n.status');
      if (items.every((it) => it.analysis_id && it.status === 'done')) break;
      if (Date.now() - t0 > 120_000) throw new Error(`batch items still ${JSON.stringify(items)}\n${logs.slice(-20).join('')}`);
      await sleep(300);
    }
    // and reading it afterwards only reads
    const seen = await untilFinished(batchId);
    expect(seen.at(-1)).toMatchObject({ total: 2, done: 2, waiting: 0, finished: true });
    expect(await newestEngine(first)).toBe(ENGINE_VERSION);
    expect(await newestEngine(second)).toBe(ENGINE_VERSION);
  }, 150_000);

  it('shows a batch only to its own lab', async () => {
    const [batch] = await getDb()('reanalysis_batches').where({ lab_id: a.labId }).select<{ id: string }[]>('id');
    await signInAs(b.userId);
    expect((await poll((batch as { id: string }).id)).status).toBe(404);
    await signInAs(viewerId);
    expect((await poll((batch as { id: string }).id)).status).toBe(200);
  });
});
