import { request as httpGet } from 'node:http';
import { gunzipSync } from 'node:zlib';
import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { apiAs, baseURL } from './helpers';

// What scripts/web.mjs does on the wire, read with a bare HTTP client (Playwright's own client
// decompresses and would hide it): cached reads go out gzipped with their length, pages are
// compressed on the way, small API answers are sent as they are.
type Raw = { status: number; headers: Record<string, string | string[] | undefined>; body: Buffer };

function raw(path: string, headers: Record<string, string>): Promise<Raw> {
  return new Promise((resolve, reject) => {
    const req = httpGet(new URL(path, baseURL), { headers }, (res) => {
      const parts: Buffer[] = [];
      res.on('data', (d: Buffer) => parts.push(d));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(parts) }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

let projectId: string;
let cookie: string;

test.beforeAll(async () => {
  const project = await getDb()('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Visor VX birdbath' }).first<{ id: string }>('p.id');
  projectId = project.id;
  const api = await apiAs('viewer@example.test');
  cookie = (await api.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join('; ');
  await api.dispose();
});

test.afterAll(async () => {
  await closeDb();
});

test('a cached read goes out gzipped once asked, with its length, and plain otherwise', async () => {
  const gz = await raw(`/api/projects/${projectId}/trend`, { cookie, 'accept-encoding': 'gzip, deflate, br' });
  expect(gz.status).toBe(200);
  expect(gz.headers['content-encoding']).toBe('gzip');
  expect(gz.headers['content-length']).toBe(String(gz.body.length));
  expect(gz.headers['transfer-encoding']).toBeUndefined();
  expect(gz.headers.vary).toContain('accept-encoding');
  // the marks the app uses to hand these over never reach the client
  expect(Object.keys(gz.headers).filter((h) => h.startsWith('x-veilmeter-'))).toEqual([]);
  const plain = await raw(`/api/projects/${projectId}/trend`, { cookie });
  expect(plain.headers['content-encoding']).toBeUndefined();
  expect(gunzipSync(gz.body).equals(plain.body)).toBe(true);
  const answer = JSON.parse(plain.body.toString('utf8')) as { sets: { id: string }[]; trends: Record<string, { revisions: { points: [number, number][] }[] }> };
  const points = Object.values(answer.trends).flatMap((t) => t.revisions.flatMap((r) => r.points));
  expect(points.length).toBeGreaterThan(0);
  expect(points.every(([k]) => Number.isInteger(k) && k >= 0 && k < answer.sets.length)).toBe(true);
});

test('pages are compressed on the way; small API answers are sent as they are', async () => {
  const page = await raw('/sign-in', { 'accept-encoding': 'gzip' });
  expect(page.status).toBe(200);
  expect(page.headers['content-encoding']).toBe('gzip');
  expect(gunzipSync(page.body).toString('utf8')).toContain('<html');
  const health = await raw('/api/health', { 'accept-encoding': 'gzip' });
  expect(health.status).toBe(200);
  expect(health.headers['content-encoding']).toBeUndefined();
  expect(() => JSON.parse(health.body.toString('utf8'))).not.toThrow();
});
