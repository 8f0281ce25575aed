import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { apiAs, baseURL, signIn } from './helpers';

// Against the production server: pages of another lab's records answer 404 and pages a role may
// not see 403 (not 200 with a not-found screen), pages carry a script policy with a fresh nonce
// and no 'unsafe-inline', HSTS only over https, and cookie writes from another site are refused.

const tag = `${Date.now().toString(36)}`;
let foreign: { labId: string; projectId: string; revisionId: string; captureId: string };
let demo: { projectId: string; revisionId: string; captureId: string; otherProjectId: string };
let viewer: APIRequestContext;
let admin: APIRequestContext;

test.beforeAll(async () => {
  const db = getDb();
  // another lab's records, whose ids the demo lab's people may well learn
  const [lab] = await db('labs').insert({ name: `Elsewhere ${tag}` }).returning<{ id: string }[]>('id');
  const [p] = await db('projects').insert({ lab_id: lab!.id, name: `Foreign visor ${tag}` }).returning<{ id: string }[]>('id');
  const [r] = await db('revisions').insert({ lab_id: lab!.id, project_id: p!.id, label: 'F1', position: 1 }).returning<{ id: string }[]>('id');
  const [c] = await db('capture_sets').insert({ lab_id: lab!.id, revision_id: r!.id, label: 'Foreign shot' }).returning<{ id: string }[]>('id');
  foreign = { labId: lab!.id, projectId: p!.id, revisionId: r!.id, captureId: c!.id };
  const demoLab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  // a capture set of the demo lab with its revision and project, and another project of the lab
  const shot = await db('capture_sets as c')
    .join('revisions as r', 'r.id', 'c.revision_id')
    .where('c.lab_id', demoLab.id)
    .orderBy('c.created_at')
    .first<{ captureId: string; revisionId: string; projectId: string }>('c.id as captureId', 'r.id as revisionId', 'r.project_id as projectId');
  const other = await db('projects').where({ lab_id: demoLab.id }).whereNot({ id: shot.projectId }).first<{ id: string }>('id');
  demo = { projectId: shot.projectId, otherProjectId: other.id, revisionId: shot.revisionId, captureId: shot.captureId };
  viewer = await apiAs('viewer@example.test');
  admin = await apiAs('admin@example.test');
});

test.afterAll(async () => {
  await viewer?.dispose();
  await admin?.dispose();
  await getDb()('labs').where({ id: foreign.labId }).delete();
  await closeDb();
});

test('pages of another lab’s records, or of none, answer 404 with the not-found screen', async () => {
  const cases: [string, RegExp][] = [
    [`/captures/${foreign.captureId}`, /No such capture set/],
    ['/captures/not-an-id', /No such capture set/],
    [`/projects/${foreign.projectId}`, /No such project/],
    [`/projects/${foreign.projectId}/compare`, /No such project/],
    [`/projects/${demo.projectId}/revisions/${foreign.revisionId}`, /No such revision/],
    [`/projects/${demo.projectId}/revisions/${foreign.revisionId}/stack`, /No such revision/],
    // a revision of this lab, under another project's address
    [`/projects/${demo.otherProjectId}/revisions/${demo.revisionId}`, /No such revision/],
  ];
  for (const [path, text] of cases) {
    const res = await viewer.get(path, { maxRedirects: 0 });
    expect(res.status(), path).toBe(404);
    expect(await res.text(), path).toMatch(text);
  }
  // the same pages of the person's own lab still answer 200
  for (const path of [`/captures/${demo.captureId}`, `/projects/${demo.projectId}`, `/projects/${demo.projectId}/compare`, `/projects/${demo.projectId}/revisions/${demo.revisionId}`]) {
    expect((await viewer.get(path, { maxRedirects: 0 })).status(), path).toBe(200);
  }
});

test('a page of the person’s own lab that their role may not see answers 403', async () => {
  for (const path of ['/settings/audit', '/settings/invitations', '/settings/tokens']) {
    const res = await viewer.get(path, { maxRedirects: 0 });
    expect(res.status(), path).toBe(403);
    expect(await res.text(), path).toMatch(/Not for your role/);
    expect((await admin.get(path, { maxRedirects: 0 })).status(), `${path} as admin`).toBe(200);
  }
});

const scriptSrc = (csp: string) => csp.split(';').map((d) => d.trim()).find((d) => d.startsWith('script-src')) ?? '';

test('every page has a script policy with a fresh nonce and no unsafe-inline, and every script carries it', async () => {
  const anon = await request.newContext({ baseURL });
  const seen = new Set<string>();
  for (const [client, path] of [[anon, '/sign-in'], [anon, '/sign-in'], [viewer, '/projects'], [viewer, `/captures/${demo.captureId}`]] as const) {
    const res = await client.get(path, { maxRedirects: 0 });
    expect(res.status(), path).toBe(200);
    const csp = res.headers()['content-security-policy'] ?? '';
    const src = scriptSrc(csp);
    expect(src, path).not.toContain("'unsafe-inline'");
    const nonce = /'nonce-([A-Za-z0-9+/=]+)'/.exec(src)?.[1];
    expect(nonce, `${path}: ${src}`).toBeTruthy();
    expect(seen.has(nonce!), 'a nonce is never reused').toBe(false);
    seen.add(nonce!);
    const html = await res.text();
    const scripts = html.match(/<script\b[^>]*>/g) ?? [];
    expect(scripts.length, path).toBeGreaterThan(0);
    for (const s of scripts) expect(s, path).toContain(`nonce="${nonce}"`);
  }
  // API answers run no script either
  expect(scriptSrc((await anon.get('/api/health')).headers()['content-security-policy'] ?? '')).toBe("script-src 'none'");
  await anon.dispose();
});

test('the app runs under that policy in a real browser, with no violation', async ({ page }) => {
  await page.addInitScript(() => {
    const w = window as unknown as { __violations: string[] };
    w.__violations = [];
    document.addEventListener('securitypolicyviolation', (e) => w.__violations.push(`${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}`));
  });
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${demo.captureId}`);
  // hydrated: Next's client runtime ran, which needs its nonce-bearing bootstrap scripts
  await page.waitForFunction(() => Boolean((window as unknown as { next?: unknown }).next));
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Projects' }).click();
  await page.waitForURL('**/projects');
  expect(await page.evaluate(() => (window as unknown as { __violations: string[] }).__violations)).toEqual([]);
});

test('no HSTS over plain http, even when a client claims https', async () => {
  const anon = await request.newContext({ baseURL, extraHTTPHeaders: { 'x-forwarded-proto': 'https' } });
  const res = await anon.get('/sign-in');
  expect(res.status()).toBe(200);
  expect(res.headers()['strict-transport-security']).toBeUndefined();
  await anon.dispose();
});

test('a cookie write from another site is refused; the same from the app goes through', async () => {
  const evil = await admin.post('/api/projects', { data: { name: `Cross-site ${tag}` }, headers: { origin: 'https://evil.example' } });
  expect(evil.status()).toBe(403);
  expect(await getDb()('projects').where({ name: `Cross-site ${tag}` }).first()).toBeUndefined();
  const ok = await admin.post('/api/projects', { data: { name: `Same-site ${tag}` } });
  expect(ok.status()).toBe(201);
  await getDb()('projects').where({ name: `Same-site ${tag}` }).delete();
});
