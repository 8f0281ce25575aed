// The analysis pipeline against real PostgreSQL, a private Redis and real worker processes.
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { freePort } from '../fixtures/free-port';
import { TestRedis } from '../fixtures/redis-server';
import { addCaptureSet, createTestLab } from '../fixtures/test-lab';
import { removeWorkerBuild, spawnReady, workerArgs } from '../fixtures/worker-process';

const tmp = mkdtempSync(join(tmpdir(), 'vm-worker-'));
const prefix = `vmtest${Math.random().toString(36).slice(2, 8)}`;
let redis: TestRedis;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

// environment first: lib/env.ts reads it once, at first use
process.env.STORAGE_DIR = join(tmp, 'storage');
process.env.QUEUE_PREFIX = prefix;

type Mods = {
  db: typeof import('../../db/index');
  analyses: typeof import('../../db/queries/analyses');
  readings: typeof import('../../db/queries/readings');
  producer: typeof import('../../lib/server/queue/producer');
  jobs: typeof import('../../lib/server/queue/jobs');
  names: typeof import('../../lib/server/queue/names');
  storage: typeof import('../../lib/server/storage');
};
let m: Mods;
let labId = '';
let userId = '';
let revisionId = '';
let queueRedis: Redis;
let queue: Queue;
const workers: ChildProcess[] = [];
const logs: string[] = [];

function spawnWorker(): Promise<ChildProcess> {
  const env = { ...process.env, REDIS_URL: redis.url, QUEUE_PREFIX: prefix, STORAGE_DIR: join(tmp, 'storage'), WORKER_CONCURRENCY: '2' };
  return spawnReady(workerArgs('--sweep-every=1', '--sweep-grace=1'), { env, what: 'worker', log: logs, track: workers });
}

function killGroup(child: ChildProcess, signal: NodeJS.Signals): void {
  if (child.pid && child.exitCode === null) {
    try {
      process.kill(-child.pid, signal);
    } catch {
      // already gone
    }
  }
}

function newCaptureSet(label: string, capture: RenderedCapture, opts: { regions?: boolean } = {}): Promise<string> {
  return addCaptureSet(m.db.getDb(), { labId, userId, revisionId }, label, capture, opts);
}

async function waitFor(analysisId: string, statuses: string[], timeoutMs = 60_000) {
  const t0 = Date.now();
  for (;;) {
    const a = await m.analyses.getAnalysis(labId, analysisId);
    if (a && statuses.includes(a.status)) return a;
    if (Date.now() - t0 > timeoutMs) throw new Error(`analysis ${analysisId} still ${a?.status}/${a?.stage} after ${timeoutMs} ms\n${logs.slice(-20).join('')}`);
    await sleep(150);
  }
}

// distinct seeds: every photo in a lab is stored once, so each set needs its own pixels
let seed = 100;
const small = () => renderCapture({ width: 320, height: 240, seed: seed++, ghost: null });

beforeAll(async () => {
  redis = new TestRedis(tmp, await freePort());
  redis.start();
  process.env.REDIS_URL = redis.url;
  m = {
    db: await import('../../db/index'),
    analyses: await import('../../db/queries/analyses'),
    readings: await import('../../db/queries/readings'),
    producer: await import('../../lib/server/queue/producer'),
    jobs: await import('../../lib/server/queue/jobs'),
    names: await import('../../lib/server/queue/names'),
    storage: await import('../../lib/server/storage'),
  };
  const db = m.db.getDb();
  ({ labId, userId, revisionId } = await createTestLab(db, { tag: prefix, name: 'Worker test', project: 'Bench rig', revision: 'R1' }));
  queueRedis = new Redis(redis.url, { maxRetriesPerRequest: 1, enableOfflineQueue: false, retryStrategy: (n) => Math.min(n * 100, 500) });
  queueRedis.on('error', () => undefined);
  await new Promise<void>((r) => queueRedis.once('ready', () => r()));
  queue = m.producer.createAnalysisQueue(queueRedis, prefix);
  await spawnWorker();
});

afterAll(async () => {
  for (const w of workers) killGroup(w, 'SIGTERM');
  await sleep(500);
  for (const w of workers) killGroup(w, 'SIGKILL');
  await queue?.close().catch(() => undefined);
  queueRedis?.disconnect();
  if (labId) {
    const db = m.db.getDb();
    await db('labs').where({ id: labId }).delete();
    await db('users').where({ id: userId }).delete();
  }
  await m?.db.closeDb();
  redis?.stop();
  rmSync(tmp, { recursive: true, force: true });
  removeWorkerBuild();
});

describe('analysis worker', () => {
  it('turns an uploaded triplet into a reading close to the generator truth', async () => {
    const capture = await renderCapture({ width: 480, height: 360, seed: 7 });
    const setId = await newCaptureSet('round trip', capture);
    const { analysis, enqueued } = await m.producer.requestAnalysis(labId, userId, setId, queue);
    expect(enqueued).toBe(true);
    const done = await waitFor(analysis.id, ['done', 'failed']);
    expect(done.error).toBeNull();
    expect(done.status).toBe('done');
    expect(done.progress).toBe(100);
    const reading = await m.readings.getReadingForAnalysis(labId, analysis.id);
    expect(reading).not.toBeNull();
    const acr = reading?.ambientContrastRatio ?? 0;
    expect(Math.abs(acr / capture.truth.ambientContrastRatio - 1)).toBeLessThan(0.015);
    expect(reading?.transmission).toBeCloseTo(capture.truth.transmission, 1);
    const storage = m.storage.getStorage();
    expect(await storage.stat(reading?.artifacts.logContrastKey ?? 'missing/x')).not.toBeNull();
    expect(await storage.stat(reading?.artifacts.differenceKey ?? 'missing/x')).not.toBeNull();
    expect(reading?.artifacts.data?.histograms.on?.counts.length).toBeGreaterThan(0);
  });

  it('fails bad input at once with the engine message and does not retry it', async () => {
    const setId = await newCaptureSet('outside', await small(), { regions: false });
    // bypass the API's own check to reach the engine's: a screen beyond the photo's right edge
    await m.db.getDb()('regions').insert({ lab_id: labId, capture_set_id: setId, kind: 'screen', x: 300, y: 10, w: 100, h: 50 });
    const { analysis } = await m.producer.requestAnalysis(labId, userId, setId, queue);
    const failed = await waitFor(analysis.id, ['done', 'failed'], 30_000);
    expect(failed.status).toBe('failed');
    expect(failed.attempts).toBe(1);
    expect(failed.error).toMatch(/screen region .* outside/);
    expect(failed.error).not.toMatch(/at |Error:/);
    const job = await queue.getJob(m.names.analysisJobId(analysis.id));
    expect(job?.attemptsMade).toBe(1);
    expect(await m.readings.getReadingForAnalysis(labId, analysis.id)).toBeNull();
  });

  it('runs 20 queued analyses on two workers, each exactly once', async () => {
    await spawnWorker();
    // a set of their own each: a second request for a set whose analysis is still queued gets that analysis back
    const setIds: string[] = [];
    for (let k = 0; k < 20; k++) setIds.push(await newCaptureSet(`batch ${k}`, await small()));
    const ids: string[] = [];
    for (let k = 0; k < 20; k++) ids.push((await m.producer.requestAnalysis(labId, userId, setIds[k] as string, queue)).analysis.id);
    expect(new Set(ids).size).toBe(20);
    for (const id of ids) {
      const a = await waitFor(id, ['done', 'failed'], 90_000);
      expect(a.status).toBe('done');
      expect(a.attempts).toBe(1);
    }
    const n = await m.db.getDb()('readings').whereIn('analysis_id', ids).count<{ count: string }[]>('* as count').first();
    expect(Number(n?.count)).toBe(20);
  }, 120_000);

  it('puts a queued analysis back on the queue after Redis lost its job', async () => {
    const setId = await newCaptureSet('lost job', await small());
    const analysis = await m.analyses.createAnalysis(labId, userId, setId);
    // a delayed job no worker takes yet, then gone, as after a Redis restart without its data
    await queue.add('analyse', { analysisId: analysis.id, labId }, { jobId: m.names.analysisJobId(analysis.id), delay: 600_000 });
    await (await queue.getJob(m.names.analysisJobId(analysis.id)))?.remove();
    expect(await queue.getJob(m.names.analysisJobId(analysis.id))).toBeUndefined();
    const done = await waitFor(analysis.id, ['done', 'failed'], 30_000);
    expect(done.status).toBe('done');
  });

  it('answers fast with Redis down, keeps the analysis queued and finishes it once Redis is back', async () => {
    const setId = await newCaptureSet('redis down', await small());
    redis.stop();
    await sleep(300);
    const t0 = Date.now();
    const { analysis, enqueued } = await m.producer.requestAnalysis(labId, userId, setId, queue);
    const elapsed = Date.now() - t0;
    expect(enqueued).toBe(false);
    expect(elapsed).toBeLessThan(2000);
    expect((await m.analyses.getAnalysis(labId, analysis.id))?.status).toBe('queued');
    redis.start();
    const done = await waitFor(analysis.id, ['done', 'failed'], 45_000);
    expect(done.status).toBe('done');
  }, 60_000);

  it('completes a job after its worker was killed mid-run', async () => {
    for (const w of workers) killGroup(w, 'SIGKILL');
    await sleep(300);
    await spawnWorker();
    const big = await renderCapture({ width: 3200, height: 2400, seed: 4242, ghost: null, noise: 0.004 });
    const setId = await newCaptureSet('killed', big);
    const { analysis } = await m.producer.requestAnalysis(labId, userId, setId, queue);
    await waitFor(analysis.id, ['running', 'done'], 30_000);
    const running = workers.filter((w) => w.exitCode === null && w.signalCode === null);
    for (const w of running) killGroup(w, 'SIGKILL');
    const killedWhile = await m.analyses.getAnalysis(labId, analysis.id);
    expect(killedWhile?.status).toBe('running');
    await spawnWorker();
    const done = await waitFor(analysis.id, ['done', 'failed'], 60_000);
    expect(done.status, `error: ${done.error ?? 'none'}`).toBe('done');
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    const n = await m.db.getDb()('readings').where({ analysis_id: analysis.id }).count<{ count: string }[]>('* as count').first();
    expect(Number(n?.count)).toBe(1);
  }, 120_000);
});
