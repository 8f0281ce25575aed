import { PDFParse } from 'pdf-parse';
import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { apiAs } from './helpers';

let projectId: string;
let vxb: string;
let foreignRevision: string | null = null;
let foreignProject: string | null = null;

test.beforeAll(async () => {
  const db = getDb();
  const project = await db('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Visor VX birdbath' }).first<{ id: string }>('p.id');
  projectId = project.id;
  vxb = (await db('revisions').where({ project_id: projectId, label: 'VX-B' }).first<{ id: string }>('id')).id;
  const other = await db('revisions as r').join('labs as l', 'l.id', 'r.lab_id').whereNot('l.name', DEMO_LAB).first<{ id: string; project_id: string } | undefined>('r.id', 'r.project_id');
  foreignRevision = other?.id ?? null;
  foreignProject = other?.project_id ?? null;
});

test.afterAll(async () => {
  await closeDb();
});

test('a tester downloads CSV and PDF of a revision, a project and a comparison', async () => {
  const api = await apiAs('tester@example.test');
  const csv = await api.get(`/api/revisions/${vxb}/readings.csv`);
  expect(csv.status()).toBe(200);
  expect(csv.headers()['content-type']).toContain('text/csv');
  expect(csv.headers()['content-disposition']).toMatch(/attachment; filename=".*VX-B-readings\.csv"/);
  const lines = (await csv.text()).replace(/^\uFEFF/, '').trim().split('\r\n');
  expect(lines[0]).toContain('ambient_contrast_ratio (ratio L_on/L_off)');
  expect(lines).toHaveLength(11);

  const pdf = await api.get(`/api/revisions/${vxb}/report.pdf`);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()['content-type']).toBe('application/pdf');
  expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');
  // the revision PDF: statistics and targets per variant, headings with their units as the screens print them
  const parser = new PDFParse({ data: new Uint8Array(await pdf.body()) });
  const text = (await parser.getText()).text.replace(/\s+/g, ' ');
  await parser.destroy();
  expect(text).toMatch(/Ambient contrast ratio with polarizer 5 \d+\.\d+ ± \d+\.\d+ : 1/);
  expect(text).toMatch(/Ambient contrast ratio without polarizer 5 /);
  expect(text).toContain('Ghost ratio (%)');
  expect(text).not.toContain('dE00');
  expect(text).toMatch(/as “with polarizer”/);

  expect((await api.get(`/api/projects/${projectId}/readings.csv`)).status()).toBe(200);
  expect((await api.get(`/api/projects/${projectId}/report.pdf`)).status()).toBe(200);
  const q = `a=${encodeURIComponent(`${vxb}:without polarizer`)}&b=${encodeURIComponent(`${vxb}:with polarizer`)}`;
  const cmp = await api.get(`/api/projects/${projectId}/compare/readings.csv?${q}`);
  expect(cmp.status()).toBe(200);
  const cmpLines = (await cmp.text()).replace(/^\uFEFF/, '').trim().split('\r\n');
  expect(cmpLines[0]?.startsWith('group,')).toBe(true);
  expect(cmpLines.filter((l) => l.startsWith('A: VX-B · without polarizer'))).toHaveLength(5);
  expect((await api.get(`/api/projects/${projectId}/compare/report.pdf?${q}`)).headers()['content-type']).toBe('application/pdf');

  // bad input: a clear 422, no stack
  const bad = await api.get(`/api/projects/${projectId}/compare/readings.csv?a=nope`);
  expect(bad.status()).toBe(422);
  const body = (await bad.json()) as { error: { message: string; fieldErrors: Record<string, string[]> } };
  expect(body.error.message).toBe('Choose the two groups to compare');
  expect(Object.keys(body.error.fieldErrors).sort()).toEqual(['a', 'b']);
  await api.dispose();
});

test('another lab’s ids and unknown ids answer 404; a viewer may not export', async () => {
  const api = await apiAs('tester@example.test');
  const ghost = '00000000-0000-4000-8000-000000000000';
  for (const path of [`/api/revisions/${ghost}/readings.csv`, `/api/revisions/${ghost}/report.pdf`, `/api/projects/${ghost}/readings.csv`, `/api/projects/${ghost}/report.pdf`, `/api/projects/${ghost}/trend`, '/api/revisions/not-an-id/readings.csv']) {
    expect((await api.get(path)).status(), path).toBe(404);
  }
  if (foreignRevision && foreignProject) {
    for (const path of [`/api/revisions/${foreignRevision}/readings.csv`, `/api/revisions/${foreignRevision}/report.pdf`, `/api/projects/${foreignProject}/readings.csv`, `/api/projects/${foreignProject}/report.pdf`, `/api/projects/${foreignProject}/trend`]) {
      expect((await api.get(path)).status(), path).toBe(404);
    }
    expect((await api.get(`/api/projects/${projectId}/compare/readings.csv?a=${foreignRevision}&b=${vxb}`)).status()).toBe(404);
  }
  await api.dispose();
  const viewer = await apiAs('viewer@example.test');
  expect((await viewer.get(`/api/revisions/${vxb}/readings.csv`)).status()).toBe(403);
  expect((await viewer.get(`/api/projects/${projectId}/trend`)).status()).toBe(200);
  await viewer.dispose();
});
