// npm run load: read routes under 50 connections against `next start` on loopback, with 10,000
// readings seeded in a throwaway lab, then 30 photo triplets uploaded at once and analysed by two
// workers of its own queue. Prints p50/p95/p99 and errors; removes its lab, files and queue after.
// Options: --duration=SECONDS (20), --connections=N (50), --triplets=N (30), --web=N web processes
// (WEB_PROCESSES, else one per core up to 4), --no-build.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { Queue } from 'bullmq';
import { closeDb, getDb } from '../db/index';
import { hashPassword } from '../lib/auth/password';
import { getEnv, storageDir } from '../lib/env';
import { analyzeFiles } from '../lib/image';
import { workerConnection } from '../lib/server/queue/connection';
import { ANALYSIS_QUEUE } from '../lib/server/queue/names';
import { renderCapture, type RenderedCapture } from '../tests/fixtures/capture-generator';
import { freePort } from '../tests/fixtures/free-port';

type Instance = { on(ev: 'response', cb: (client: unknown, status: number, bytes: number, ms: number) => void): void; on(ev: 'done', cb: (r: Result) => void): void; stop(): void };
type Result = { errors: number; timeouts: number; non2xx: number; requests: { total: number; average: number } };
type AutocannonRequest = { path?: string; setupRequest?: (req: Record<string, unknown>) => Record<string, unknown> };
type AutocannonOptions = { url: string; connections: number; duration: number; headers: Record<string, string>; requests: AutocannonRequest[] };
// autocannon ships no types; this is the part used here
const autocannon = createRequire(import.meta.url)('autocannon') as (o: AutocannonOptions) => Instance;

const arg = (name: string, fallback: number) => {
  const a = process.argv.find((x) => x.startsWith(`--${name}=`));
  const v = a ? Number(a.slice(name.length + 3)) : NaN;
  return Number.isFinite(v) && v > 0 ? v : fallback;
};
const DURATION = arg('duration', 20);
const CONNECTIONS = arg('connections', 50);
const TRIPLETS = arg('triplets', 30);
const WEB_PROCESSES = arg('web', Number(process.env.WEB_PROCESSES) || Math.min(4, availableParallelism()));
const READINGS = 10_000;
const SETS = 2_000;
const REVISIONS = 20;
const TARGET_P95_MS = 150;
const WARM_UP_S = 3;

const env = getEnv();
const distDir = process.env.NEXT_DIST_DIR || '.next-load';
const prefix = `vmload${randomBytes(3).toString('hex')}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const children: ChildProcess[] = [];
let labId = '';
let userId = '';

function start(args: string[], extra: Record<string, string>, name: string): ChildProcess {
  const child = spawn('npx', args, { env: { ...process.env, ...extra }, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  const tail: string[] = [];
  const keep = (d: Buffer) => {
    tail.push(d.toString());
    if (tail.length > 40) tail.shift();
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  child.once('exit', (code, signal) => {
    if (!stopping) console.error(`[load] ${name} exited (${code ?? signal}):\n${tail.join('')}`);
  });
  children.push(child);
  return child;
}

let stopping = false;
async function stopAll(): Promise<void> {
  stopping = true;
  for (const c of children) if (c.pid && c.exitCode === null) process.kill(-c.pid, 'SIGTERM');
  for (let i = 0; i < 50 && children.some((c) => c.exitCode === null && c.signalCode === null); i++) await sleep(100);
  for (const c of children) {
    try {
      if (c.pid && c.exitCode === null && c.signalCode === null) process.kill(-c.pid, 'SIGKILL');
    } catch {
      // gone
    }
  }
}

/** 10,000 readings in 2,000 capture sets over 20 revisions, all from one real engine result. */
async function seed(password: string): Promise<{ projectId: string; analysisIds: string[] }> {
  const db = getDb();
  const capture = await renderCapture({ width: 320, height: 240, seed: 77, ghost: null });
  const { result } = await analyzeFiles({ on: { name: 'on.jpg', bytes: capture.on }, off: { name: 'off.jpg', bytes: capture.off }, ambient: { name: 'ambient.jpg', bytes: capture.ambient }, pattern: capture.truth.pattern, screen: capture.truth.screen, background: capture.truth.background, artifacts: false });
  const [lab] = await db('labs').insert({ name: `Load test ${prefix}` }).returning<{ id: string }[]>('id');
  labId = (lab as { id: string }).id;
  const [user] = await db('users').insert({ email: `${prefix}@example.test`, name: 'Load Test', password_hash: await hashPassword(password) }).returning<{ id: string }[]>('id');
  userId = (user as { id: string }).id;
  await db('memberships').insert({ lab_id: labId, user_id: userId, role: 'lead' });
  const [project] = await db('projects').insert({ lab_id: labId, name: 'Load rig' }).returning<{ id: string }[]>('id');
  const projectId = (project as { id: string }).id;
  await db.raw(`insert into revisions (lab_id, project_id, label, position) select ?, ?, 'R' || g, g from generate_series(1, ?) g`, [labId, projectId, REVISIONS]);
  await db.raw(
    `insert into capture_sets (lab_id, revision_id, label, pattern, created_by)
     select ?, r.id, 'set ' || g, ?, ? from generate_series(1, ?) g
     join revisions r on r.project_id = ? and r.position = 1 + (g % ?)`,
    [labId, capture.truth.pattern, userId, SETS, projectId, REVISIONS],
  );
  await db.raw(
    `insert into analyses (lab_id, capture_set_id, status, stage, progress, attempts, engine_version, requested_by, started_at, finished_at)
     select ?, c.id, 'done', 'done', 100, 1, ?, ?, now(), now() from capture_sets c, generate_series(1, ?) k where c.lab_id = ?`,
    [labId, result.engineVersion, userId, READINGS / SETS, labId],
  );
  const acr = result.ambientContrastRatio ?? 10;
  await db.raw(
    `insert into readings (lab_id, analysis_id, capture_set_id, revision_id, project_id, engine_version, ambient_contrast_ratio, transmission, result, created_at)
     select a.lab_id, a.id, a.capture_set_id, c.revision_id, ?, ?, ? * (0.9 + random() * 0.2), ?, ?::jsonb, now() - random() * interval '90 days'
     from analyses a join capture_sets c on c.id = a.capture_set_id where a.lab_id = ?`,
    [projectId, result.engineVersion, acr, result.transmission ?? 0.8, JSON.stringify(result), labId],
  );
  const analysisIds = (await db('analyses').where({ lab_id: labId }).limit(200).pluck('id')) as string[];
  const n = await db('readings').where({ lab_id: labId }).count<{ count: string }[]>('* as count').first();
  console.log(`[load] seeded ${n?.count} readings in ${SETS} capture sets, ${REVISIONS} revisions`);
  return { projectId, analysisIds };
}

function cookiesOf(res: Response, jar: Map<string, string>): void {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const i = pair?.indexOf('=') ?? -1;
    if (pair && i > 0) jar.set(pair.slice(0, i), pair.slice(i + 1));
  }
}
const cookieHeader = (jar: Map<string, string>) => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');

async function signIn(base: string, email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const csrf = await fetch(`${base}/api/auth/csrf`);
  cookiesOf(csrf, jar);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: cookieHeader(jar) },
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  cookiesOf(res, jar);
  if (![...jar.keys()].some((k) => k.includes('session-token'))) throw new Error(`sign-in failed (${res.status})`);
  return cookieHeader(jar);
}

type Figures = { route: string; requests: number; rps: number; kb: number; p50: number; p95: number; p99: number; errors: number };

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] as number;
}

async function hammer(route: string, base: string, cookie: string, paths: string[], duration = DURATION): Promise<Figures> {
  const times: number[] = [];
  let bad = 0;
  let bytes = 0;
  const result = await new Promise<Result>((resolve) => {
    let k = 0;
    // each request takes the next path, so polling spreads over many analyses as a page of them would
    const requests: AutocannonRequest[] = [{ setupRequest: (req) => ({ ...req, path: paths[k++ % paths.length] }) }];
    // the Accept-Encoding that browsers and fetch send, so answers are sized as clients get them
    const inst = autocannon({ url: base, connections: CONNECTIONS, duration, headers: { cookie, 'accept-encoding': 'gzip, deflate, br' }, requests });
    inst.on('response', (_c, status, b, ms) => {
      times.push(ms);
      bytes += b;
      if (status < 200 || status >= 300) bad++;
    });
    inst.on('done', resolve);
  });
  times.sort((a, b) => a - b);
  return { route, requests: times.length, rps: Math.round(times.length / duration), kb: times.length ? Math.round(bytes / times.length / 102.4) / 10 : 0, p50: Math.round(percentile(times, 50)), p95: Math.round(percentile(times, 95)), p99: Math.round(percentile(times, 99)), errors: bad + result.errors + result.timeouts };
}

async function uploadBurst(base: string, cookie: string, projectId: string): Promise<{ accepted: number; analysed: number; lost: number; seconds: number }> {
  const db = getDb();
  const revisionId = (await db('revisions').where({ lab_id: labId, project_id: projectId, position: 1 }).first('id')) as { id: string };
  const captures: RenderedCapture[] = [];
  for (let k = 0; k < TRIPLETS; k++) captures.push(await renderCapture({ width: 800, height: 600, seed: 5000 + k, ghost: null }));
  const sets: string[] = [];
  for (let k = 0; k < TRIPLETS; k++) {
    const [row] = await db('capture_sets').insert({ lab_id: labId, revision_id: revisionId.id, label: `burst ${k}`, pattern: captures[k]?.truth.pattern, created_by: userId }).returning<{ id: string }[]>('id');
    sets.push((row as { id: string }).id);
  }
  const t0 = Date.now();
  const uploads = await Promise.all(
    sets.flatMap((setId, k) =>
      (['on', 'off', 'ambient'] as const).map((role) =>
        fetch(`${base}/api/captures/${setId}/photos?role=${role}`, { method: 'POST', headers: { cookie, origin: base, 'content-type': 'application/octet-stream', 'x-file-name': `burst-${k}-${role}.jpg` }, body: new Uint8Array(captures[k]?.[role] ?? []) }).then((r) => r.status),
      ),
    ),
  );
  const accepted = uploads.filter((s) => s === 201).length;
  const analyses: string[] = [];
  await Promise.all(
    sets.map(async (setId, k) => {
      const t = captures[k]?.truth;
      if (!t) return;
      await fetch(`${base}/api/captures/${setId}/regions`, { method: 'PUT', headers: { cookie, origin: base, 'content-type': 'application/json' }, body: JSON.stringify({ regions: [{ kind: 'screen', ...t.screen, source: 'marked' }, { kind: 'background', ...t.background, source: 'marked' }] }) });
      const r = await fetch(`${base}/api/captures/${setId}/analyses`, { method: 'POST', headers: { cookie, origin: base } });
      if (r.status === 202) analyses.push(((await r.json()) as { analysis: { id: string } }).analysis.id);
    }),
  );
  const finished = new Map<string, string>();
  for (let i = 0; i < 600 && finished.size < analyses.length; i++) {
    for (const id of analyses) {
      if (finished.has(id)) continue;
      const r = await fetch(`${base}/api/analyses/${id}`, { headers: { cookie } });
      const s = r.ok ? ((await r.json()) as { analysis: { status: string } }).analysis.status : 'error';
      if (s === 'done' || s === 'failed') finished.set(id, s);
    }
    await sleep(500);
  }
  const analysed = [...finished.values()].filter((s) => s === 'done').length;
  return { accepted, analysed, lost: TRIPLETS - analysed, seconds: Math.round((Date.now() - t0) / 100) / 10 };
}

async function cleanup(): Promise<void> {
  await stopAll();
  const db = getDb();
  if (labId) {
    await db('labs').where({ id: labId }).delete();
    for (const kind of ['photos', 'previews', 'artifacts']) rmSync(join(storageDir(env), kind, labId), { recursive: true, force: true });
  }
  if (userId) await db('users').where({ id: userId }).delete();
  const conn = workerConnection({ maxRetriesPerRequest: 1 });
  const q = new Queue(ANALYSIS_QUEUE, { connection: conn, prefix });
  await q.obliterate({ force: true }).catch(() => undefined);
  await q.close();
  conn.disconnect();
  await closeDb();
}

async function main(): Promise<void> {
  if (!process.argv.includes('--no-build') || !existsSync(join(distDir, 'BUILD_ID'))) {
    console.log(`[load] building into ${distDir}`);
    // next build writes its folder's name into these two; the checkout keeps them as they were
    const kept = ['tsconfig.json', 'next-env.d.ts'].map((f) => [f, readFileSync(f, 'utf8')] as const);
    const b = spawnSync('npx', ['next', 'build'], { env: { ...process.env, NEXT_DIST_DIR: distDir }, encoding: 'utf8', timeout: 600_000 });
    for (const [f, text] of kept) writeFileSync(f, text);
    if (b.status !== 0) throw new Error(`build failed:\n${(b.stdout + b.stderr).slice(-3000)}`);
  }
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const password = randomBytes(12).toString('hex');
  const { projectId, analysisIds } = await seed(password);
  const serverEnv = { NEXT_DIST_DIR: distDir, QUEUE_PREFIX: prefix, PORT: String(port), NEXTAUTH_URL: base };
  start(['node', 'scripts/web.mjs', '-p', String(port), '-H', '127.0.0.1'], { ...serverEnv, WEB_PROCESSES: String(WEB_PROCESSES) }, 'web');
  // the workers run compiled, as npm start runs them
  const wb = spawnSync(process.execPath, ['scripts/build-worker.mjs'], { encoding: 'utf8', timeout: 60_000 });
  if (wb.status !== 0) throw new Error(`worker build failed:\n${wb.stderr}`);
  start(['node', '--enable-source-maps', '.build/worker/index.mjs'], serverEnv, 'worker 1');
  start(['node', '--enable-source-maps', '.build/worker/index.mjs'], serverEnv, 'worker 2');
  let up = false;
  for (let i = 0; i < 300 && !up; i++) {
    up = await fetch(`${base}/api/health`).then((r) => r.ok, () => false);
    if (!up) await sleep(200);
  }
  if (!up) throw new Error('next start did not answer /api/health within 60 s');
  const cookie = await signIn(base, `${prefix}@example.test`, password);
  // warm every web process on each route (lazy chunks, the JIT, the read cache) for a few seconds
  // first, so the figures are of a running server rather than of its first requests
  // the readings list is read a page of 50 at a time, spread over all 40 pages as people paging do
  const pages = Array.from({ length: SETS / 50 }, (_, k) => `/api/projects/${projectId}/readings?limit=50&offset=${k * 50}`);
  // the reads the target is for; the whole CSV export is measured beside them, as a download
  const routes: [string, string[], boolean][] = [
    ['readings list (/api/projects/:id/readings, 50 a page)', pages, true],
    ['trend of one metric (/api/projects/:id/trend?metric=…)', [`/api/projects/${projectId}/trend?metric=ambientContrastRatio`], true],
    ['trend of all 7 metrics (/api/projects/:id/trend)', [`/api/projects/${projectId}/trend`], true],
    ['status polling (/api/analyses/:id)', analysisIds.map((id) => `/api/analyses/${id}`), true],
    ['whole CSV export (readings.csv, 2,000 rows)', [`/api/projects/${projectId}/readings.csv`], false],
  ];
  for (const [name, paths] of routes) await hammer(name, base, cookie, paths, WARM_UP_S);

  console.log(`[load] ${CONNECTIONS} connections × ${DURATION} s per route on ${base}, ${WEB_PROCESSES} web process(es)`);
  const figures: (Figures & { targeted: boolean })[] = [];
  for (const [name, paths, targeted] of routes) figures.push({ ...(await hammer(name, base, cookie, paths)), targeted });
  console.log('');
  console.log('| route | requests | req/s | KB per answer | p50 ms | p95 ms | p99 ms | errors | p95 < 150 ms |');
  console.log('| --- | --- | --- | --- | --- | --- | --- | --- | --- |');
  for (const f of figures) console.log(`| ${f.route} | ${f.requests} | ${f.rps} | ${f.kb} | ${f.p50} | ${f.p95} | ${f.p99} | ${f.errors} | ${!f.targeted ? '(a download: not a target)' : f.p95 < TARGET_P95_MS && f.errors === 0 ? 'yes' : 'NO'} |`);

  console.log(`\n[load] uploading ${TRIPLETS} triplets at once`);
  const burst = await uploadBurst(base, cookie, projectId);
  console.log(`[load] ${burst.accepted}/${TRIPLETS * 3} photos accepted, ${burst.analysed}/${TRIPLETS} analysed, ${burst.lost} lost, ${burst.seconds} s from first upload to last reading`);
  const ok = figures.every((f) => (!f.targeted || f.p95 < TARGET_P95_MS) && f.errors === 0) && burst.accepted === TRIPLETS * 3 && burst.lost === 0;
  console.log(ok ? '[load] all targets met' : '[load] some targets NOT met');
  process.exitCode = ok ? 0 : 1;
}

process.on('SIGINT', () => {
  void cleanup().finally(() => process.exit(130));
});

main()
  .catch((e: unknown) => {
    console.error(`[load] ${e instanceof Error ? e.message : String(e)}`);
    process.exitCode = 1;
  })
  .finally(() => cleanup().catch((e: unknown) => console.error('[load] cleanup:', e)));
