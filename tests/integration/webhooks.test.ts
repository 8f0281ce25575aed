// Signed webhooks against a local receiver: finished and failed analyses and target changes are
// posted with a valid HMAC-SHA256 signature, a receiver's error is retried with backoff until it
// answers 2xx, a receiver that keeps failing ends as failed, and private addresses are refused
// unless allowed.
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestLab } from '../fixtures/test-lab';

const prefix = `vmwh${Math.random().toString(36).slice(2, 8)}`;
process.env.QUEUE_PREFIX = prefix;

const { getDb, closeDb } = await import('../../db/index');
const { createWebhook } = await import('../../db/queries/webhooks');
const { markAnalysisFailed } = await import('../../db/queries/analyses');
const { recordTargetState } = await import('../../db/queries/targets');
const { insertReading } = await import('../fixtures/readings-fixture');
const { startWebhookDelivery } = await import('../../lib/server/webhooks/runner');
const { deliverWebhook } = await import('../../lib/server/webhooks/deliver');
const { verifySignature } = await import('../../lib/webhooks/sign');
const { checkWebhookUrl, isPrivateAddress } = await import('../../lib/webhooks/url-policy');

type Received = { path: string; event: string; delivery: string; signature: string; body: string; at: number };
const received: Received[] = [];
// answers per path, in order; after the list runs out, 200
const script = new Map<string, number[]>();
let receiver: Server;
let base = '';
let lab: { labId: string; userId: string; projectId: string; revisionId: string };
let runner: ReturnType<typeof startWebhookDelivery>;
let redis: Redis;
const SECRET = 'vmwh_test-secret-for-signatures-0001';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
async function until<T>(what: string, f: () => Promise<T | undefined | false>, ms = 20_000): Promise<T> {
  const t0 = Date.now();
  for (;;) {
    const v = await f();
    if (v) return v;
    if (Date.now() - t0 > ms) throw new Error(`timed out waiting for ${what}`);
    await sleep(100);
  }
}

beforeAll(async () => {
  receiver = createServer((req, res) => {
    let body = '';
    req.on('data', (c: Buffer) => (body += c.toString()));
    req.on('end', () => {
      received.push({ path: req.url ?? '', event: String(req.headers['veilmeter-event']), delivery: String(req.headers['veilmeter-delivery']), signature: String(req.headers['veilmeter-signature']), body, at: Date.now() });
      const queue = script.get(req.url ?? '') ?? [];
      res.writeHead(queue.shift() ?? 200).end('ok');
    });
  });
  await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}`;
  lab = await createTestLab(getDb(), { tag: prefix, name: 'Webhook lab', project: 'Hook visor', revision: 'H1' });
  redis = new Redis(process.env.REDIS_URL!, { maxRetriesPerRequest: null });
  // a local receiver is a private address: allowed here as a development server allows it
  runner = startWebhookDelivery({ connection: redis, prefix, allowPrivate: true, sweepMs: 100, backoffMs: 500, attempts: 3 });
});

afterAll(async () => {
  await runner?.close();
  redis?.disconnect();
  receiver?.close();
  if (lab) {
    await getDb()('labs').where({ id: lab.labId }).delete();
    await getDb()('users').where({ id: lab.userId }).delete();
  }
  await closeDb();
});

describe('webhooks', () => {
  it('posts analysis.done, analysis.failed and target.changed, signed, and retries a failing receiver with growing waits', async () => {
    await createWebhook(lab.labId, lab.userId, { url: `${base}/hook`, secret: SECRET, events: ['analysis.done', 'analysis.failed', 'target.changed'] });
    script.set('/hook', [500, 503]);
    const [set] = await getDb()('capture_sets').insert({ lab_id: lab.labId, revision_id: lab.revisionId, label: 'Hooked', created_by: lab.userId }).returning<{ id: string }[]>('id');
    // a reading lands: the reading and "done" in one transaction, as the worker's final save writes them
    const [running] = await getDb()('analyses').insert({ lab_id: lab.labId, capture_set_id: set!.id, status: 'running' }).returning<{ id: string }[]>('id');
    const readingId = await getDb().transaction(async (trx) => {
      const [r] = await trx('readings')
        .insert({ lab_id: lab.labId, analysis_id: running!.id, capture_set_id: set!.id, revision_id: lab.revisionId, project_id: lab.projectId, variant: '', engine_version: 'fixture', ambient_contrast_ratio: 6.5, michelson: 0.73, luminance_on: 0.65, luminance_off: 0.1, clipped_fraction: 0, warning_count: 0, result: JSON.stringify({ engineVersion: 'fixture' }) })
        .returning<{ id: string }[]>('id');
      await trx('analyses').where({ id: running!.id }).update({ status: 'done', finished_at: trx.fn.now() });
      return r!.id;
    });
    const done = await until('analysis.done', async () => received.filter((r) => r.event === 'analysis.done' && r.path === '/hook').length >= 3 && received.filter((r) => r.event === 'analysis.done'));
    // two errors, then accepted: three attempts, waiting at least 0.5 s and then 1 s (exponential backoff)
    expect(done).toHaveLength(3);
    const waits = [done[1]!.at - done[0]!.at, done[2]!.at - done[1]!.at];
    expect(waits[0]).toBeGreaterThanOrEqual(450);
    expect(waits[1]).toBeGreaterThanOrEqual(950);
    expect(waits[1]).toBeGreaterThan(waits[0]!);
    const body = JSON.parse(done[2]!.body) as { id: string; event: string; data: Record<string, unknown> };
    expect(body.event).toBe('analysis.done');
    expect(body.data).toMatchObject({ captureSetId: set!.id, status: 'done', readingId, ambientContrastRatio: 6.5, projectId: lab.projectId, revisionId: lab.revisionId });
    for (const r of done) expect(verifySignature(SECRET, r.body, r.signature, Math.floor(Date.now() / 1000)), r.signature).toBe(true);
    expect(verifySignature('vmwh_another-secret', done[2]!.body, done[2]!.signature, Math.floor(Date.now() / 1000))).toBe(false);
    expect(verifySignature(SECRET, done[2]!.body.replace('6.5', '9.5'), done[2]!.signature, Math.floor(Date.now() / 1000))).toBe(false);
    const row = await until('delivered row', async () => getDb()('webhook_deliveries').where({ id: body.id, status: 'delivered' }).first('attempts', 'last_status'));
    expect(row).toMatchObject({ attempts: 3, last_status: 200 });

    const [queued] = await getDb()('analyses').insert({ lab_id: lab.labId, capture_set_id: set!.id, status: 'queued' }).returning<{ id: string }[]>('id');
    await markAnalysisFailed(lab.labId, queued!.id, 'No display light found between the on and off photos');
    const failed = await until('analysis.failed', async () => received.find((r) => r.event === 'analysis.failed'));
    expect(JSON.parse(failed.body).data).toMatchObject({ analysisId: queued!.id, status: 'failed', error: 'No display light found between the on and off photos' });

    const [target] = await getDb()('targets').insert({ lab_id: lab.labId, project_id: lab.projectId, metric: 'ambientContrastRatio', comparator: '>=', value: 10, condition_note: '' }).returning<{ id: string }[]>('id');
    await recordTargetState(lab.labId, target!.id, lab.revisionId, true, '');
    await recordTargetState(lab.labId, target!.id, lab.revisionId, true, ''); // unchanged: no post
    await recordTargetState(lab.labId, target!.id, lab.revisionId, false, '');
    await until('two target posts', async () => received.filter((r) => r.event === 'target.changed').length >= 2);
    await sleep(500);
    const changes = received.filter((r) => r.event === 'target.changed').map((r) => JSON.parse(r.body).data as { failing: boolean; targetId: string; metric: string });
    expect(changes.map((c) => c.failing)).toEqual([true, false]);
    expect(changes[0]).toMatchObject({ targetId: target!.id, metric: 'ambientContrastRatio' });
  });

  it('marks a delivery failed after its last attempt, and delivers only the events asked for', async () => {
    await createWebhook(lab.labId, lab.userId, { url: `${base}/down`, secret: SECRET, events: ['analysis.failed'] });
    script.set('/down', [500, 500, 500, 500]);
    const [set] = await getDb()('capture_sets').insert({ lab_id: lab.labId, revision_id: lab.revisionId, label: 'Down', created_by: lab.userId }).returning<{ id: string }[]>('id');
    await insertReading(lab.labId, lab.projectId, lab.revisionId, set!.id, { acr: 3 });
    const [queued] = await getDb()('analyses').insert({ lab_id: lab.labId, capture_set_id: set!.id, status: 'queued' }).returning<{ id: string }[]>('id');
    await markAnalysisFailed(lab.labId, queued!.id, 'Camera moved');
    const row = await until('failed delivery', async () =>
      getDb()('webhook_deliveries as d').join('webhooks as w', 'w.id', 'd.webhook_id').where({ 'w.url': `${base}/down`, 'd.status': 'failed' }).first('d.attempts', 'd.last_status', 'd.last_error', 'd.event'),
    );
    expect(row).toMatchObject({ attempts: 3, last_status: 500, last_error: 'Answered 500', event: 'analysis.failed' });
    expect(received.filter((r) => r.path === '/down').map((r) => r.event)).toEqual(['analysis.failed', 'analysis.failed', 'analysis.failed']);
  });

  it('refuses loopback and private receivers unless allowed, at registration and at delivery', async () => {
    // RFC 1918, RFC 6598, RFC 3927 and RFC 4193 ranges, loopback and unspecified
    for (const a of ['127.0.0.1', '10.1.2.3', '172.20.0.1', '192.168.1.9', '100.64.0.1', '169.254.169.254', '0.0.0.0', '::1', 'fd00::1', 'fe80::1', '::ffff:127.0.0.1']) expect(isPrivateAddress(a), a).toBe(true);
    // documentation ranges (RFC 5737, RFC 3849) stand in for public addresses: they are not private
    for (const a of ['203.0.113.10', '198.51.100.7', '2001:db8::1', '172.32.0.1']) expect(isPrivateAddress(a), a).toBe(false);
    const resolve = async (host: string) => (host === 'rig-hub.example.test' ? ['203.0.113.10'] : host === 'inside.example.test' ? ['203.0.113.11', '10.0.0.5'] : []);
    expect(await checkWebhookUrl('https://rig-hub.example.test/hook', { allowPrivate: false, resolve })).toMatchObject({ ok: true });
    expect(await checkWebhookUrl('https://inside.example.test/hook', { allowPrivate: false, resolve })).toMatchObject({ ok: false, message: expect.stringMatching(/local or private address/) });
    expect(await checkWebhookUrl('http://127.0.0.1:9/hook', { allowPrivate: false, resolve })).toMatchObject({ ok: false });
    expect(await checkWebhookUrl('http://[::1]:9/hook', { allowPrivate: false, resolve })).toMatchObject({ ok: false });
    expect(await checkWebhookUrl('ftp://rig-hub.example.test/', { allowPrivate: true, resolve })).toMatchObject({ ok: false });
    expect(await checkWebhookUrl('https://user:pw@rig-hub.example.test/', { allowPrivate: true, resolve })).toMatchObject({ ok: false });
    expect(await checkWebhookUrl('http://127.0.0.1:9/hook', { allowPrivate: true, resolve })).toMatchObject({ ok: true });

    // a delivery to a loopback receiver where private addresses are not allowed: refused, nothing sent
    const { id } = await createWebhook(lab.labId, lab.userId, { url: `${base}/private`, secret: SECRET, events: ['target.changed'] });
    const [d] = await getDb()('webhook_deliveries').insert({ lab_id: lab.labId, webhook_id: id, event: 'target.changed', payload: JSON.stringify({}) }).returning<{ id: string }[]>('id');
    await expect(deliverWebhook(lab.labId, d!.id, { allowPrivate: false, final: true })).rejects.toThrow(/local or private address/);
    expect(await getDb()('webhook_deliveries').where({ id: d!.id }).first('status')).toMatchObject({ status: 'failed' });
    expect(received.filter((r) => r.path === '/private')).toHaveLength(0);
  });
});
