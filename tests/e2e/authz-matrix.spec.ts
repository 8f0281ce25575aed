import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { createApiToken, revokeApiToken } from '../../db/queries/api-tokens';
import { hashPassword } from '../../lib/auth/password';
import { PERMISSIONS, ROLE_PERMISSIONS, ROLES, type Permission, type Role } from '../../lib/auth/permissions';
import { apiAs, baseURL } from './helpers';

// The authorization matrix. The expectation below is written out from docs/method.md §2 on its own,
// not read from lib/auth/permissions.ts, so changing a single entry of the app's table makes
// this file fail: the table check at once, and the HTTP calls of every route and server action
// that depend on that entry.
const VIEWER: Permission[] = ['lab.read', 'project.read', 'capture.read', 'compare.read'];
const TESTER: Permission[] = [...VIEWER, 'capture.write', 'analysis.run', 'export.create', 'template.write', 'token.self'];
const LEAD: Permission[] = [...TESTER, 'project.write', 'revision.write', 'stack.write', 'target.write'];
const EXPECTED: Record<Role, Set<Permission>> = { viewer: new Set(VIEWER), tester: new Set(TESTER), lead: new Set(LEAD), admin: new Set(PERMISSIONS) };
const allowed = (role: Role, p: Permission) => EXPECTED[role].has(p);

type Access = Permission | 'public' | 'session';

// Every route handler and method, with the permission it must demand. `{id}` segments get ids.
const ROUTES: { method: string; path: string; access: Access; query?: string }[] = [
  { method: 'GET', path: '/api/health', access: 'public' },
  { method: 'POST', path: '/api/password-reset', access: 'public' },
  { method: 'POST', path: '/api/password-reset/complete', access: 'public' },
  { method: 'GET', path: '/api/patterns/[kind]', access: 'public' },
  { method: 'GET', path: '/api/projects', access: 'project.read' },
  { method: 'POST', path: '/api/projects', access: 'project.write' },
  { method: 'GET', path: '/api/projects/[projectId]', access: 'project.read' },
  { method: 'PATCH', path: '/api/projects/[projectId]', access: 'project.write' },
  { method: 'DELETE', path: '/api/projects/[projectId]', access: 'project.delete' },
  { method: 'GET', path: '/api/projects/[projectId]/trend', access: 'project.read' },
  { method: 'GET', path: '/api/projects/[projectId]/readings', access: 'project.read' },
  { method: 'GET', path: '/api/projects/[projectId]/readings.csv', access: 'export.create' },
  { method: 'GET', path: '/api/projects/[projectId]/report.pdf', access: 'export.create' },
  { method: 'GET', path: '/api/projects/[projectId]/compare/readings.csv', access: 'export.create', query: '?a=[revisionId]&b=[revisionId]' },
  { method: 'GET', path: '/api/projects/[projectId]/compare/report.pdf', access: 'export.create', query: '?a=[revisionId]&b=[revisionId]' },
  { method: 'GET', path: '/api/revisions/[revisionId]/readings.csv', access: 'export.create' },
  { method: 'GET', path: '/api/revisions/[revisionId]/report.pdf', access: 'export.create' },
  { method: 'POST', path: '/api/captures', access: 'capture.write' },
  { method: 'POST', path: '/api/captures/reanalyses', access: 'analysis.run' },
  { method: 'GET', path: '/api/captures/reanalyses/[batchId]', access: 'capture.read' },
  { method: 'GET', path: '/api/captures/[captureId]', access: 'capture.read' },
  { method: 'GET', path: '/api/captures/[captureId]/report.pdf', access: 'export.create' },
  { method: 'PATCH', path: '/api/captures/[captureId]', access: 'capture.write' },
  { method: 'DELETE', path: '/api/captures/[captureId]', access: 'capture.delete' },
  { method: 'GET', path: '/api/captures/[captureId]/analyses', access: 'capture.read' },
  { method: 'POST', path: '/api/captures/[captureId]/analyses', access: 'analysis.run' },
  { method: 'POST', path: '/api/captures/[captureId]/detect', access: 'capture.write' },
  { method: 'POST', path: '/api/captures/[captureId]/photos', access: 'capture.write' },
  { method: 'DELETE', path: '/api/captures/[captureId]/photos/[photoId]', access: 'capture.write' },
  { method: 'PATCH', path: '/api/captures/[captureId]/photos/[photoId]', access: 'capture.write' },
  { method: 'GET', path: '/api/captures/[captureId]/photos/[photoId]/original', access: 'capture.read' },
  { method: 'GET', path: '/api/captures/[captureId]/photos/[photoId]/preview', access: 'capture.read' },
  { method: 'POST', path: '/api/captures/[captureId]/photos/[photoId]/replace', access: 'capture.write' },
  { method: 'GET', path: '/api/captures/[captureId]/photos/[photoId]/thumbnail', access: 'capture.read' },
  { method: 'GET', path: '/api/captures/[captureId]/regions', access: 'capture.read' },
  { method: 'PUT', path: '/api/captures/[captureId]/regions', access: 'capture.write' },
  { method: 'GET', path: '/api/captures/[captureId]/templates', access: 'capture.read' },
  { method: 'POST', path: '/api/captures/[captureId]/templates', access: 'template.write' },
  { method: 'POST', path: '/api/captures/[captureId]/templates/apply', access: 'capture.write' },
  { method: 'GET', path: '/api/analyses/[analysisId]', access: 'capture.read' },
  { method: 'GET', path: '/api/analyses/[analysisId]/artifacts/[name]', access: 'capture.read' },
  { method: 'POST', path: '/api/cameras/calibrate', access: 'camera.write' },
  { method: 'POST', path: '/api/cameras/linearity', access: 'camera.write' },
  { method: 'DELETE', path: '/api/cameras/[profileId]', access: 'camera.write' },
  { method: 'PATCH', path: '/api/cameras/[profileId]', access: 'camera.write' },
  { method: 'GET', path: '/api/v1/projects', access: 'project.read' },
  { method: 'GET', path: '/api/v1/projects/[projectId]/readings', access: 'project.read' },
  { method: 'GET', path: '/api/v1/projects/[projectId]/trend', access: 'project.read' },
  { method: 'GET', path: '/api/v1/projects/[projectId]/readings.csv', access: 'export.create' },
  { method: 'GET', path: '/api/v1/openapi.json', access: 'public' },
  { method: 'GET', path: '/api/v1/captures/[captureId]', access: 'capture.read' },
  { method: 'DELETE', path: '/api/v1/captures/[captureId]', access: 'capture.write' },
  { method: 'GET', path: '/api/v1/captures/[captureId]/photos', access: 'capture.read' },
  { method: 'POST', path: '/api/v1/captures', access: 'capture.write' },
  { method: 'POST', path: '/api/v1/captures/[captureId]/photos', access: 'capture.write' },
  { method: 'PATCH', path: '/api/v1/captures/[captureId]/photos/[photoId]', access: 'capture.write' },
  { method: 'GET', path: '/api/v1/captures/[captureId]/regions', access: 'capture.read' },
  { method: 'PUT', path: '/api/v1/captures/[captureId]/regions', access: 'capture.write' },
  { method: 'GET', path: '/api/v1/captures/[captureId]/templates', access: 'capture.read' },
  { method: 'POST', path: '/api/v1/captures/[captureId]/templates/apply', access: 'capture.write' },
  { method: 'GET', path: '/api/v1/captures/[captureId]/analyses', access: 'capture.read' },
  { method: 'POST', path: '/api/v1/captures/[captureId]/analyses', access: 'analysis.run' },
  { method: 'GET', path: '/api/v1/analyses/[analysisId]', access: 'capture.read' },
];

// Every server action, with what it must demand.
const ACTIONS: Record<string, Access> = {
  signUpAction: 'public',
  acceptInvitationAction: 'public',
  resendVerificationAction: 'session',
  switchLabAction: 'session',
  toggleThemeAction: 'session',
  createProjectAction: 'project.write',
  renameProjectAction: 'project.write',
  deleteProjectAction: 'project.delete',
  createRevisionAction: 'revision.write',
  updateRevisionAction: 'revision.write',
  createCaptureSetAction: 'capture.write',
  updateCaptureSetAction: 'capture.write',
  deleteCaptureSetAction: 'capture.delete',
  saveStackAction: 'stack.write',
  createTargetAction: 'target.write',
  updateTargetAction: 'target.write',
  deleteTargetAction: 'target.write',
  adoptDefaultTargetAction: 'target.write',
  inviteMemberAction: 'invitation.manage',
  revokeInvitationAction: 'invitation.manage',
  changeRoleAction: 'member.manage',
  removeMemberAction: 'member.manage',
  createTokenAction: 'token.self',
  revokeTokenAction: 'token.self',
  createWebhookAction: 'token.manage',
  deleteWebhookAction: 'token.manage',
};

const ROOT = process.cwd();
const NOWHERE = '00000000-0000-4000-8000-000000000000';
const OUTSIDER = { email: 'matrix-outsider@example.test', password: 'matrix-outsider-pw' };
let ids: Record<string, string> = {};
const clients = new Map<string, APIRequestContext>();
let readToken = '';
let revokedToken = '';

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => (statSync(join(dir, f)).isDirectory() ? walk(join(dir, f)) : [join(dir, f)]));
}

/** (method, url path, permission) declared in the source of every route file, re-exports followed. */
function declaredRoutes(): { method: string; path: string; access: string }[] {
  const out: { method: string; path: string; access: string }[] = [];
  const read = (file: string): { method: string; access: string }[] => {
    const src = readFileSync(file, 'utf8');
    const found: { method: string; access: string }[] = [];
    for (const m of src.matchAll(/export const (GET|POST|PUT|PATCH|DELETE) = (?:withAuth|rigRoute)[\s\S]*?permission: '([\w.]+)'/g)) found.push({ method: m[1]!, access: m[2]! });
    for (const m of src.matchAll(/export (?:async )?function (GET|POST|PUT|PATCH|DELETE)\b/g)) found.push({ method: m[1]!, access: 'public' });
    for (const m of src.matchAll(/export \{([^}]*)\} from '([^']+)'/g)) {
      const target = join(file, '..', `${m[2]}.ts`);
      const names = m[1]!.split(',').map((s) => s.trim());
      for (const r of read(target)) if (names.includes(r.method)) found.push(r);
    }
    return found;
  };
  for (const file of walk(join(ROOT, 'app', 'api')).filter((f) => f.endsWith('route.ts'))) {
    const path = `/${relative(join(ROOT, 'app'), file).replace(/\/route\.ts$/, '')}`;
    if (path.startsWith('/api/auth/')) continue; // next-auth's own endpoints
    for (const r of read(file)) out.push({ path, ...r });
  }
  return out;
}

function url(path: string, real: boolean): string {
  return path.replace(/\[(\w+)\]/g, (_, name: string) => {
    if (name === 'kind') return 'white.png?width=64&height=32';
    if (name === 'name') return 'log-contrast';
    return real ? ids[name]! : NOWHERE;
  });
}

async function call(client: APIRequestContext, method: string, path: string, real = false, query = '') {
  const res = await client.fetch(url(path + query, real), { method, data: method === 'GET' || method === 'DELETE' ? undefined : {}, maxRedirects: 0 });
  return res.status();
}

test.beforeAll(async () => {
  const db = getDb();
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first('id');
  const project = await db('projects').where({ lab_id: lab.id, name: 'Visor VX birdbath' }).first('id');
  const revision = await db('revisions').where({ project_id: project.id }).orderBy('position').first('id');
  const photo = await db('photos').where({ lab_id: lab.id }).first('id', 'capture_set_id');
  const analysis = await db('analyses').where({ capture_set_id: photo.capture_set_id }).first('id');
  let profile = await db('camera_profiles').where({ lab_id: lab.id, make: 'Matrix', model: 'Probe' }).first('id');
  const calibration = { patch: { x: 10, y: 10, w: 20, h: 20 }, meterCdm2: 120, meanY: 0.5, exposure: { exposureTime: 0.01, fNumber: 4, iso: 100, factor: 0.0625 }, photoName: 'matrix.jpg', imageWidth: 64, imageHeight: 48 };
  if (!profile) [profile] = await db('camera_profiles').insert({ lab_id: lab.id, make: 'Matrix', model: 'Probe', name: 'Matrix probe camera', k: 60, calibration: JSON.stringify(calibration) }).returning('id');
  ids = { projectId: project.id, revisionId: revision.id, captureId: photo.capture_set_id, photoId: photo.id, analysisId: analysis.id, profileId: profile.id };

  if (!(await db('users').where({ email: OUTSIDER.email }).first())) {
    const [u] = await db('users').insert({ email: OUTSIDER.email, name: 'Matrix Outsider', password_hash: await hashPassword(OUTSIDER.password), email_verified_at: new Date() }).returning('id');
    const [l] = await db('labs').insert({ name: 'Matrix elsewhere lab' }).returning('id');
    await db('memberships').insert({ lab_id: l.id, user_id: u.id, role: 'admin' });
  }
  for (const role of ROLES) clients.set(role, await apiAs(`${role}@example.test`));
  clients.set('outsider', await apiAs(OUTSIDER.email, OUTSIDER.password));
  clients.set('anon', await request.newContext({ baseURL }));

  const tester = await db('users').where({ email: 'tester@example.test' }).first('id');
  readToken = (await createApiToken(lab.id, tester.id, 'matrix read-only', ['read'])).token;
  const revoked = await createApiToken(lab.id, tester.id, 'matrix revoked', ['read', 'capture:write']);
  await revokeApiToken(lab.id, tester.id, revoked.record.id, false);
  revokedToken = revoked.token;
});

test.afterAll(async () => {
  for (const c of clients.values()) await c.dispose();
  await getDb()('camera_profiles').where({ make: 'Matrix', model: 'Probe' }).delete();
  await closeDb();
});

test('the app’s permission table is exactly the one docs/method.md §2 describes', () => {
  for (const role of ROLES) expect([...ROLE_PERMISSIONS[role]].sort(), role).toEqual([...EXPECTED[role]].sort());
});

test('the matrix lists every route handler with the permission its source declares', () => {
  const declared = declaredRoutes().map((r) => `${r.method} ${r.path} ${r.access}`).sort();
  const listed = ROUTES.map((r) => `${r.method} ${r.path} ${r.access}`).sort();
  expect(listed).toEqual(declared);
});

test('the matrix lists every server action with the permission its source declares', () => {
  const dist = process.env.NEXT_DIST_DIR || '.next';
  const manifest = JSON.parse(readFileSync(join(ROOT, dist, 'server', 'server-reference-manifest.json'), 'utf8')) as { node: Record<string, { exportedName: string; filename: string }> };
  const names = Object.values(manifest.node).map((a) => a.exportedName).sort();
  expect(names).toEqual(Object.keys(ACTIONS).sort());
  for (const a of Object.values(manifest.node)) {
    const src = readFileSync(join(ROOT, a.filename), 'utf8');
    const m = new RegExp(`export const ${a.exportedName} = formAction\\(\\s*'([\\w.]+)'`).exec(src);
    const want = ACTIONS[a.exportedName];
    if (want === 'public' || want === 'session') expect(m, a.exportedName).toBeNull();
    else expect(m?.[1], a.exportedName).toBe(want);
  }
});

for (const r of ROUTES) {
  test(`${r.method} ${r.path}: each role, another lab, no session, tokens`, async () => {
    for (const role of ROLES) {
      const status = await call(clients.get(role)!, r.method, r.path, false, r.query);
      if (r.access === 'public' || r.access === 'session' || allowed(role, r.access)) {
        expect(status, `${role} may`).not.toBe(403);
        expect(status, `${role} may`).not.toBe(401);
        expect(status, `${role}`).toBeLessThan(500);
      } else {
        expect(status, `${role} may not`).toBe(403);
      }
    }
    const anon = await call(clients.get('anon')!, r.method, r.path, false, r.query);
    if (r.access === 'public') expect(anon).not.toBe(401);
    else expect(anon, 'no session').toBe(401);

    if (r.access !== 'public' && /\[\w+Id\]/.test(r.path)) {
      const outsider = await call(clients.get('outsider')!, r.method, r.path, true, r.query);
      if (r.method === 'GET') expect(outsider, 'another lab reads').toBe(404);
      else {
        expect(outsider, 'another lab writes').toBeGreaterThanOrEqual(400);
        expect(outsider, 'another lab writes').not.toBe(403);
      }
    }

    if (r.path.startsWith('/api/v1/') && r.access !== 'public' && r.access !== 'session') {
      const reader = await request.newContext({ baseURL, extraHTTPHeaders: { authorization: `Bearer ${readToken}` } });
      const viaRead = await call(reader, r.method, r.path);
      if (r.access.endsWith('.read')) expect(viaRead, 'read scope reads').not.toBe(403);
      else expect(viaRead, 'read scope cannot write').toBe(403);
      const gone = await request.newContext({ baseURL, extraHTTPHeaders: { authorization: `Bearer ${revokedToken}` } });
      expect(await call(gone, r.method, r.path), 'revoked token').toBe(401);
      await reader.dispose();
      await gone.dispose();
    }
  });
}

/** Calls a server action the way the browser does and returns its answer (or the HTTP status). */
async function invoke(client: APIRequestContext, id: string, pagePath: string, fields: Record<string, string>): Promise<{ status: number; state: { ok?: boolean; message?: string } | null }> {
  // Field order matters to the decoder: the form's entries first, then the argument list (a
  // FormData keeps that order; an object would put the key "0" first).
  const multipart = new FormData();
  for (const [k, v] of Object.entries(fields)) multipart.append(`_1_${k}`, v);
  multipart.append('0', '["$K1"]');
  const res = await client.post(pagePath, { headers: { 'Next-Action': id, Accept: 'text/x-component' }, multipart, maxRedirects: 0 });
  const line = (await res.text()).split('\n').find((l) => l.startsWith('1:'));
  return { status: res.status(), state: line ? (JSON.parse(line.slice(2)) as { ok?: boolean; message?: string }) : null };
}

const FORBIDDEN = 'Your role in this lab does not allow this';

test('every server action refuses the roles the table refuses, and no one without a session', async () => {
  const dist = process.env.NEXT_DIST_DIR || '.next';
  const manifest = JSON.parse(readFileSync(join(ROOT, dist, 'server', 'server-reference-manifest.json'), 'utf8')) as { node: Record<string, { exportedName: string; workers: Record<string, unknown> }> };
  for (const [id, a] of Object.entries(manifest.node)) {
    const access = ACTIONS[a.exportedName]!;
    const worker = Object.keys(a.workers)[0]!;
    const page = `/${worker.replace(/^app\//, '').replace(/\/page$/, '').replace(/\([^)]+\)\//g, '')}`
      .replace('[projectId]', ids.projectId!)
      .replace('[revisionId]', ids.revisionId!)
      .replace('[captureId]', ids.captureId!)
      .replace('[token]', 'no-such-invitation-token');
    if (access === 'public' || access === 'session') {
      // Empty input: refused by validation, never by role; no session needed for public ones.
      const who = access === 'public' ? clients.get('anon')! : clients.get('viewer')!;
      const { status, state } = await invoke(who, id, page === '/' ? '/projects' : page, {});
      expect(status, a.exportedName).toBeLessThan(500);
      expect(state?.message ?? '', a.exportedName).not.toBe(FORBIDDEN);
      continue;
    }
    for (const role of ROLES) {
      // Empty input: an allowed role gets a validation answer, a refused one the role answer.
      const { status, state } = await invoke(clients.get(role)!, id, page, {});
      expect(status, `${a.exportedName} as ${role}`).toBe(200);
      if (allowed(role, access)) expect(state?.message, `${a.exportedName}: ${role} may`).not.toBe(FORBIDDEN);
      else expect(state?.message, `${a.exportedName}: ${role} may not`).toBe(FORBIDDEN);
    }
    const anon = await invoke(clients.get('anon')!, id, page, {});
    expect([307, 401], `${a.exportedName} without a session`).toContain(anon.status);
  }
});

test('server actions with another lab’s ids find nothing and change nothing', async () => {
  const dist = process.env.NEXT_DIST_DIR || '.next';
  const manifest = JSON.parse(readFileSync(join(ROOT, dist, 'server', 'server-reference-manifest.json'), 'utf8')) as { node: Record<string, { exportedName: string }> };
  const idOf = (name: string) => Object.entries(manifest.node).find(([, a]) => a.exportedName === name)![0];
  const db = getDb();
  const tester = await db('users').where({ email: 'tester@example.test' }).first('id');
  const before = await db('projects').where({ id: ids.projectId }).first('name');
  const captureBefore = await db('capture_sets').where({ id: ids.captureId }).first('label');
  const outsider = clients.get('outsider')!;
  const cases: [string, Record<string, string>][] = [
    ['renameProjectAction', { id: ids.projectId!, name: 'Taken over' }],
    ['deleteProjectAction', { id: ids.projectId! }],
    ['updateCaptureSetAction', { id: ids.captureId!, label: 'Taken over' }],
    ['deleteCaptureSetAction', { id: ids.captureId! }],
    ['changeRoleAction', { userId: tester.id, role: 'admin' }],
    ['removeMemberAction', { userId: tester.id }],
  ];
  for (const [name, fields] of cases) {
    const { state } = await invoke(outsider, idOf(name), '/projects', fields);
    expect(state?.ok, name).toBe(false);
    expect(state?.message ?? '', name).toMatch(/No such/);
  }
  expect((await db('projects').where({ id: ids.projectId }).first('name')).name).toBe(before.name);
  expect((await db('capture_sets').where({ id: ids.captureId }).first('label'))?.label, 'capture set untouched').toBe(captureBefore.label);
  expect(await db('memberships').where({ user_id: tester.id }).pluck('role')).toContain('tester');
});
