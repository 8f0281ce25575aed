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
  await expect(panel.getByTestId('target-checks')).toContainText('Ambient contrast ratio at least 1.2 : 1');
  await expect(panel.getByTestId('target-checks')).toContainText('default');
  // the default's condition is structured: against a very bright background, which no M2 capture states
  await expect(panel.getByTestId('target-checks')).toContainText('background at least 30,000 cd/m²');
  await expect(panel.getByTestId('target-checks').locator('[data-status]').first()).toHaveAttribute('data-status', 'no-data');
  await expect(panel.getByTestId('target-checks')).toContainText('left out');

  // refused: nothing written, the message beside the field, the typed text kept
  const form = panel.getByRole('form', { name: 'New target' });
  await form.getByLabel('Value').fill('lots');
  await form.getByLabel('Note').fill('bench, 5000 lx');
  await form.getByRole('button', { name: 'Add target' }).click();
  await expect(form.getByText('Enter a number')).toBeVisible();
  await expect(form.getByLabel('Note')).toHaveValue('bench, 5000 lx');
  expect(await getDb()('targets').where({ project_id: projectId }).count<{ count: string }[]>('* as count')).toEqual([{ count: '1' }]);

  // the ghost is typed as a percentage, as every screen shows it
  await form.getByLabel('Metric').selectOption('ghostRatio');
  await expect(form.getByLabel('Value (%)')).toBeVisible();
  await form.getByLabel('Must be').selectOption('<=');
  await form.getByLabel('Value').fill('2');
  await form.getByRole('button', { name: 'Add target' }).click();
  await expect(panel.getByTestId('target-checks')).toContainText('Ghost ratio at most 2 %');
  expect((await getDb()('targets').where({ project_id: projectId, metric: 'ghostRatio' }).first<{ value: number }>('value')).value).toBeCloseTo(0.02, 12);

  // edit the ghost target
  await panel.getByText('Edit targets').click();
  const edit = panel.getByRole('form', { name: 'Edit target' }).filter({ has: page.locator('select[name="metric"] option[value="ghostRatio"]:checked') });
  await expect(edit.getByLabel('Value')).toHaveValue('2');
  await edit.getByLabel('Value').fill('5');
  await edit.getByRole('button', { name: 'Save' }).click();
  await expect(panel.getByTestId('target-checks')).toContainText('Ghost ratio at most 5 %');

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

test('a lead sets a target with a condition; it is judged per variant and only on the capture sets that meet it', async ({ page }) => {
  // the visor project: VX-B and VX-C measured with and without the polarizer, one window-light capture per variant
  const db = getDb();
  const visor = await db('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Visor VX birdbath' }).first<{ id: string }>('p.id');
  const before = await db('targets').where({ project_id: visor.id }).pluck('id');
  try {
    await signIn(page, 'lead@example.test');
    await page.goto(`/projects/${visor.id}`);
    const panel = page.getByTestId('targets-panel');
    const form = panel.getByRole('form', { name: 'New target' });
    await form.getByLabel('Metric').selectOption('tintDeltaE00');
    await form.getByLabel('Must be').selectOption('<=');
    await form.getByLabel('Value').fill('50');
    await form.getByLabel('Ambient from (lx)').fill('200');
    await form.getByLabel('Ambient to (lx)').fill('1000');
    await form.getByLabel('Pattern').selectOption('full');
    await form.getByRole('button', { name: 'Add target' }).click();
    const rows = panel.getByTestId('target-checks').locator('tbody tr', { hasText: 'See-through tint at most 50 ΔE00' });
    await expect(rows).toHaveCount(2);
    for (const v of ['with polarizer', 'without polarizer']) {
      const row = rows.filter({ has: page.locator('td:first-child', { hasText: new RegExp(`^${v}$`) }) });
      await expect(row).toContainText('ambient 200–1,000 lx · full-white pattern');
      // the window-light capture of each variant is left out
      await expect(row).toContainText('+1 left out');
    }
    await expect(page.getByTestId('targets-verdict')).toContainText('as “with polarizer”');
    await expect(page.getByTestId('targets-verdict')).toContainText('as “without polarizer”');

    // a range that runs backwards is refused in words and nothing is written
    await form.getByLabel('Value').fill('3');
    await form.getByLabel('Ambient from (lx)').fill('900');
    await form.getByLabel('Ambient to (lx)').fill('100');
    await form.getByRole('button', { name: 'Add target' }).click();
    await expect(form.getByText('The highest ambient illuminance must not be below the lowest')).toBeVisible();
    expect((await db('targets').where({ project_id: visor.id }).whereNotIn('id', before)).length).toBe(1);
  } finally {
    await db('targets').where({ project_id: visor.id }).whereNotIn('id', before).delete();
  }
});
