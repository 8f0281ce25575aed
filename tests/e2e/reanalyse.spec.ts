// Readings an older engine made: marked on the capture page with a re-analyse button, and
// re-analysed a revision at a time from the revision page with its progress (n of m done).
import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { ENGINE_VERSION } from '../../lib/photometry/version';
import { renderCapture } from '../fixtures/capture-generator';
import { insertReading } from '../fixtures/readings-fixture';
import { addCaptureSet } from '../fixtures/test-lab';
import { signIn } from './helpers';

// older than any engine this spec may run with
const OLD = '0.9.0';
const stamp = Date.now();
let projectId = '';
let revisionId = '';
const sets: string[] = [];

test.beforeAll(async () => {
  test.setTimeout(120_000);
  const db = getDb();
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  const tester = await db('users').where({ email: 'tester@example.test' }).first<{ id: string }>('id');
  // a demo reading's full result, to stand for one an older engine made
  const demo = await db('readings').where({ lab_id: lab.id }).first<{ result: Record<string, unknown> }>('result');
  const [project] = await db('projects').insert({ lab_id: lab.id, name: `Re-analyse visor ${stamp}` }).returning<{ id: string }[]>('id');
  projectId = (project as { id: string }).id;
  const [rev] = await db('revisions').insert({ lab_id: lab.id, project_id: projectId, label: `RA-${stamp}`, position: 1 }).returning<{ id: string }[]>('id');
  revisionId = (rev as { id: string }).id;
  for (const [k, label] of ['Window light', 'Desk lamp', 'Single re-run'].entries()) {
    const capture = await renderCapture({ width: 320, height: 240, seed: (stamp % 10_000) + k, ghost: null });
    const id = await addCaptureSet(db, { labId: lab.id, userId: tester.id, revisionId }, `${label} ${stamp}`, capture);
    const readingId = await insertReading(lab.id, projectId, revisionId, id, { acr: 3.21 });
    const t = capture.truth;
    const result = { ...demo.result, engineVersion: OLD, image: { width: t.width, height: t.height }, screen: { ...t.screen, source: 'marked' }, ghost: null, warnings: [] };
    await db('readings').where({ id: readingId }).update({ engine_version: OLD, result: JSON.stringify(result) });
    await db('analyses').whereIn('id', db('readings').where({ id: readingId }).select('analysis_id')).update({ engine_version: OLD });
    sets.push(id);
  }
});

test.afterAll(async () => {
  if (projectId) await getDb()('projects').where({ id: projectId }).delete();
  await closeDb();
});

test('a reading of an older engine is marked on its capture page and re-analysed from there', async ({ browser }) => {
  test.setTimeout(120_000);
  const viewer = await browser.newPage();
  await signIn(viewer, 'viewer@example.test');
  await viewer.goto(`/captures/${sets[2]}`);
  await expect(viewer.getByTestId('outdated-engine')).toContainText(`Measured with engine ${OLD} — the current engine is ${ENGINE_VERSION}`);
  await expect(viewer.getByRole('button', { name: /Re-analyse/ })).toHaveCount(0);
  await viewer.close();

  const page = await browser.newPage();
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${sets[2]}`);
  const notice = page.getByTestId('outdated-engine');
  await expect(notice).toContainText(`Measured with engine ${OLD} — the current engine is ${ENGINE_VERSION}`);
  await notice.getByRole('button', { name: `Re-analyse with engine ${ENGINE_VERSION}` }).click();
  await expect(page.getByTestId('analysis-progress')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await expect(page.getByTestId('outdated-engine')).toHaveCount(0, { timeout: 20_000 });
  await expect(page.getByText(`Engine ${ENGINE_VERSION}`).first()).toBeVisible();
});

test('a revision is re-analysed with the current engine in one action, its progress shown', async ({ browser }) => {
  test.setTimeout(150_000);
  const viewer = await browser.newPage();
  await signIn(viewer, 'viewer@example.test');
  await viewer.goto(`/projects/${projectId}/revisions/${revisionId}`);
  await expect(viewer.getByTestId('outdated-summary')).toContainText('2 capture sets of this revision');
  await expect(viewer.getByRole('button', { name: /Re-analyse/ })).toHaveCount(0);
  await viewer.close();

  const page = await browser.newPage();
  await signIn(page, 'tester@example.test');
  await page.goto(`/projects/${projectId}/revisions/${revisionId}`);
  await expect(page.getByTestId('outdated-summary')).toContainText(`measured with an older engine (${OLD}); the current engine is ${ENGINE_VERSION}`);
  await page.getByRole('button', { name: 'Re-analyse this revision (2)' }).click();
  await expect(page.getByRole('status').filter({ hasText: `Re-analysing 2 capture sets with engine ${ENGINE_VERSION}` })).toBeVisible();
  const progress = page.getByTestId('reanalyse-progress');
  await expect(progress).toBeVisible();
  await expect(page.getByTestId('reanalyse-count')).toContainText(/\d of 2 done/);
  await expect(page.getByRole('progressbar', { name: 'Re-analysis progress' })).toHaveAttribute('aria-valuemax', '2');
  await expect(progress).toHaveAttribute('data-finished', 'true', { timeout: 120_000 });
  await expect(page.getByTestId('reanalyse-count')).toContainText(`2 of 2 done with engine ${ENGINE_VERSION}`);
  await expect(page.getByTestId('outdated-none')).toBeVisible({ timeout: 20_000 });
  // the newest reading of each set is now the current engine's
  const rows = await getDb()('readings').whereIn('capture_set_id', sets.slice(0, 2)).orderBy('created_at', 'desc').select<{ capture_set_id: string; engine_version: string }[]>('capture_set_id', 'engine_version');
  for (const id of sets.slice(0, 2)) expect(rows.find((r) => r.capture_set_id === id)?.engine_version).toBe(ENGINE_VERSION);
});
