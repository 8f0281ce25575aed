import { expect, test, type APIRequestContext } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { hashPassword } from '../../lib/auth/password';
import { can, ROLES } from '../../lib/auth/permissions';
import { apiAs, baseURL } from './helpers';
import { request } from '@playwright/test';

// Expected statuses come from the permission table itself, so the table and the handlers
// cannot drift apart silently.
const OUTSIDER = { email: 'outsider@example.test', password: 'outsider-password-1' };
let demoProjectId = '';

test.beforeAll(async () => {
  const db = getDb();
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  const project = await db('projects').where({ lab_id: lab.id }).orderBy('name').first<{ id: string }>('id');
  demoProjectId = project.id;
  if (!(await db('users').where({ email: OUTSIDER.email }).first())) {
    const [u] = await db('users').insert({ email: OUTSIDER.email, name: 'Out Sider', password_hash: await hashPassword(OUTSIDER.password), email_verified_at: new Date() }).returning('id');
    const [l] = await db('labs').insert({ name: 'Elsewhere Lab' }).returning('id');
    await db('memberships').insert({ lab_id: l.id, user_id: u.id, role: 'admin' });
  }
});

test.afterAll(async () => {
  await closeDb();
});

async function countProjects(): Promise<number> {
  const r = await getDb()('projects').count<{ count: string }[]>('* as count').first();
  return Number(r?.count);
}

for (const role of ROLES) {
  test(`a ${role} gets what the permission table allows on projects`, async () => {
    const api = await apiAs(`${role}@example.test`);
    const list = await api.get('/api/projects');
    expect(list.status()).toBe(can(role, 'project.read') ? 200 : 403);

    const view = await api.get(`/api/projects/${demoProjectId}`);
    expect(view.status()).toBe(200);

    const created = await api.post('/api/projects', { data: { name: `Matrix ${role} ${Date.now()}` } });
    expect(created.status()).toBe(can(role, 'project.write') ? 201 : 403);
    // The project to rename and delete is made by an admin, so every role meets the same record.
    const admin = await apiAs('admin@example.test');
    const target = (await (await admin.post('/api/projects', { data: { name: `Target ${role} ${Date.now()}` } })).json()) as { project: { id: string } };

    const renamed = await api.patch(`/api/projects/${target.project.id}`, { data: { name: `Renamed ${role} ${Date.now()}` } });
    expect(renamed.status()).toBe(can(role, 'project.write') ? 200 : 403);

    const deleted = await api.delete(`/api/projects/${target.project.id}`);
    expect(deleted.status()).toBe(can(role, 'project.delete') ? 204 : 403);
    const after = await admin.get(`/api/projects/${target.project.id}`);
    expect(after.status()).toBe(can(role, 'project.delete') ? 404 : 200);
    if (!can(role, 'project.delete')) expect((await admin.delete(`/api/projects/${target.project.id}`)).status()).toBe(204);
    await api.dispose();
    await admin.dispose();
  });
}

test('a member of another lab gets 404 for every verb on this lab’s project', async () => {
  const api = await apiAs(OUTSIDER.email, OUTSIDER.password);
  expect((await api.get(`/api/projects/${demoProjectId}`)).status()).toBe(404);
  expect((await api.patch(`/api/projects/${demoProjectId}`, { data: { name: 'Hijacked' } })).status()).toBe(404);
  expect((await api.delete(`/api/projects/${demoProjectId}`)).status()).toBe(404);
  const mine = (await (await api.get('/api/projects')).json()) as { projects: { id: string }[] };
  expect(mine.projects.map((p) => p.id)).not.toContain(demoProjectId);
  await api.dispose();
});

test('without a session the API answers 401 and pages redirect to sign-in', async () => {
  const anon: APIRequestContext = await request.newContext({ baseURL });
  expect((await anon.get('/api/projects')).status()).toBe(401);
  expect((await anon.post('/api/projects', { data: { name: 'Anon' } })).status()).toBe(401);
  expect((await anon.delete(`/api/projects/${demoProjectId}`)).status()).toBe(401);
  const page = await anon.get('/projects', { maxRedirects: 0 });
  expect(page.status()).toBe(307);
  expect(page.headers().location).toContain('/sign-in');
  await anon.dispose();
});

test('bad input answers 422 with field errors and writes nothing', async () => {
  const api = await apiAs('admin@example.test');
  const before = await countProjects();
  const cases: { data?: unknown; raw?: string; field?: string }[] = [
    { data: { name: '' }, field: 'name' },
    { data: { name: 'x'.repeat(500) }, field: 'name' },
    { data: { name: 42 }, field: 'name' },
    { data: { description: ['no'] }, field: 'name' },
    { raw: '{"name": "unterminated' },
  ];
  for (const c of cases) {
    const res = c.raw
      ? await api.post('/api/projects', { headers: { 'content-type': 'application/json' }, data: c.raw })
      : await api.post('/api/projects', { data: c.data });
    expect(res.status(), JSON.stringify(c)).toBe(422);
    const body = (await res.json()) as { error: { message: string; fieldErrors?: Record<string, string[]> } };
    expect(body.error.message).not.toMatch(/at .*\.(js|ts):\d+/);
    if (c.field) expect(body.error.fieldErrors?.[c.field]?.length).toBeGreaterThan(0);
  }
  const patch = await api.patch(`/api/projects/${demoProjectId}`, { data: { name: '' } });
  expect(patch.status()).toBe(422);
  expect(await countProjects()).toBe(before);
  await api.dispose();
});

test('health reports both services up', async () => {
  const anon = await request.newContext({ baseURL });
  const res = await anon.get('/api/health');
  expect(res.status()).toBe(200);
  expect(await res.json()).toEqual({ ok: true, db: 'up', redis: 'up' });
  await anon.dispose();
});

