import { expect, request, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { createApiToken } from '../../db/queries/api-tokens';
import { renderCapture } from '../fixtures/capture-generator';
import { baseURL } from './helpers';

// A capture rig drives a whole capture through /api/v1 with a bearer token, as the README shows.
let full = '';
let readOnly = '';

const madeSets: string[] = [];

test.beforeAll(async () => {
  const db = getDb();
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first('id');
  const tester = await db('users').where({ email: 'tester@example.test' }).first('id');
  full = (await createApiToken(lab.id, tester.id, `e2e rig ${Date.now()}`, ['read', 'capture:write'])).token;
  readOnly = (await createApiToken(lab.id, tester.id, `e2e reader ${Date.now()}`, ['read'])).token;
});

test.afterAll(async () => {
  // leave the demo project as the other specs expect it (its variants, its newest revision)
  if (madeSets.length > 0) await getDb()('capture_sets').whereIn('id', madeSets).delete();
  await closeDb();
});

test('a rig creates a capture set, uploads by role, applies a template, analyses and polls the reading', async () => {
  const rig = await request.newContext({ baseURL, extraHTTPHeaders: { authorization: `Bearer ${full}` } });
  const { projects } = (await (await rig.get('/api/v1/projects')).json()) as { projects: { name: string; revisions: { id: string; label: string }[] }[] };
  const revision = projects.find((p) => p.name === 'Visor VX birdbath')?.revisions.find((r) => r.label === 'VX-C');
  expect(revision).toBeTruthy();

  const created = await rig.post('/api/v1/captures', { data: { revisionId: revision!.id, label: `Rig shot ${Date.now()}`, variant: 'rig', backgroundCdm2: 1200 } });
  expect(created.status()).toBe(201);
  const { captureSet } = (await created.json()) as { captureSet: { id: string } };
  madeSets.push(captureSet.id);

  const shot = await renderCapture({ width: 960, height: 640, seed: Date.now() % 1_000_000, screen: { x: 300, y: 190, w: 360, h: 240 }, background: { x: 40, y: 40, w: 200, h: 140 }, displayLevel: 0.2, transmission: 0.35, ghost: null });
  for (const role of ['on', 'off', 'ambient'] as const) {
    const up = await rig.post(`/api/v1/captures/${captureSet.id}/photos?role=${role}`, { headers: { 'content-type': 'image/jpeg', 'x-file-name': `rig-${role}.jpg` }, data: shot[role] });
    expect(up.status(), role).toBe(201);
  }

  const { templates } = (await (await rig.get(`/api/v1/captures/${captureSet.id}/templates`)).json()) as { templates: { id: string; name: string }[] };
  const jig = templates.find((t) => t.name === 'Bench jig A');
  expect(jig).toBeTruthy();
  expect((await rig.post(`/api/v1/captures/${captureSet.id}/templates/apply`, { data: { templateId: jig!.id } })).status()).toBe(200);

  const started = await rig.post(`/api/v1/captures/${captureSet.id}/analyses`);
  expect([201, 202]).toContain(started.status());
  const { analysis } = (await started.json()) as { analysis: { id: string } };

  let reading: { ambientContrastRatio: number } | null = null;
  for (let i = 0; i < 120 && !reading; i++) {
    const poll = (await (await rig.get(`/api/v1/analyses/${analysis.id}`)).json()) as { analysis: { status: string; error: string | null }; reading: { ambientContrastRatio: number } | null };
    expect(poll.analysis.status).not.toBe('failed');
    reading = poll.reading;
    if (!reading) await new Promise((r) => setTimeout(r, 500));
  }
  expect(reading).not.toBeNull();
  expect(Math.abs(reading!.ambientContrastRatio / shot.truth.ambientContrastRatio - 1)).toBeLessThan(0.015);
  await rig.dispose();
});

test('a token without capture:write may read but gets 403 on upload; no token gets 401', async () => {
  const reader = await request.newContext({ baseURL, extraHTTPHeaders: { authorization: `Bearer ${readOnly}` } });
  expect((await reader.get('/api/v1/projects')).status()).toBe(200);
  const set = await getDb()('capture_sets').first('id');
  const up = await reader.post(`/api/v1/captures/${set.id}/photos?role=on`, { headers: { 'content-type': 'image/jpeg' }, data: Buffer.from([0xff, 0xd8, 0xff]) });
  expect(up.status()).toBe(403);
  const anon = await request.newContext({ baseURL });
  expect((await anon.get('/api/v1/projects')).status()).toBe(401);
  // a token is no way around the session on the web app's own routes
  expect((await reader.get('/api/projects')).status()).toBe(401);
  await reader.dispose();
  await anon.dispose();
});
