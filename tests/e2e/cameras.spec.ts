import { expect, test } from '@playwright/test';
import sharp from 'sharp';
import { GREY_STEPS, greyStepsPattern } from '../../lib/patterns';
import { renderCapture, type ExposureSetting } from '../fixtures/capture-generator';
import { apiAs, signIn } from './helpers';
import { closeDb, getDb } from '../../db/index';

// revisions this file adds to the demo project go again, so later specs see the demo as seeded
const madeRevisions: string[] = [];
test.afterAll(async () => {
  if (madeRevisions.length > 0) await getDb()('revisions').whereIn('label', madeRevisions).delete();
  await closeDb();
});

const EXPOSURE: ExposureSetting = { exposureTime: 1 / 100, fNumber: 8, iso: 100 };

/** Re-labels a generated photo as taken by this run's own camera, so no other test's photos match its profile. */
async function asCamera(photo: Buffer | Uint8Array, model: string): Promise<Buffer> {
  return sharp(photo)
    .withExif({ IFD0: { Make: 'E2E Optics', Model: model }, IFD2: { ExposureTime: '1/100', FNumber: '8/1', ISOSpeedRatings: '100' } })
    .jpeg({ quality: 95, chromaSubsampling: '4:4:4' })
    .toBuffer();
}

test('an admin calibrates a camera, checks its linearity, and a capture set from that camera reads in cd/m²', async ({ browser }) => {
  test.setTimeout(180_000);
  const stamp = Date.now();
  const model = `Bench ${stamp}`;
  const profileName = `E2E camera ${stamp}`;
  const cal = await renderCapture({ width: 480, height: 360, seed: stamp % 10_000, ghost: null, displayLevel: 0.4, exposures: { on: EXPOSURE, off: EXPOSURE, ambient: EXPOSURE } });
  const patch = { x: cal.truth.screen.x + 10, y: cal.truth.screen.y + 10, w: cal.truth.screen.w - 20, h: cal.truth.screen.h - 20 };

  const page = await browser.newPage();
  await signIn(page, 'admin@example.test');
  await page.goto('/settings');
  await page.getByRole('link', { name: 'Camera profiles' }).click();
  await expect(page).toHaveURL(/\/settings\/cameras$/);

  // calibration: the photo, a rectangle dragged over the patch, then the exact patch and the meter's reading
  const form = page.getByTestId('calibration-form');
  await form.getByTestId('calibration-photo').setInputFiles({ name: `patch-${stamp}.jpg`, mimeType: 'image/jpeg', buffer: await asCamera(cal.on, model) });
  const img = form.getByRole('img', { name: /drag over the patch/ });
  await expect(img).toBeVisible();
  await img.scrollIntoViewIfNeeded();
  const box = await img.boundingBox();
  if (!box) throw new Error('no preview');
  const at = (x: number, y: number) => ({ x: box.x + (x / cal.truth.width) * box.width, y: box.y + (y / cal.truth.height) * box.height });
  const a = at(patch.x, patch.y);
  const b = at(patch.x + patch.w, patch.y + patch.h);
  await page.mouse.move(a.x, a.y);
  await page.mouse.down();
  await page.mouse.move(b.x, b.y, { steps: 5 });
  await page.mouse.up();
  await expect(form.getByLabel('w', { exact: true })).not.toHaveValue('');
  for (const k of ['x', 'y', 'w', 'h'] as const) await form.getByLabel(k, { exact: true }).fill(String(patch[k]));
  // a reading of zero is refused with a message, nothing saved
  await form.getByLabel('Meter reading (cd/m²)').fill('0');
  await form.getByLabel('Profile name').fill(profileName);
  await form.getByRole('button', { name: 'Calibrate' }).click();
  await expect(form.getByRole('alert').filter({ hasText: 'The meter reading must be above 0 cd/m²' })).toBeVisible();
  await form.getByLabel('Meter reading (cd/m²)').fill('250');
  await form.getByRole('button', { name: 'Calibrate' }).click();
  await expect(form.getByTestId('calibration-result')).toContainText(`Saved ${profileName}`);
  const listed = page.getByTestId('camera-profiles').locator('li', { hasText: profileName });
  await expect(listed).toContainText('k = ');
  await expect(listed).toContainText('Linearity not checked');

  // linearity: a linear camera's photo of the grey steps passes and is kept on the profile
  const steps = greyStepsPattern(440, 120);
  const stepsJpeg = await asCamera(await sharp(steps.data, { raw: { width: steps.width, height: steps.height, channels: 3 } }).png().toBuffer(), model);
  const lin = page.getByTestId('linearity-form');
  await lin.getByTestId('linearity-photo').setInputFiles({ name: 'grey-steps.jpg', mimeType: 'image/jpeg', buffer: stepsJpeg });
  await lin.getByRole('button', { name: 'Check linearity' }).click();
  await expect(lin.getByTestId('linearity-result')).toContainText('Linear: fit for photometry');
  await expect(lin.getByTestId('linearity-result').locator('tbody tr')).toHaveCount(GREY_STEPS.length);
  await expect(listed).toContainText('Linearity checked');

  // a capture set shot with the same camera
  await page.goto('/projects');
  await page.getByRole('link', { name: 'Visor VX birdbath' }).first().click();
  const revLabel = `CAM-${stamp}`;
  madeRevisions.push(revLabel);
  const newRevision = page.getByRole('form', { name: 'New revision' });
  await newRevision.getByLabel('Label').fill(revLabel);
  await newRevision.getByLabel('Built on').fill('2026-12-02');
  await newRevision.getByRole('button', { name: 'Add revision' }).click();
  await expect(newRevision.getByRole('status')).toContainText('Added revision');
  await page.getByRole('link', { name: revLabel }).click();
  const setForm = page.getByRole('form', { name: 'New capture set' });
  await setForm.getByLabel('Label').fill('Calibrated camera');
  await setForm.getByRole('button', { name: 'Create capture set' }).click();
  await expect(page.getByTestId('capture-label')).toHaveText('Calibrated camera');
  const captureId = new URL(page.url()).pathname.split('/').pop() as string;

  const shot = await renderCapture({ width: 480, height: 360, seed: (stamp % 10_000) + 1, displayLevel: 0.5, exposures: { on: EXPOSURE, off: EXPOSURE, ambient: EXPOSURE } });
  const api = await apiAs('admin@example.test');
  for (const role of ['on', 'off'] as const) {
    const res = await api.post(`/api/captures/${captureId}/photos?role=${role}`, { data: await asCamera(shot[role], model), headers: { 'content-type': 'application/octet-stream', 'x-file-name': `cam-${stamp}-${role}.jpg` } });
    expect(res.status()).toBe(201);
  }
  await page.reload();
  await page.getByRole('button', { name: 'Analyse', exact: true }).click();
  await expect(page.getByTestId('analysis-progress')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  const metrics = page.getByTestId('metrics');
  await expect(metrics).toContainText('cd/m²', { timeout: 20_000 });
  await expect(metrics).toContainText(`calibrated with ${profileName}`);
  await expect(metrics).not.toContainText('rough estimate');

  // clean up this run's profile so later runs start from the same list
  const profiles = await api.get('/settings/cameras');
  expect(profiles.status()).toBe(200);
  await api.dispose();
  page.once('dialog', (d) => void d.accept());
  await page.goto('/settings/cameras');
  await page.getByTestId('camera-profiles').locator('li', { hasText: profileName }).getByRole('button', { name: 'Delete' }).click();
  await expect(page.getByTestId('camera-profiles').locator('li', { hasText: profileName })).toHaveCount(0);
});
