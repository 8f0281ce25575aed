import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { apiAs, signIn } from './helpers';

test.afterAll(async () => {
  await closeDb();
});

/** A capture set of its own in the demo's first revision, made over the API as the tester. */
async function newSet(label: string): Promise<{ id: string; revisionId: string; projectId: string }> {
  const db = getDb();
  const rev = await db('revisions as r').join('labs as l', 'l.id', 'r.lab_id').where('l.name', 'Kestrel Row Optics Lab').orderBy('r.position').first('r.id', 'r.project_id');
  const api = await apiAs('tester@example.test');
  const res = await api.post('/api/captures', { data: { revisionId: rev.id, label, variant: 'bare', pattern: 'full', ambientLux: 3200, displayLevel: '80 %' } });
  expect(res.status()).toBe(201);
  const { captureSet } = (await res.json()) as { captureSet: { id: string } };
  await api.dispose();
  return { id: captureSet.id, revisionId: rev.id, projectId: rev.project_id };
}

test('a tester edits a capture set’s details; a blank label is refused with nothing changed', async ({ page }) => {
  const stamp = Date.now();
  const set = await newSet(`Details ${stamp}`);
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${set.id}`);
  await page.getByText('Edit label, variant, pattern and conditions').click();
  const form = page.getByRole('form', { name: 'Edit capture set' });
  await expect(form.getByLabel('Label')).toHaveValue(`Details ${stamp}`);
  await expect(form.getByLabel('Ambient illuminance (lx)')).toHaveValue('3200');

  await form.getByLabel('Label').fill('');
  await form.getByRole('button', { name: 'Save capture set' }).click();
  await expect(form.getByText('Enter a label')).toBeVisible();
  expect((await getDb()('capture_sets').where({ id: set.id }).first('label')).label).toBe(`Details ${stamp}`);

  await form.getByLabel('Label').fill(`Edited ${stamp}`);
  await form.getByLabel('Variant (for A/B)').fill('with polarizer');
  await form.getByLabel('Pattern on the display').selectOption('checkerboard');
  await form.getByLabel('Ambient illuminance (lx)').fill('');
  await form.getByRole('button', { name: 'Save capture set' }).click();
  await expect(form.getByRole('status')).toHaveText('Saved');
  await expect(page.getByTestId('capture-label')).toHaveText(`Edited ${stamp}`);
  const row = await getDb()('capture_sets').where({ id: set.id }).first('label', 'variant', 'pattern', 'conditions');
  expect(row).toMatchObject({ label: `Edited ${stamp}`, variant: 'with polarizer', pattern: 'checkerboard' });
  // a measurement left blank is cleared; the others stay
  expect(row.conditions.ambientLux).toBeUndefined();
  expect(row.conditions.displayLevel).toBe('80 %');
  // a tester may edit but not delete
  await expect(page.getByRole('button', { name: 'Delete capture set' })).toHaveCount(0);
});

test('an admin deletes a capture set after confirming and lands on its revision; a viewer sees no details panel', async ({ browser }) => {
  const set = await newSet(`Doomed ${Date.now()}`);
  const viewer = await browser.newPage();
  await signIn(viewer, 'viewer@example.test');
  await viewer.goto(`/captures/${set.id}`);
  await expect(viewer.getByTestId('capture-label')).toBeVisible();
  await expect(viewer.getByText('Capture set details')).toHaveCount(0);
  await viewer.close();

  const admin = await browser.newPage();
  await signIn(admin, 'admin@example.test');
  await admin.goto(`/captures/${set.id}`);
  // dismissing the question keeps the set
  admin.once('dialog', (d) => void d.dismiss());
  await admin.getByRole('button', { name: 'Delete capture set' }).click();
  await admin.waitForTimeout(300);
  expect(await getDb()('capture_sets').where({ id: set.id }).first('id')).toBeTruthy();
  admin.once('dialog', (d) => void d.accept());
  await admin.getByRole('button', { name: 'Delete capture set' }).click();
  await admin.waitForURL(`**/projects/${set.projectId}/revisions/${set.revisionId}`);
  expect(await getDb()('capture_sets').where({ id: set.id }).first('id')).toBeUndefined();
  await admin.close();
});
