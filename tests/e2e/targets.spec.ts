import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { signIn } from './helpers';

let projectId: string;

test.beforeAll(async () => {
  const db = getDb();
  const project = await db('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Ridgeline M2 helmet HUD' }).first<{ id: string }>('p.id');
  projectId = project.id;
  await db('targets').where({ project_id: projectId }).delete();
});

test.afterAll(async () => {
  await getDb()('targets').where({ project_id: projectId }).delete();
  await closeDb();
});

test('a lead adopts a labelled default, adds, edits and removes a target; bad input is refused in words', async ({ page }) => {
  await signIn(page, 'lead@example.test');
  await page.goto(`/projects/${projectId}`);
  const panel = page.getByTestId('targets-panel');
  // defaults are offered with their status word and never as rules
  const def = panel.getByTestId('default-acr-bright-sky');
  await expect(def).toContainText('from memory');
  await expect(panel.getByTestId('default-acr-legible')).toContainText('published');
  await expect(panel).toContainText('not requirements');
  await def.getByRole('button').click();
  await expect(panel.getByTestId('target-checks')).toContainText('Ambient contrast ratio at least 1.200:1');
  await expect(panel.getByTestId('target-checks')).toContainText('default');
  await expect(panel.getByTestId('target-checks').locator('[data-status]').first()).toHaveAttribute('data-status', /pass|fail/);

  // refused: nothing written, the message beside the field, the typed text kept
  const form = panel.getByRole('form', { name: 'New target' });
  await form.getByLabel('Value').fill('lots');
  await form.getByLabel('Condition (e.g. ambient level)').fill('bench, 5000 lx');
  await form.getByRole('button', { name: 'Add target' }).click();
  await expect(form.getByText('Enter a number')).toBeVisible();
  await expect(form.getByLabel('Condition (e.g. ambient level)')).toHaveValue('bench, 5000 lx');
  expect(await getDb()('targets').where({ project_id: projectId }).count<{ count: string }[]>('* as count')).toEqual([{ count: '1' }]);

  await form.getByLabel('Metric').selectOption('ghostRatio');
  await form.getByLabel('Must be').selectOption('<=');
  await form.getByLabel('Value').fill('0.02');
  await form.getByRole('button', { name: 'Add target' }).click();
  await expect(panel.getByTestId('target-checks')).toContainText('Ghost ratio at most 0.0200');

  // edit the ghost target
  await panel.getByText('Edit targets').click();
  const edit = panel.getByRole('form', { name: 'Edit target' }).filter({ has: page.locator('select[name="metric"] option[value="ghostRatio"]:checked') });
  await edit.getByLabel('Value').fill('0.05');
  await edit.getByRole('button', { name: 'Save' }).click();
  await expect(panel.getByTestId('target-checks')).toContainText('Ghost ratio at most 0.0500');

  // the projects list shows the status of the latest measured revision
  await page.goto('/projects');
  await expect(page.getByRole('row', { name: /Ridgeline M2 helmet HUD/ })).toContainText(/M2-P1 (meets|fails)/);

  // remove both
  await page.goto(`/projects/${projectId}`);
  await page.getByText('Edit targets').click();
  page.on('dialog', (d) => void d.accept());
  for (let i = 0; i < 2; i++) {
    await page.getByTestId('targets-panel').getByRole('button', { name: 'Remove' }).first().click();
    await expect(page.getByTestId('targets-panel').getByRole('button', { name: 'Remove' })).toHaveCount(1 - i);
  }
  await expect(page.getByTestId('targets-panel')).toContainText('No targets yet');
});

test('a viewer sees targets but no editing', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByTestId('targets-panel')).toBeVisible();
  await expect(page.getByRole('form', { name: 'New target' })).toHaveCount(0);
});
