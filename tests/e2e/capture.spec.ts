import { expect, test, type Page } from '@playwright/test';
import { renderCapture } from '../fixtures/capture-generator';
import { apiAs, signIn } from './helpers';
import { closeDb, getDb } from '../../db/index';

// revisions this file adds to the demo project go again, so later specs see the demo as seeded
const madeRevisions: string[] = [];
test.afterAll(async () => {
  if (madeRevisions.length > 0) await getDb()('revisions').whereIn('label', madeRevisions).delete();
  await closeDb();
});

type Payload = { name: string; type: string; bytes: number[] };

/** Drops files on an element the way a browser does: one drop event carrying a DataTransfer. */
async function dropFiles(page: Page, testId: string, files: Payload[]): Promise<void> {
  const dt = await page.evaluateHandle((list: Payload[]) => {
    const d = new DataTransfer();
    for (const f of list) d.items.add(new File([new Uint8Array(f.bytes)], f.name, { type: f.type }));
    return d;
  }, files);
  await page.getByTestId(testId).dispatchEvent('dragenter', { dataTransfer: dt });
  await page.getByTestId(testId).dispatchEvent('drop', { dataTransfer: dt });
}

test('a tester drops a generated triplet, marks the screen, analyses and reads a contrast ratio close to the truth', async ({ browser }) => {
  test.setTimeout(150_000);
  const stamp = Date.now();
  const capture = await renderCapture({ width: 800, height: 600, seed: stamp % 100_000 });
  const truth = capture.truth;

  // revisions are a lead's to create; the capture work is the tester's
  const lead = await browser.newPage();
  await signIn(lead, 'lead@example.test');
  await lead.getByRole('link', { name: 'Visor VX birdbath' }).first().click();
  const revLabel = `E2E-${stamp}`;
  madeRevisions.push(revLabel);
  const newRevision = lead.getByRole('form', { name: 'New revision' });
  await newRevision.getByLabel('Label').fill(revLabel);
  await newRevision.getByLabel('Built on').fill('2026-12-01');
  await newRevision.getByRole('button', { name: 'Add revision' }).click();
  await expect(newRevision.getByRole('status')).toContainText('Added revision');
  await lead.close();

  const page = await browser.newPage();
  await signIn(page, 'tester@example.test');
  await page.getByRole('link', { name: 'Visor VX birdbath' }).first().click();
  await page.getByRole('link', { name: revLabel }).click();
  await expect(page.getByTestId('revision-label')).toHaveText(revLabel);
  const form = page.getByRole('form', { name: 'New capture set' });
  await form.getByLabel('Label').fill('Window light, on axis');
  await form.getByLabel('Variant (for A/B)').fill('with polarizer');
  await form.getByLabel('Ambient illuminance (lx)').fill('many');
  await form.getByRole('button', { name: 'Create capture set' }).click();
  await expect(form.getByText('Ambient illuminance must be a number')).toBeVisible();
  await form.getByLabel('Ambient illuminance (lx)').fill('850');
  await form.getByRole('button', { name: 'Create capture set' }).click();
  await expect(page.getByTestId('capture-label')).toHaveText('Window light, on axis');
  await expect(page.getByRole('note', { name: 'Safety cautions' })).toContainText('sun');

  // a text file dressed up as a photo is refused with its own message
  await dropFiles(page, 'multi-drop', [{ name: 'notes-on.jpg', type: 'image/jpeg', bytes: [...Buffer.from('these are lab notes, not a photo\n'.repeat(4))] }]);
  await expect(page.getByRole('alert').filter({ hasText: 'notes-on.jpg is not an image' })).toBeVisible();

  await dropFiles(page, 'multi-drop', [
    { name: `vx-${stamp}-display-on.jpg`, type: 'image/jpeg', bytes: [...capture.on] },
    { name: `vx-${stamp}-off.jpg`, type: 'image/jpeg', bytes: [...capture.off] },
    { name: `vx-${stamp}-world.jpg`, type: 'image/jpeg', bytes: [...capture.ambient] },
  ]);
  await expect(page.getByRole('progressbar', { name: /Upload of/ })).toHaveCount(3);
  await expect(page.getByTestId('upload-item').filter({ hasText: 'Uploaded.' })).toHaveCount(3, { timeout: 30_000 });
  await expect(page.getByTestId('slot-on')).toContainText(`vx-${stamp}-display-on.jpg`);
  await expect(page.getByTestId('slot-ambient')).toContainText(`vx-${stamp}-world.jpg`);
  await expect(page.getByTestId('exif-on')).toContainText('1/100 s');

  // the screen from the engine's detection, the background drawn by hand
  await page.getByRole('button', { name: 'Detect screen' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Screen found' })).toBeVisible({ timeout: 20_000 });
  await page.getByRole('button', { name: /^Background/ }).click();
  const svg = page.getByTestId('region-svg');
  const box = await svg.boundingBox();
  if (!box) throw new Error('no editor');
  const px = (x: number, y: number) => ({ x: box.x + (x / truth.width) * box.width, y: box.y + (y / truth.height) * box.height });
  const a = px(truth.background.x + 4, truth.background.y + 4);
  const b = px(truth.background.x + truth.background.w - 4, truth.background.y + truth.background.h - 4);
  await page.mouse.move(a.x, a.y);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2, { steps: 4 });
  await page.mouse.move(b.x, b.y, { steps: 4 });
  await page.mouse.up();
  await expect(page.getByTestId('coords-background')).toContainText('marked');
  await page.getByRole('button', { name: 'Save regions' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Regions saved' })).toBeVisible();

  await page.getByRole('button', { name: 'Analyse', exact: true }).click();
  const progress = page.getByTestId('analysis-progress');
  await expect(progress).toBeVisible();
  await expect(progress).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  const acrText = await page.getByTestId('acr-value').textContent({ timeout: 20_000 });
  const acr = Number(acrText);
  expect(Math.abs(acr / truth.ambientContrastRatio - 1)).toBeLessThan(0.015);
  await expect(page.getByTestId('metrics')).toContainText('See-through transmission');
  await expect(page.getByRole('img', { name: /Map of local contrast/ })).toBeVisible();

  // a viewer sees the reading but no upload control, and the upload route refuses them
  const captureUrl = page.url();
  const viewer = await browser.newPage();
  await signIn(viewer, 'viewer@example.test');
  await viewer.goto(captureUrl);
  await expect(viewer.getByTestId('capture-label')).toBeVisible();
  await expect(viewer.getByTestId('multi-drop')).toHaveCount(0);
  await expect(viewer.getByRole('button', { name: /Analyse/ })).toHaveCount(0);
  const captureId = new URL(captureUrl).pathname.split('/').pop() as string;
  const api = await apiAs('viewer@example.test');
  const res = await api.post(`/api/captures/${captureId}/photos?role=dark`, { data: capture.on, headers: { 'content-type': 'application/octet-stream', 'x-file-name': 'dark.jpg' } });
  expect(res.status()).toBe(403);
  await api.dispose();
});
