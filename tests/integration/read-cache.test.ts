import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { getAnalysis } from '../../db/queries/analyses';
import { listExportRows } from '../../db/queries/exports';
import { getReadingForAnalysis } from '../../db/queries/readings';
import { createTarget, listTargets, updateTarget } from '../../db/queries/targets';
import { getProjectDataVersion, getProjectTrend, listNewestReadings } from '../../db/queries/trends';
import { fromTrendAnswer, toTrendAnswer } from '../../lib/targets/trend-answer';
import { createUserWithLab } from '../../db/queries/users';
import { stageLabel } from '../../lib/server/queue/jobs';
import { readingsCsv } from '../../lib/server/reports/csv';
import { jar, signInAs } from '../fixtures/request-context';
import { deleteFixtureProject, insertFixtureProject, insertReading, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// The route handlers run as in `next start`, with the request's cookies supplied here: a real
// next-auth session token and the lab cookie.
vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));

const { GET: trendGET } = await import('../../app/api/projects/[projectId]/trend/route');
const { GET: csvGET } = await import('../../app/api/projects/[projectId]/readings.csv/route');
const { GET: pollGET } = await import('../../app/api/analyses/[analysisId]/route');
const { GET: listGET } = await import('../../app/api/projects/[projectId]/readings/route');
const { clearReadCache, readCacheStats } = await import('../../lib/server/cache/read-cache');

const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let both: string;
let fx: Fixture;

type Handler = (req: Request, ctx: never) => Promise<Response>;
async function call(get: Handler, url: string, params: Record<string, string>, headers: Record<string, string> = {}): Promise<{ status: number; headers: Headers; text: string; bytes: Buffer }> {
  const res = await get(new Request(url, { headers }), { params: Promise.resolve(params) } as never);
  const bytes = Buffer.from(await res.arrayBuffer());
  // bytes, not res.text(): that would drop the CSV's byte-order mark
  return { status: res.status, headers: res.headers, text: bytes.toString('utf8'), bytes };
}
const trend = (projectId: string) => call(trendGET, `http://127.0.0.1/api/projects/${projectId}/trend`, { projectId });
const list = (projectId: string, query = '') => call(listGET, `http://127.0.0.1/api/projects/${projectId}/readings${query}`, { projectId });
const csv = (projectId: string) => call(csvGET, `http://127.0.0.1/api/projects/${projectId}/readings.csv`, { projectId });

/** What the routes answered before the cache, built straight from the queries. */
async function uncachedTrend(labId: string, projectId: string): Promise<string> {
  const t = await getProjectTrend(labId, projectId);
  const targets = await listTargets(labId, projectId);
  return JSON.stringify(toTrendAnswer(t!.revisions, t!.trends, targets));
}
const uncachedCsv = async (labId: string, projectId: string) => `\uFEFF${readingsCsv(await listExportRows(labId, { projectId }))}`;

beforeAll(async () => {
  a = await createUserWithLab({ email: `ca-${tag}@example.test`, name: 'Cache A', passwordHash: 'x', labName: `Cache A ${tag}`, emailVerified: true });
  b = await createUserWithLab({ email: `cb-${tag}@example.test`, name: 'Cache B', passwordHash: 'x', labName: `Cache B ${tag}`, emailVerified: true });
  const [u] = await getDb()('users').insert({ email: `cboth-${tag}@example.test`, name: 'Cache both', password_hash: 'x', email_verified_at: new Date() }).returning<{ id: string }[]>('id');
  both = u!.id;
  await getDb()('memberships').insert([{ lab_id: b.labId, user_id: both, role: 'lead' }, { lab_id: a.labId, user_id: both, role: 'lead' }]);
  fx = await insertFixtureProject(a.labId, `Cache visor ${tag}`, [
    { label: 'R-1', variants: [{ variant: '', readings: [{ acr: 1.2 }, { acr: 1.22 }] }] },
    { label: 'R-2', variants: [{ variant: 'a', readings: [{ acr: 1.3 }] }] },
  ]);
  await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 1.25, conditionNote: '', isDefault: false });
});

beforeEach(() => clearReadCache());

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId, both], fx.projectId);
  await closeDb();
});

describe('read cache of the trend and the readings list', () => {
  it('answers the same bytes as building them afresh, from memory the second time', async () => {
    await signInAs(a.userId);
    const first = await trend(fx.projectId);
    expect(first.status).toBe(200);
    expect(first.headers.get('content-type')).toBe('application/json');
    expect(first.headers.get('cache-control')).toBe('private, no-store');
    expect(first.text).toBe(await uncachedTrend(a.labId, fx.projectId));
    const c = await csv(fx.projectId);
    expect(c.status).toBe(200);
    expect(c.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(c.headers.get('content-disposition')).toMatch(/^attachment; filename="Cache-visor-.*-readings\.csv"$/);
    expect(c.text).toBe(await uncachedCsv(a.labId, fx.projectId));
    expect(readCacheStats().entries).toBe(2);
    expect((await trend(fx.projectId)).text).toBe(first.text);
  });

  it('is replaced at once by a new reading', async () => {
    await signInAs(a.userId);
    const before = await trend(fx.projectId);
    const beforeCsv = await csv(fx.projectId);
    const rev = fx.revisions['R-2']!;
    const readingId = await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[0]!, { acr: 1.9 }, new Date(Date.now() + 60_000));
    const after = await trend(fx.projectId);
    const afterCsv = await csv(fx.projectId);
    expect(after.text).not.toBe(before.text);
    expect(after.text).toBe(await uncachedTrend(a.labId, fx.projectId));
    expect(afterCsv.text).not.toBe(beforeCsv.text);
    expect(afterCsv.text).toContain(readingId);
    expect(afterCsv.text).toBe(await uncachedCsv(a.labId, fx.projectId));
  });

  it('is replaced at once by a changed target', async () => {
    await signInAs(a.userId);
    const before = await trend(fx.projectId);
    const [t] = await listTargets(a.labId, fx.projectId);
    await updateTarget(a.labId, a.userId, fx.projectId, t!.id, { metric: 'ambientContrastRatio', comparator: '>=', value: 1.4, conditionNote: 'changed', isDefault: false });
    const after = await trend(fx.projectId);
    expect(after.text).not.toBe(before.text);
    expect(JSON.parse(after.text).targets[0].value).toBe(1.4);
    expect(after.text).toBe(await uncachedTrend(a.labId, fx.projectId));
  });

  it('is replaced when a reading is edited inside a transaction older than the newest row', async () => {
    await signInAs(a.userId);
    const rev = fx.revisions['R-1']!;
    const older = getDb().transaction();
    const trx = await older;
    // the transaction's now() is fixed here, before the newer reading below is written
    await trx.raw('SELECT now()');
    await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[1]!, { acr: 1.5 }, new Date(Date.now() + 120_000));
    const before = await trend(fx.projectId);
    // an older row, so neither the count nor the newest updated_at moves: only the sum does
    const newest = await getDb()('readings').where({ capture_set_id: rev.captureSetIds[0] }).orderBy('created_at', 'desc').first('id');
    await trx('readings').where({ id: newest.id }).update({ ambient_contrast_ratio: 1.55, updated_at: trx.fn.now() });
    await trx.commit();
    const after = await trend(fx.projectId);
    expect(after.text).not.toBe(before.text);
    expect(after.text).toBe(await uncachedTrend(a.labId, fx.projectId));
  });

  it('moves its version on every write to the project’s rows, and only then', async () => {
    const version = () => getProjectDataVersion(a.labId, fx.projectId);
    const rev = fx.revisions['R-1']!;
    const setId = rev.captureSetIds[0]!;
    const other = await insertFixtureProject(a.labId, `Cache other ${tag}`, [{ label: 'O-1', variants: [{ variant: '', readings: [{ acr: 2 }] }] }]);
    try {
      const seen = [await version()];
      const expectMoved = async (what: string) => {
        const v = await version();
        expect(seen, what).not.toContain(v);
        seen.push(v);
      };
      // writes elsewhere leave it alone
      await getDb()('revisions').where({ id: other.revisions['O-1']!.id }).update({ label: 'O-1 renamed' });
      await getDb()('readings').where({ project_id: other.projectId }).update({ ambient_contrast_ratio: 2.5 });
      expect(await version()).toBe(seen[0]);
      await getDb()('revisions').where({ id: rev.id }).update({ label: 'R-1 renamed' });
      await expectMoved('revision renamed');
      await getDb()('capture_sets').where({ id: setId }).update({ label: 'set renamed' });
      await expectMoved('capture set relabelled');
      const readingId = await insertReading(a.labId, fx.projectId, rev.id, setId, { acr: 1.7 }, new Date(Date.now() + 180_000));
      await expectMoved('reading added');
      await getDb()('readings').where({ id: readingId }).delete();
      await expectMoved('reading deleted');
      const [t] = await listTargets(a.labId, fx.projectId);
      await getDb()('targets').where({ id: t!.id }).update({ condition_note: 'moved' });
      await expectMoved('target edited');
      // the cached answers follow: the renamed revision is in the next trend at once
      await signInAs(a.userId);
      expect((await trend(fx.projectId)).text).toContain('R-1 renamed');
      await getDb()('revisions').where({ id: rev.id }).update({ label: 'R-1' });
      expect((await trend(fx.projectId)).text).toBe(await uncachedTrend(a.labId, fx.projectId));
    } finally {
      await deleteFixtureProject(other.projectId);
    }
    expect(await getProjectDataVersion(b.labId, fx.projectId)).toBeNull();
  });

  it('never gives another lab the cached body', async () => {
    await signInAs(a.userId);
    expect((await trend(fx.projectId)).status).toBe(200);
    expect((await csv(fx.projectId)).status).toBe(200);
    await signInAs(b.userId);
    for (const r of [await trend(fx.projectId), await csv(fx.projectId)]) {
      expect(r.status).toBe(404);
      expect(r.text).not.toContain('Cache visor');
    }
    // a member of both labs acting in the other one is refused too, though the body is warm
    await signInAs(both, { labId: b.labId });
    expect((await trend(fx.projectId)).status).toBe(404);
    expect((await csv(fx.projectId)).status).toBe(404);
    await signInAs(both, { labId: a.labId });
    expect((await trend(fx.projectId)).text).toBe(await uncachedTrend(a.labId, fx.projectId));
  });

  it('still asks who is signed in: no session is 401', async () => {
    jar.clear();
    expect((await trend(fx.projectId)).status).toBe(401);
    expect((await csv(fx.projectId)).status).toBe(401);
  });
});

describe('readings list, a page at a time', () => {
  type Page = { readings: { readingId: string; captureSetId: string; revisionLabel: string; createdAt: string; values: { ambientContrastRatio: number | null } }[]; total: number; limit: number; offset: number };
  it('pages through the newest reading of every capture set, newest first, without overlap', async () => {
    await signInAs(a.userId);
    const everything = (await listNewestReadings(a.labId, { projectId: fx.projectId })).sort((x, y) => y.createdAt.getTime() - x.createdAt.getTime() || y.readingId.localeCompare(x.readingId));
    const first = await list(fx.projectId);
    expect(first.status).toBe(200);
    const whole = JSON.parse(first.text) as Page;
    expect(whole).toMatchObject({ total: everything.length, limit: 50, offset: 0 });
    expect(whole.readings.map((r) => r.readingId)).toEqual(everything.map((r) => r.readingId));
    const seen: string[] = [];
    for (let offset = 0; offset < everything.length + 2; offset += 2) {
      const page = JSON.parse((await list(fx.projectId, `?limit=2&offset=${offset}`)).text) as Page;
      expect(page.readings.length).toBe(Math.max(0, Math.min(2, everything.length - offset)));
      seen.push(...page.readings.map((r) => r.readingId));
    }
    expect(seen).toEqual(everything.map((r) => r.readingId));
    expect(whole.readings.every((r) => r.revisionLabel === 'R-1' || r.revisionLabel === 'R-2')).toBe(true);
  });

  it('refuses a bad page with 422 and field messages, and another lab with 404', async () => {
    await signInAs(a.userId);
    for (const [query, field] of [['?limit=0', 'limit'], ['?limit=501', 'limit'], ['?limit=2.5', 'limit'], ['?limit=ten', 'limit'], ['?offset=-1', 'offset']] as const) {
      const r = await list(fx.projectId, query);
      expect(r.status, query).toBe(422);
      expect(JSON.parse(r.text).error.fieldErrors[field], query).toBeTruthy();
    }
    await signInAs(b.userId);
    const other = await list(fx.projectId);
    expect(other.status).toBe(404);
    expect(other.text).not.toContain('R-1');
  });

  it('shows a new reading on the first page at once', async () => {
    await signInAs(a.userId);
    const before = JSON.parse((await list(fx.projectId, '?limit=1')).text) as Page;
    const rev = fx.revisions['R-2']!;
    const readingId = await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[0]!, { acr: 1.95 }, new Date(Date.now() + 240_000));
    const after = JSON.parse((await list(fx.projectId, '?limit=1')).text) as Page;
    expect(after.readings[0]?.readingId).toBe(readingId);
    expect(after.readings[0]?.readingId).not.toBe(before.readings[0]?.readingId);
    expect(after.total).toBe(before.total);
  });
});

describe('compressed answers', () => {
  it('sends the cached bytes gzipped once to clients that take gzip through the web server, and plain to the others', async () => {
    await signInAs(a.userId);
    const routes = [
      (h: Record<string, string>) => call(trendGET, `http://127.0.0.1/api/projects/${fx.projectId}/trend`, { projectId: fx.projectId }, h),
      (h: Record<string, string>) => call(csvGET, `http://127.0.0.1/api/projects/${fx.projectId}/readings.csv`, { projectId: fx.projectId }, h),
      (h: Record<string, string>) => call(listGET, `http://127.0.0.1/api/projects/${fx.projectId}/readings`, { projectId: fx.projectId }, h),
    ];
    for (const get of routes) {
      const plain = await get({});
      expect(plain.headers.get('x-veilmeter-encoding')).toBeNull();
      expect(plain.headers.get('vary')).toBe('accept-encoding');
      const ok = { 'x-veilmeter-precompressed': '1' };
      const zipped = await get({ ...ok, 'accept-encoding': 'gzip, deflate, br' });
      expect(zipped.headers.get('x-veilmeter-encoding')).toBe('gzip');
      expect(zipped.bytes.length).toBeLessThan(plain.bytes.length);
      expect(gunzipSync(zipped.bytes).equals(plain.bytes)).toBe(true);
      // the length the web server turns into Content-Length is that of the bytes sent
      expect(zipped.headers.get('x-veilmeter-length')).toBe(String(zipped.bytes.length));
      const plainVia = await get({ ...ok });
      expect(plainVia.headers.get('x-veilmeter-length')).toBe(String(plain.bytes.length));
      expect(plain.headers.get('x-veilmeter-length')).toBeNull();
      // the same compressed bytes the second time, and none for a client that refuses gzip
      expect((await get({ ...ok, 'accept-encoding': 'gzip' })).bytes.equals(zipped.bytes)).toBe(true);
      expect((await get({ ...ok, 'accept-encoding': 'gzip;q=0, deflate' })).headers.get('x-veilmeter-encoding')).toBeNull();
      // without the web server's mark (next dev, plain next start) nothing comes compressed
      expect((await get({ 'accept-encoding': 'gzip' })).bytes.equals(plain.bytes)).toBe(true);
    }
  });
});

describe('trend of one metric', () => {
  it('is the full trend cut to that metric and its targets', async () => {
    await signInAs(a.userId);
    const full = JSON.parse((await trend(fx.projectId)).text);
    const one = await call(trendGET, `http://127.0.0.1/api/projects/${fx.projectId}/trend?metric=ambientContrastRatio`, { projectId: fx.projectId });
    expect(one.status).toBe(200);
    const body = JSON.parse(one.text);
    expect(Object.keys(body.trends)).toEqual(['ambientContrastRatio']);
    expect(fromTrendAnswer(body).ambientContrastRatio).toEqual(fromTrendAnswer(full).ambientContrastRatio);
    expect(body.sets.length).toBeLessThanOrEqual(full.sets.length);
    expect(body.targets).toEqual(full.targets.filter((t: { metric: string }) => t.metric === 'ambientContrastRatio'));
    const bad = await call(trendGET, `http://127.0.0.1/api/projects/${fx.projectId}/trend?metric=brightness`, { projectId: fx.projectId });
    expect(bad.status).toBe(422);
    expect(JSON.parse(bad.text).error.fieldErrors.metric[0]).toContain('ambientContrastRatio');
  });
});

describe('status polling', () => {
  it('answers what the two queries answered, in one', async () => {
    await signInAs(a.userId);
    const analysis = await getDb()('readings').where({ project_id: fx.projectId }).first('analysis_id');
    const id = analysis.analysis_id as string;
    const res = await call(pollGET, `http://127.0.0.1/api/analyses/${id}`, { analysisId: id });
    const old = await getAnalysis(a.labId, id);
    const reading = await getReadingForAnalysis(a.labId, id);
    expect(res.status).toBe(200);
    expect(res.text).toBe(
      JSON.stringify({
        analysis: { ...old, stageLabel: stageLabel(old!.stage) },
        reading: { id: reading!.id, ambientContrastRatio: reading!.ambientContrastRatio, warningCount: reading!.warningCount, result: reading!.result },
      }),
    );
    await signInAs(b.userId);
    expect((await call(pollGET, `http://127.0.0.1/api/analyses/${id}`, { analysisId: id })).status).toBe(404);
  });
});
