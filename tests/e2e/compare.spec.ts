import { readFile } from 'node:fs/promises';
import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { signIn } from './helpers';

// Runs against the seeded demo lab: VX-B has two variants of at least 4 analysed captures each.
let projectId: string;
let revisions: Record<string, string>;

test.beforeAll(async () => {
  const db = getDb();
  const project = await db('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Visor VX birdbath' }).first<{ id: string }>('p.id');
  projectId = project.id;
  const rows = await db('revisions').where({ project_id: projectId }).select<{ id: string; label: string }[]>('id', 'label');
  revisions = Object.fromEntries(rows.map((r) => [r.label, r.id]));
});

test.afterAll(async () => {
  await closeDb();
});

test('the VX-B variants compare with a difference, its CI, Welch figures and a plain verdict; the choice stays in the URL', async ({ page }, testInfo) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}/revisions/${revisions['VX-B']}`);
  await page.getByRole('link', { name: 'Compare variants' }).click();
  await page.waitForURL(/\/compare\?a=.+&b=.+/);
  const url = new URL(page.url());
  expect(url.searchParams.get('a')).toBe(`${revisions['VX-B']}:without polarizer`);
  expect(url.searchParams.get('b')).toBe(`${revisions['VX-B']}:with polarizer`);
  await expect(page.getByTestId('compare-title')).toHaveText('VX-B · with polarizer against VX-B · without polarizer');

  const diff = page.getByTestId('difference-ambientContrastRatio');
  await expect(diff).toHaveText(/^[+−]\d+\.\d+ ± \d+\.\d+$/);
  const verdict = page.getByTestId('verdict-ambientContrastRatio');
  await expect(verdict).toHaveText(/^VX-B · with polarizer \(against VX-B · without polarizer\) (raises|lowers|leaves) the ambient contrast ratio .*; 5 vs 5 captures; .*p [=<] \d/);
  // the summary names every metric that moved, the gain and the loss together
  const headline = page.getByTestId('headline-verdict');
  await expect(headline).toContainText('Gains: raises the ambient contrast ratio by');
  await expect(headline).toContainText('Losses: lowers the see-through transmission by');
  await expect(headline).toContainText('percentage points');
  // the polariser costs the see-through transmission (and, measured apart from the veil, the optics' own)
  await expect(page.getByTestId('summary-moves').locator('[data-tone="bad"]', { hasText: 'see-through transmission' })).toHaveCount(1);
  // coloured by what is good for the team: a significant loss is not green
  await expect(page.locator('tr[data-metric="transmission"]')).toHaveAttribute('data-tone', 'bad');
  await expect(page.locator('tr[data-metric="ambientContrastRatio"]')).toHaveAttribute('data-tone', 'good');
  await expect(page.getByTestId('verdict-transmission')).toHaveClass(/text-fail/);
  // the chart: each group's captures, mean and 95% CI per metric
  await expect(page.getByTestId('comparison-chart')).toBeVisible();
  const acrChart = page.getByTestId('compare-chart-ambientContrastRatio');
  await expect(acrChart).toHaveAttribute('data-tone', 'good');
  await expect(acrChart.locator('[data-testid="compare-point"]')).toHaveCount(10);
  await expect(acrChart.locator('[data-testid="compare-mean"]')).toHaveCount(2);
  await expect(page.getByTestId('compare-chart-transmission')).toHaveAttribute('data-tone', 'bad');
  const row = page.locator('tr[data-metric="ambientContrastRatio"] td');
  await expect(row.nth(0)).toHaveText('5');
  await expect(row.nth(2)).toHaveText('5');
  await expect(row.nth(5)).toHaveText(/^[+−]\d+(\.\d)? %$/); // change as a share of A
  await expect(row.nth(6)).toHaveText(/^[−-]?\d+\.\d\d$/); // Welch t
  await expect(row.nth(7)).toHaveText(/^\d+\.\d$/); // df

  // previews of both sides with the measured regions drawn over them
  await expect(page.getByTestId('compare-preview')).toHaveCount(8);
  await expect(page.getByTestId('compare-preview').first().locator('rect[data-region="screen"]')).toHaveCount(1);
  const img = page.getByTestId('compare-preview').first().locator('img');
  await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth > 0)).toBe(true);
  await page.screenshot({ path: testInfo.outputPath('compare-vx-b.png'), fullPage: true });

  // the same URL opened afresh shows the same comparison
  await page.goto(url.toString());
  await expect(page.getByTestId('difference-ambientContrastRatio')).toHaveText(await diff.innerText());
});

test('the comparison sorts by the size of the change and by p, each verdict staying under its metric', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}/compare?a=${encodeURIComponent(`${revisions['VX-B']}:without polarizer`)}&b=${encodeURIComponent(`${revisions['VX-B']}:with polarizer`)}`);
  const table = page.getByTestId('comparison-table');
  const metricRows = table.locator('tbody tr[data-metric]');
  const catalogue = await metricRows.evaluateAll((els) => els.map((e) => e.getAttribute('data-metric')));
  // a figure per row in the order shown; '—' (no figure) as null
  const column = (n: number) =>
    metricRows.evaluateAll(
      (els, i) =>
        els.map((e) => {
          const t = (e.querySelectorAll('td')[i]?.textContent ?? '').trim();
          if (t === '—') return null;
          const below = t.startsWith('<');
          const v = Number(t.replace(/^< /, '').replace('−', '-').replace(' %', ''));
          return below ? v / 2 : v;
        }),
      n,
    );
  const verdictFollows = () => table.locator('tbody tr').evaluateAll((els) => els.every((e, i) => (i % 2 === 0 ? e.hasAttribute('data-metric') : els[i - 1]?.getAttribute('data-metric') === e.querySelector('td')?.getAttribute('data-testid')?.replace('verdict-', ''))));

  await page.getByRole('button', { name: 'Change' }).click();
  await expect(table).toHaveAttribute('data-order', 'change');
  const changes = await column(5);
  const sizes = changes.filter((v): v is number => v !== null).map(Math.abs);
  expect(sizes.length).toBeGreaterThan(2);
  expect(sizes).toEqual([...sizes].sort((x, y) => y - x));
  expect(changes.slice(sizes.length).every((v) => v === null)).toBe(true);
  expect(await verdictFollows()).toBe(true);

  await page.getByRole('button', { name: 'p', exact: true }).click();
  await expect(table).toHaveAttribute('data-order', 'p');
  const ps = (await column(8)).filter((v): v is number => v !== null);
  expect(ps.length).toBeGreaterThan(2);
  expect(ps).toEqual([...ps].sort((x, y) => x - y));
  expect(await verdictFollows()).toBe(true);
  await expect(table.locator('th[aria-sort="ascending"]')).toContainText('p');

  // Export CSV saves the table in the order shown, one line per metric with its verdict
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()]);
  expect(download.suggestedFilename()).toMatch(/-per-metric\.csv$/);
  const csv = (await readFile(await download.path(), 'utf8')).trim().split('\r\n');
  expect(csv[0]).toMatch(/^Metric,n A,A mean ± CI \(VX-B · without polarizer\),n B,/);
  const shown = await metricRows.evaluateAll((els) => els.map((e) => e.querySelector('th')?.childNodes[0]?.textContent ?? ''));
  expect(csv.slice(1).map((l) => l.split(',')[0])).toEqual(shown);
  const acrLine = csv.find((l) => l.startsWith('Ambient contrast ratio,')) ?? '';
  expect(acrLine).toContain(await page.getByTestId('difference-ambientContrastRatio').innerText());
  expect(acrLine).toContain(await page.getByTestId('verdict-ambientContrastRatio').innerText());

  // the metric heading twice: back to the catalogue's order, then reversed
  await page.getByRole('button', { name: 'Metric' }).click();
  await expect(table).toHaveAttribute('data-order', 'metric');
  expect(await metricRows.evaluateAll((els) => els.map((e) => e.getAttribute('data-metric')))).toEqual(catalogue);
  await page.getByRole('button', { name: 'Metric' }).click();
  await expect(table).toHaveAttribute('data-reverse', 'yes');
  expect(await metricRows.evaluateAll((els) => els.map((e) => e.getAttribute('data-metric')))).toEqual([...catalogue].reverse());
});

test('the revision page gives n, mean ± CI and SD per metric and variant, the same figures the comparison shows', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}/compare?a=${encodeURIComponent(`${revisions['VX-B']}:without polarizer`)}&b=${encodeURIComponent(`${revisions['VX-B']}:with polarizer`)}`);
  const cmp = page.locator('tr[data-metric="ambientContrastRatio"] td');
  const fromCompare = { nA: await cmp.nth(0).innerText(), a: await cmp.nth(1).innerText(), nB: await cmp.nth(2).innerText(), b: await cmp.nth(3).innerText() };

  await page.goto(`/projects/${projectId}/revisions/${revisions['VX-B']}`);
  const table = page.getByTestId('revision-statistics');
  const cells = (variant: string) => table.locator('tbody tr', { hasText: 'Ambient contrast ratio' }).filter({ has: page.locator('td:nth-child(2)', { hasText: new RegExp(`^${variant}$`) }) }).locator('td');
  await expect(cells('without polarizer').nth(2)).toHaveText(fromCompare.nA);
  await expect(cells('without polarizer').nth(3)).toHaveText(fromCompare.a);
  await expect(cells('with polarizer').nth(2)).toHaveText(fromCompare.nB);
  await expect(cells('with polarizer').nth(3)).toHaveText(fromCompare.b);
  await expect(cells('with polarizer').nth(4)).toHaveText(/^\d+(\.\d+)?$/); // SD, two significant digits
  // all captures: at least both variants together
  const all = Number(await cells('all').nth(2).innerText());
  expect(all).toBeGreaterThanOrEqual(Number(fromCompare.nA) + Number(fromCompare.nB));
  await expect(page.getByTestId('revision-statistics-note')).toContainText('newest reading');
});

test('the project page links to a comparison already chosen in the URL', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}`);
  await page.getByRole('link', { name: 'Compare', exact: true }).click();
  await page.waitForURL(/\/compare\?a=.+&b=.+/);
  await expect(page.getByTestId('comparison-table')).toBeVisible();
});

test('two revisions chosen in the picker land in the URL and compare', async ({ page }) => {
  await signIn(page, 'tester@example.test');
  await page.goto(`/projects/${projectId}/compare`);
  await page.getByTestId('group-a').selectOption(revisions['VX-A']!);
  await page.getByTestId('group-b').selectOption(revisions['VX-C']!);
  await page.getByRole('button', { name: 'Compare', exact: true }).click();
  await page.waitForURL(new RegExp(`a=${revisions['VX-A']}&b=${revisions['VX-C']}`));
  await expect(page.getByTestId('compare-title')).toHaveText('VX-C against VX-A');
  await expect(page.getByTestId('verdict-ambientContrastRatio')).toHaveText(/^VX-C \(against VX-A\) (raises|lowers|leaves) the ambient contrast ratio .* ± .*; \d+ vs \d+ captures;/);
  await expect(page.getByTestId('difference-ambientContrastRatio')).toHaveText(/± \d/);
});

test('a group that is not in the project says so and shows no statistics', async ({ page }) => {
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${projectId}/compare?a=${revisions['VX-A']}&b=00000000-0000-4000-8000-000000000000`);
  await expect(page.getByText('Group B is not a revision of this project')).toBeVisible();
  await expect(page.getByTestId('comparison-table')).toHaveCount(0);
});

test('a project with one group of readings says what to capture to compare, instead of an empty page', async ({ page }) => {
  // the seeded helmet project: one measured revision, no variant labels
  const project = await getDb()('projects as p').join('labs as l', 'l.id', 'p.lab_id').where({ 'l.name': DEMO_LAB, 'p.name': 'Ridgeline M2 helmet HUD' }).first<{ id: string }>('p.id');
  await signIn(page, 'viewer@example.test');
  await page.goto(`/projects/${project.id}/compare`);
  const note = page.getByTestId('compare-one-group');
  await expect(note).toContainText('Only one group has readings so far');
  await expect(note).toContainText('M2-P1');
  await expect(note).toContainText('variant labels');
  await expect(page.getByTestId('comparison-table')).toHaveCount(0);
});
