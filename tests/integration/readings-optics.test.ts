// A worker-analysed capture set keeps the optics' own transmission, the veil and every figure's
// uncertainty in its reading row, and the readings contract (export rows and CSV, trends, a target
// on the optics' transmission) carries them. Real PostgreSQL, a private Redis and a real worker.
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture } from '../fixtures/capture-generator';
import { freePort } from '../fixtures/free-port';
import { TestRedis } from '../fixtures/redis-server';
import { addCaptureSet, createTestLab } from '../fixtures/test-lab';
import { removeWorkerBuild, spawnReady, workerArgs } from '../fixtures/worker-process';

const tmp = mkdtempSync(join(tmpdir(), 'vm-optics-'));
const prefix = `vmoptics${Math.random().toString(36).slice(2, 8)}`;
let redis: TestRedis;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

process.env.STORAGE_DIR = join(tmp, 'storage');
process.env.QUEUE_PREFIX = prefix;

type Mods = {
  db: typeof import('../../db/index');
  analyses: typeof import('../../db/queries/analyses');
  readings: typeof import('../../db/queries/readings');
  exports: typeof import('../../db/queries/exports');
  trends: typeof import('../../db/queries/trends');
  targets: typeof import('../../db/queries/targets');
  regions: typeof import('../../db/queries/regions');
  csv: typeof import('../../lib/server/reports/csv');
  producer: typeof import('../../lib/server/queue/producer');
};
let m: Mods;
let lab = { labId: '', userId: '', projectId: '', revisionId: '' };
let queueRedis: Redis;
let queue: Queue;
const workers: ChildProcess[] = [];
const logs: string[] = [];

async function waitFor(analysisId: string, timeoutMs = 90_000) {
  const t0 = Date.now();
  for (;;) {
    const a = await m.analyses.getAnalysis(lab.labId, analysisId);
    if (a && (a.status === 'done' || a.status === 'failed')) return a;
    if (Date.now() - t0 > timeoutMs) throw new Error(`analysis ${analysisId} still ${a?.status} after ${timeoutMs} ms\n${logs.slice(-20).join('')}`);
    await sleep(150);
  }
}

beforeAll(async () => {
  redis = new TestRedis(tmp, await freePort());
  redis.start();
  process.env.REDIS_URL = redis.url;
  m = {
    db: await import('../../db/index'),
    analyses: await import('../../db/queries/analyses'),
    readings: await import('../../db/queries/readings'),
    exports: await import('../../db/queries/exports'),
    trends: await import('../../db/queries/trends'),
    targets: await import('../../db/queries/targets'),
    regions: await import('../../db/queries/regions'),
    csv: await import('../../lib/server/reports/csv'),
    producer: await import('../../lib/server/queue/producer'),
  };
  lab = await createTestLab(m.db.getDb(), { tag: prefix, name: 'Optics test', project: 'Visor T', revision: 'R1' });
  queueRedis = new Redis(redis.url, { maxRetriesPerRequest: 1, enableOfflineQueue: false, retryStrategy: (n) => Math.min(n * 100, 500) });
  queueRedis.on('error', () => undefined);
  await new Promise<void>((r) => queueRedis.once('ready', () => r()));
  queue = m.producer.createAnalysisQueue(queueRedis, prefix);
  const env = { ...process.env, REDIS_URL: redis.url, QUEUE_PREFIX: prefix, STORAGE_DIR: join(tmp, 'storage'), WORKER_CONCURRENCY: '1' };
  await spawnReady(workerArgs(), { env, what: 'worker', log: logs, track: workers });
}, 120_000);

afterAll(async () => {
  for (const w of workers) if (w.pid && w.exitCode === null) try { process.kill(-w.pid, 'SIGKILL'); } catch { /* gone */ }
  await queue?.close().catch(() => undefined);
  queueRedis?.disconnect();
  if (lab.labId) {
    const db = m.db.getDb();
    await db('labs').where({ id: lab.labId }).delete();
    await db('users').where({ id: lab.userId }).delete();
  }
  await m?.db.closeDb();
  redis?.stop();
  rmSync(tmp, { recursive: true, force: true });
  removeWorkerBuild();
});

describe('readings of the optics and their uncertainty', () => {
  it('stores transmission_optics, veil and uncertainty, and the export, trends and targets carry them', async () => {
    // optics passing 60% with a veil of 0.01 (linear, every channel); the fit runs over the room around the display
    const capture = await renderCapture({ width: 480, height: 360, seed: 31, transmission: 0.6, veil: 0.01 });
    const setId = await addCaptureSet(m.db.getDb(), lab, 'optics', capture, { regions: false });
    await m.regions.replaceRegions(lab.labId, lab.userId, setId, [{ kind: 'screen', ...capture.truth.screen, source: 'marked' }]);
    const { analysis } = await m.producer.requestAnalysis(lab.labId, lab.userId, setId, queue);
    const done = await waitFor(analysis.id);
    expect(done.error).toBeNull();
    expect(done.status).toBe('done');

    const row = await m.db.getDb()('readings').where({ lab_id: lab.labId, analysis_id: analysis.id }).first('transmission_optics', 'veil', 'veil_cdm2', 'mtf50', 'display_duv', 'uncertainty', 'engine_version');
    expect(row.engine_version).toBe('1.2.0');
    expect(Math.abs(row.transmission_optics - 0.6)).toBeLessThan(0.01);
    expect(row.veil).toBeGreaterThan(0);
    // no camera profile: no cd/m²; a full-white pattern: no MTF50
    expect(row.veil_cdm2).toBeNull();
    expect(row.mtf50).toBeNull();
    for (const k of ['ambientContrastRatio', 'michelson', 'uniformity', 'transmission', 'transmissionOptics', 'veil']) expect(row.uncertainty[k], k).toBeGreaterThan(0);

    const reading = await m.readings.getReadingForAnalysis(lab.labId, analysis.id);
    expect(reading?.transmissionOptics).toBe(row.transmission_optics);
    expect(reading?.uncertainty.transmissionOptics).toBe(row.uncertainty.transmissionOptics);
    expect(reading?.result.veil?.source).toBe('outside-screen');

    // export rows and CSV: the figure and its uncertainty column
    const rows = await m.exports.listExportRows(lab.labId, { projectId: lab.projectId });
    expect(rows[0]?.transmissionOptics).toBe(row.transmission_optics);
    const csv = m.csv.readingsCsv(rows).split('\r\n');
    const header = (csv[0] as string).split(',');
    const values = (csv[1] as string).split(',');
    const col = (h: string) => values[header.findIndex((x) => x.startsWith(h))];
    expect(Number(col('transmission_optics'))).toBe(row.transmission_optics);
    expect(Number(col('u_transmission_optics'))).toBe(row.uncertainty.transmissionOptics);
    expect(Number(col('veil ('))).toBe(row.veil);

    // trends and the rig API's readings page
    const trend = await m.trends.getProjectTrend(lab.labId, lab.projectId);
    expect(trend?.trends.transmissionOptics.revisions[0]?.points[0]?.value).toBe(row.transmission_optics);
    // each trend point carries its reading's uncertainty, for the ± beside it
    expect(trend?.trends.transmissionOptics.revisions[0]?.points[0]?.u).toBe(row.uncertainty.transmissionOptics);
    const page = await m.trends.listNewestReadingsPage(lab.labId, lab.projectId, { limit: 10, offset: 0 });
    expect(page.readings[0]?.values.veil).toBe(row.veil);
    expect(page.readings[0]?.uncertainty.veil).toBe(row.uncertainty.veil);

    // a target on the optics' own transmission is judged on it
    const target = await m.targets.createTarget(lab.labId, lab.userId, lab.projectId, { metric: 'transmissionOptics', comparator: '>=', value: 0.55, conditionNote: '', isDefault: false });
    expect(target).not.toBeNull();
    const checks = await m.targets.checkRevisionTargets(lab.labId, lab.projectId, lab.revisionId);
    const check = checks.find((c) => c.target.metric === 'transmissionOptics');
    expect(check?.status).toBe('pass');
    expect(check?.mean).toBe(row.transmission_optics);
  }, 150_000);
});
