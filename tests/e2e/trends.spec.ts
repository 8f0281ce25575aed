import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { listProjectLatest } from '../../db/queries/projects';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { formatMetricValue } from '../../lib/format';
import { signIn } from './helpers';

// The seeded demo project: VX-A, VX-B, VX-C in order, each with analysed captures. Its seeded
// targets are set aside; two targets are added for the test and removed after it, and the seeded
// ones put back (invented values).
let projectId: string;
let labId: string;
let readings: number;
const targetIds: string[] = [];
let seededTargets: Record<string, unknown>[] = [];
let revisionsWithInterval: number;
let variants: string[];

test.beforeAll(async () => {
  const db = getDb();
  const project = await db('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Visor VX birdbath' }).first<{ id: string; lab_id: string }>('p.id', 'p.lab_id');
  projectId = project.id;
  labId = project.lab_id;
  const n = await db.raw('SELECT count(DISTINCT capture_set_id)::int AS n FROM readings WHERE project_id = ? AND ambient_contrast_ratio IS NOT NULL', [projectId]);
  readings = n.rows[0].n as number;
  // a revision has an interval from 2 capture sets on (other specs may add revisions with one)
  // one line per variant: a mean and interval per revision and variant
  const withCi = await db.raw('SELECT count(*)::int AS n FROM (SELECT g.revision_id, c.variant FROM readings g JOIN capture_sets c ON c.id = g.capture_set_id WHERE g.project_id = ? AND g.ambient_contrast_ratio IS NOT NULL GROUP BY g.revision_id, c.variant HAVING count(DISTINCT g.capture_set_id) >= 2) r', [projectId]);
  revisionsWithInterval = withCi.rows[0].n as number;
  const vs = await db.raw('SELECT DISTINCT c.variant FROM readings g JOIN capture_sets c ON c.id = g.capture_set_id WHERE g.project_id = ? ORDER BY 1', [projectId]);
  variants = (vs.rows as { variant: string }[]).map((r) => r.variant);
  seededTargets = await db('targets').where({ project_id: projectId }).select('*');
  await db('targets').where({ project_id: projectId }).delete();
  const rows = await db('targets')
    .insert([
      { lab_id: labId, project_id: projectId, metric: 'ambientContrastRatio', comparator: '>=', value: 1.2, condition_note: 'e2e trend test', is_default: true },
      { lab_id: labId, project_id: projectId, metric: 'ambientContrastRatio', comparator: '>=', value: 1.5, condition_note: 'e2e trend test', is_default: false },
    ])
    .returning<{ id: string }[]>('id');
  targetIds.push(...rows.map((r) => r.id));
});

test.afterAll(async () => {
  await getDb()('targets').whereIn('id', targetIds).delete();
  if (seededTargets.length) await getDb()('targets').insert(seededTargets.map((t) => ({ ...t, condition: JSON.stringify(t.condition ?? {}), variants: JSON.stringify(t.variants ?? []) })));
  await closeDb();
});

test('the trend chart draws means, a CI band, every capture and the target lines, and opens a revision on click', async ({ page }, testInfo) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}`);
  const chart = page.getByTestId('trend-chart');
  await expect(chart).toHaveAttribute('data-metric', 'ambientContrastRatio');
  const svg = chart.locator('svg.recharts-surface').first();
  await expect(svg.locator('.recharts-reference-line')).toHaveCount(2);
  await expect(svg.locator('.recharts-reference-line line')).toHaveCount(2);
  await expect(svg.locator('[data-testid="trend-point"]')).toHaveCount(readings);
  expect(readings).toBeGreaterThanOrEqual(13);
  await expect(svg.locator('[data-testid="trend-mean"]')).toHaveCount(await page.locator('[data-testid="trend-mean"]').count());
  const revisionsWithData = await svg.locator('[data-testid="trend-mean"]').count();
  expect(revisionsWithData).toBeGreaterThanOrEqual(3);
  // the demo revisions are measured with and without the polarizer: one line, band and legend entry per variant
  expect(variants).toEqual(expect.arrayContaining(['with polarizer', 'without polarizer']));
  const band = svg.locator('.vm-ci-band path.recharts-area-area');
  await expect(band).toHaveCount(variants.length);
  expect((await band.first().getAttribute('d'))?.length ?? 0).toBeGreaterThan(20);
  await expect(svg.locator('.vm-trend-line path.recharts-line-curve')).toHaveCount(variants.length);
  const strokes = await svg.locator('.vm-trend-line path.recharts-line-curve').evaluateAll((els) => els.map((e) => e.getAttribute('stroke')));
  expect(new Set(strokes).size).toBe(variants.length);
  const legend = page.getByTestId('trend-legend');
  for (const v of variants) await expect(legend.locator(`[data-variant="${v}"]`)).toHaveText(v);
  await expect(svg.locator('[data-testid="trend-point"][data-variant="with polarizer"]')).not.toHaveCount(0);
  // the interval also as whiskers on every mean that has one (the seeded revisions have 4 and more captures)
  expect(revisionsWithInterval).toBeGreaterThanOrEqual(3);
  await expect(svg.locator('.vm-ci-whisker')).toHaveCount(revisionsWithInterval);
  await expect(chart.getByText('target ≥ 1.5 : 1')).toBeVisible();
  await expect(chart.getByText('target ≥ 1.2 : 1 (default)')).toBeVisible();
  await chart.screenshot({ path: testInfo.outputPath('trend-acr.png') });

  // hover details on a mean
  await svg.locator('[data-testid="trend-mean"]').first().hover();
  await expect(page.locator('.recharts-tooltip-wrapper')).toContainText('mean');

  // metric picker: the ghost ratio has no targets, so no target lines
  await page.getByRole('button', { name: 'Ghost', exact: true }).click();
  await expect(chart).toHaveAttribute('data-metric', 'ghostRatio');
  await expect(svg.locator('.recharts-reference-line')).toHaveCount(0);
  await expect(page).toHaveURL(/metric=ghostRatio/);
  await page.getByRole('button', { name: 'Contrast', exact: true }).click();

  // click through to the revision
  await svg.locator('[data-testid="trend-mean"][data-variant="without polarizer"]').first().click();
  await page.waitForURL(/\/revisions\//);
  await expect(page.getByTestId('revision-label')).toHaveText('VX-A');
  await expect(page.getByTestId('revision-target-summary')).toContainText('targets');
  // its capture sets with the newest reading's ghost, transmission and uniformity beside the contrast
  for (const name of ['Ambient contrast ratio', 'Ghost ratio (%)', 'See-through transmission (%)', 'Uniformity (min/max)']) await expect(page.getByRole('columnheader', { name })).toBeVisible();
  const firstSet = page.getByRole('row').filter({ hasText: 'Measured' }).first();
  // one format everywhere: the ghost and transmission as percentages, the contrast as "x : 1"
  await expect(firstSet).toContainText(/\d+(\.\d+)? %/);
  await expect(firstSet).toContainText(/\d+(\.\d+)? : 1/);
  await expect(firstSet).not.toContainText(/\b0\.\d{4}\b/);
});

test('the projects list gives each project its newest measured revision with the mean contrast and ghost', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto('/projects');
  for (const name of ['Newest revision', 'Contrast (mean)', 'Ghost (mean)']) await expect(page.getByRole('columnheader', { name })).toBeVisible();
  // the figures the query gives (tests/integration/projects-queries.test.ts checks the query itself);
  // other specs may add later revisions to the visor project, some without a ghost
  const latest = (await listProjectLatest(labId)).get(projectId);
  expect(latest).toBeDefined();
  const row = page.getByRole('row', { name: /Visor VX birdbath/ });
  const cells = row.getByRole('cell');
  await expect(cells.nth(4)).toHaveText(latest?.revisionLabel ?? '');
  await expect(cells.nth(5)).toHaveText(formatMetricValue('ambientContrastRatio', latest?.acr));
  await expect(cells.nth(6)).toHaveText(formatMetricValue('ghostRatio', latest?.ghost));
});
