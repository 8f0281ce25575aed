import { expect, test, type Page } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { formatPercent } from '../../components/stack/format';
import { applyWhatIf, NO_WHAT_IF, WHAT_IF_POLARISER } from '../../components/stack/planner-model';
import { getStackTemplate, predictStack } from '../../lib/optics';
import { signIn } from './helpers';

// The planner is checked on the demo project's newest revision. Its stored stack is put back
// afterwards, and every reading made here is removed with its capture set.
let labId = '';
let projectId = '';
let revisionId = '';
// A revision of its own, so the demo's seeded readings never mix with the ones this file places.
const REV_LABEL = `VX-P${Date.now() % 100000}`;

const birdbath = getStackTemplate('birdbath').stack;

test.beforeAll(async () => {
  const db = getDb();
  const project = await db('projects').where({ name: 'Visor VX birdbath' }).first<{ id: string; lab_id: string }>('id', 'lab_id');
  projectId = project.id;
  labId = project.lab_id;
  const last = await db('revisions').where({ project_id: projectId }).max<{ max: number }[]>('position as max').first();
  const [rev] = await db('revisions')
    .insert({ lab_id: labId, project_id: projectId, label: REV_LABEL, position: Number(last?.max ?? 0) + 1, status: 'built', stack: JSON.stringify({ elements: [] }) })
    .returning<{ id: string }[]>('id');
  revisionId = rev!.id;
});

test.afterAll(async () => {
  const db = getDb();
  await db('revisions').where({ id: revisionId }).delete();
  await closeDb();
});

const stackPage = () => `/projects/${projectId}/revisions/${revisionId}/stack`;

async function storedStack(): Promise<{ elements: Record<string, unknown>[] }> {
  const row = await getDb()('revisions').where({ id: revisionId }).first<{ stack: { elements: Record<string, unknown>[] } }>('stack');
  return row.stack;
}

async function readingsOfRevision(): Promise<number> {
  const r = await getDb()('readings').where({ revision_id: revisionId }).count<{ count: string }[]>('* as count').first();
  return Number(r?.count ?? 0);
}

async function openAs(page: Page, email: string) {
  await signIn(page, email);
  await page.goto(stackPage());
  await expect(page.getByTestId('revision-label')).toContainText(REV_LABEL);
}

test('a lead applies the birdbath template, sees the predicted budget, tries a what-if, saves and finds it after a reload', async ({ page }) => {
  await openAs(page, 'lead@example.test');
  await expect(page.getByText('No stack yet')).toBeVisible();
  if ((await readingsOfRevision()) === 0) await expect(page.getByTestId('no-readings')).toBeVisible();

  await page.getByLabel('Starting template').selectOption('birdbath');
  await page.getByRole('button', { name: 'Apply template' }).click();
  await expect(page.getByTestId('element-3')).toHaveAttribute('data-kind', 'combiner');

  const expected = predictStack(birdbath);
  // R_bs·R_c·T_bs of the template's 48/48 splitter and R 0.5 combiner.
  expect(expected.eta).toBeCloseTo(0.48 * 0.5 * 0.48, 10);
  expect(expected.tau).toBeCloseTo(0.47 * 0.48, 10);
  await expect(page.getByTestId('pred-eta')).toHaveText(formatPercent(expected.eta));
  await expect(page.getByTestId('pred-eta')).toHaveText('11.5 %');
  await expect(page.getByTestId('pred-tau')).toHaveText(formatPercent(expected.tau));
  await expect(page.getByTestId('pred-ghost-u')).toHaveText(formatPercent(expected.ghost?.unpolarised));
  await expect(page.getByTestId('pred-ghost-s')).toHaveText(formatPercent(expected.ghost?.s));
  await expect(page.getByTestId('pred-handedness')).toContainText('not mirrored');
  await expect(page.getByTestId('contrast-chart').locator('.vm-curve-stack path.recharts-line-curve')).toHaveCount(1);
  await expect(page.getByTestId('planner-cautions')).toContainText('sun');

  // A slider changes the prediction, not the stack.
  await page.getByLabel('What-if combiner reflectance R').fill('0.7');
  const whatIf = predictStack(applyWhatIf(birdbath, { ...NO_WHAT_IF, combinerR: 0.7 }));
  await expect(page.getByTestId('pred-eta')).toHaveText(formatPercent(whatIf.eta));
  expect(formatPercent(whatIf.eta)).not.toBe(formatPercent(expected.eta));
  await expect(page.getByTestId('contrast-chart').locator('.vm-curve-whatif path.recharts-line-curve')).toHaveCount(1);
  await expect(page.getByTestId('element-3').getByLabel('Reflectance R')).toHaveValue('0.5');
  expect((await storedStack()).elements).toHaveLength(0);

  await page.getByRole('button', { name: 'Apply to stack' }).click();
  await expect(page.getByTestId('element-3').getByLabel('Reflectance R')).toHaveValue('0.7');
  await expect(page.getByTestId('save-state')).toHaveText('Unsaved changes');
  await page.getByRole('button', { name: 'Save stack' }).click();
  await expect(page.getByTestId('save-status')).toContainText('saved');
  const saved = await storedStack();
  expect(saved.elements.map((e) => e.kind)).toEqual(['display', 'plate-beam-splitter', 'combiner']);
  expect(saved.elements[2]?.R).toBe(0.7);

  await page.reload();
  await expect(page.getByTestId('element-3').getByLabel('Reflectance R')).toHaveValue('0.7');
  await expect(page.getByTestId('save-state')).toHaveText('Saved');
  await expect(page.getByTestId('pred-eta')).toHaveText(formatPercent(whatIf.eta));
});

test('R + T above 1 shows a field error beside the input and saves nothing', async ({ page }) => {
  await getDb()('revisions').where({ id: revisionId }).update({ stack: JSON.stringify(birdbath) });
  await openAs(page, 'lead@example.test');
  const splitter = page.getByTestId('element-2');
  const t = splitter.getByLabel('Transmittance T');
  await t.fill('0.6');
  await expect(t).toHaveAttribute('aria-invalid', 'true');
  await expect(splitter.getByRole('alert')).toContainText('R + T must not exceed 1');
  await expect(page.getByText('No prediction yet')).toBeVisible();
  await page.getByRole('button', { name: 'Save stack' }).click();
  await expect(page.getByTestId('save-status')).toContainText('nothing was saved');
  expect(await storedStack()).toEqual(birdbath);

  // An index outside 1.0–2.5 is refused the same way.
  await t.fill('0.48');
  const n = splitter.getByLabel('Substrate index n');
  await n.fill('3.1');
  await expect(splitter.getByRole('alert')).toContainText('between 1.0 and 2.5');
  await n.fill('1.52');
  await expect(page.getByTestId('pred-eta')).toHaveText('11.5 %');

  // A template over a non-empty stack asks first; declining keeps the stack as it is.
  await page.getByLabel('Starting template').selectOption('birdbath-polariser');
  page.once('dialog', (d) => void d.dismiss());
  await page.getByRole('button', { name: 'Apply template' }).click();
  await expect(page.getByTestId('element-4')).toHaveCount(0);
  page.once('dialog', (d) => void d.accept());
  await page.getByRole('button', { name: 'Apply template' }).click();
  await expect(page.getByTestId('element-4')).toHaveAttribute('data-kind', 'linear-polariser');
  const withPolariser = predictStack(getStackTemplate('birdbath-polariser').stack);
  await expect(page.getByTestId('pred-tau')).toHaveText(formatPercent(withPolariser.tau));
  expect(await storedStack()).toEqual(birdbath);
});

test('a viewer sees the stack and the planner read-only, with no way to save', async ({ page }) => {
  await getDb()('revisions').where({ id: revisionId }).update({ stack: JSON.stringify(birdbath) });
  await openAs(page, 'viewer@example.test');
  await expect(page.getByTestId('read-only')).toBeVisible();
  await expect(page.getByTestId('pred-eta')).toHaveText('11.5 %');
  await expect(page.getByRole('button', { name: 'Save stack' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: 'Apply template' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: /Remove element/ })).toHaveCount(0);
  const r = page.getByTestId('element-2').getByLabel('Reflectance R');
  await expect(r).toHaveAttribute('readonly', '');
  // The sliders still work for a viewer: they change nothing stored.
  await page.getByLabel('What-if splitter reflectance R').fill('0.3');
  await expect(page.getByTestId('pred-eta')).not.toHaveText('11.5 %');
  await expect(page.getByRole('button', { name: 'Apply to stack' })).toHaveCount(0);
  expect(await storedStack()).toEqual(birdbath);
});

test('measured readings sit on the curve at their background luminance; one without a background is listed beside it', async ({ page }) => {
  const db = getDb();
  await db('revisions').where({ id: revisionId }).update({ stack: JSON.stringify(birdbath) });
  const pred = predictStack(birdbath);
  const at = (bg: number) => 1 + (pred.eta * 3000) / (pred.tau * bg);
  const shots = [
    { label: 'e2e office', variant: 'no polariser', bg: 200, acr: at(200) * 0.97 },
    { label: 'e2e window', variant: 'no polariser', bg: 2000, acr: at(2000) * 1.02 },
    { label: 'e2e unknown light', variant: 'with polariser', bg: null, acr: 2.4 },
    // no typed background, but the photos' EXIF gives a rough one: placed there, marked as an estimate
    { label: 'e2e exif only', variant: 'with polariser', bg: null, acr: 2.2, abs: { kind: 'rough-estimate', on: 900, off: 160, ambient: 729.7 } },
  ];
  for (const s of shots) {
    const [cs] = await db('capture_sets').insert({ lab_id: labId, revision_id: revisionId, label: s.label, variant: s.variant, pattern: 'full' }).returning<{ id: string }[]>('id');
    if (!cs) throw new Error('no capture set');
    // An older analysis of the same shot, at a different background: only the newest may count.
    for (const [age, bg, acr] of [
      ['2 hours', 35_000, 1.01],
      ['1 minute', s.bg, s.acr],
    ] as const) {
      const [an] = await db('analyses').insert({ lab_id: labId, capture_set_id: cs.id, status: 'done', engine_version: 'e2e' }).returning<{ id: string }[]>('id');
      if (!an) throw new Error('no analysis');
      await db('readings').insert({
        lab_id: labId,
        analysis_id: an.id,
        capture_set_id: cs.id,
        revision_id: revisionId,
        project_id: projectId,
        variant: s.variant,
        engine_version: 'e2e',
        ambient_contrast_ratio: acr,
        ghost_ratio: 0.004,
        transmission: 0.21,
        background_cdm2: bg,
        result: JSON.stringify(age === '1 minute' && 'abs' in s ? { absoluteLuminance: s.abs } : {}),
        created_at: db.raw(`now() - interval '${age}'`),
      });
    }
  }

  await openAs(page, 'lead@example.test');
  const chart = page.getByTestId('contrast-chart');
  await expect(chart.locator('svg.recharts-surface')).toBeVisible();
  await expect(chart.locator('.vm-curve-stack path.recharts-line-curve')).toHaveCount(1);
  const points = chart.getByTestId('measured-point');
  await expect(points).toHaveCount(3);
  await expect(chart.locator('[data-testid="measured-point"][data-estimate="yes"]')).toHaveCount(1);
  await expect(page.getByTestId('estimated-count')).toContainText('estimated from EXIF (1)');
  await expect(page.getByTestId('plotted-count')).toContainText('3 of 4 newest readings are on the chart, 1 at a background estimated');
  await expect(page.getByTestId('unplotted-readings')).toContainText('no background luminance recorded');
  await expect(page.getByTestId('unplotted-readings')).toContainText('with polariser');

  // Placement on the log axis: each point's x is where log10(background) falls between the
  // axis ends at 10 and 40,000 cd/m² (in the svg's own coordinates).
  const axis = chart.locator('.recharts-xAxis line.recharts-cartesian-axis-line');
  const x1 = Number(await axis.getAttribute('x1'));
  const x2 = Number(await axis.getAttribute('x2'));
  expect(x2).toBeGreaterThan(x1);
  const cxs = (await points.locator('circle').evaluateAll((els) => els.map((e) => Number(e.getAttribute('cx'))))).sort((a, b) => a - b);
  const expectedX = (bg: number) => x1 + ((x2 - x1) * Math.log10(bg / 10)) / Math.log10(40_000 / 10);
  expect(cxs[0]).toBeCloseTo(expectedX(200), 0);
  expect(cxs[1]).toBeCloseTo(expectedX(729.7), 0);
  expect(cxs[2]).toBeCloseTo(expectedX(2000), 0);

  // predicted against measured per variant: each variant with its own readings only
  const table = page.getByTestId('comparison-table');
  const row = table.locator('tr', { hasText: REV_LABEL }).filter({ hasText: 'no polariser' });
  await expect(row).toContainText('2');
  await expect(row).toContainText(formatPercent(pred.tau));
  await expect(row).toContainText('21.0 %');
  await expect(table.locator('tr', { hasText: REV_LABEL }).filter({ hasText: 'with polariser' })).toContainText('≈730 cd/m² (EXIF estimate)');

  // a stack per variant: "with polariser" is the base stack plus a polariser
  const variant = page.getByTestId('variant-stacks').locator('fieldset[data-variant="with polariser"]');
  await variant.getByRole('button', { name: 'Add to with polariser' }).click();
  await page.getByRole('button', { name: 'Save stack' }).click();
  await expect(page.getByTestId('save-status')).toContainText('saved');
  const stored = await getDb()('revisions').where({ id: revisionId }).first<{ variant_stacks: Record<string, { add: { kind: string }[] }> }>('variant_stacks');
  expect(stored.variant_stacks['with polariser']?.add.map((e) => e.kind)).toEqual(['linear-polariser']);
  const withPol = predictStack({ elements: [...birdbath.elements, { ...WHAT_IF_POLARISER, label: undefined }] });
  const perVariant = page.getByTestId('variant-predicted-measured');
  await expect(perVariant.locator('tr', { hasText: 'with polariser' })).toContainText(formatPercent(withPol.tau));
  await expect(perVariant.locator('tr', { hasText: 'no polariser' })).toContainText(formatPercent(pred.tau));
  await page.screenshot({ path: `${test.info().outputDir}/planner.png`, fullPage: true });
});
