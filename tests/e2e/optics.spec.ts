import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { analyzeCapture } from '../../lib/photometry';
import { renderOpticsScene } from '../fixtures/optics-scene';
import { apiAs, signIn } from './helpers';

// what this file adds to the demo lab goes again, so later specs see the demo as seeded
const madeSets: string[] = [];
const madeProfiles: string[] = [];
test.afterAll(async () => {
  if (madeSets.length) await getDb()('capture_sets').whereIn('id', madeSets).delete();
  if (madeProfiles.length) await getDb()('camera_profiles').whereIn('id', madeProfiles).delete();
  await closeDb();
});

const demoLab = () => getDb()('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');

test('a slanted-edge reading shows its MTF curve, field of view and display colour on the capture page', async ({ page }) => {
  test.setTimeout(120_000);
  const db = getDb();
  const lab = await demoLab();
  const rev = await db('revisions').where({ lab_id: lab.id }).orderBy('position').first<{ id: string; project_id: string }>('id', 'project_id');
  const api = await apiAs('tester@example.test');
  const res = await api.post('/api/captures', { data: { revisionId: rev.id, label: `Edge ${Date.now()}`, pattern: 'slanted-edge' } });
  expect(res.status()).toBe(201);
  const setId = ((await res.json()) as { captureSet: { id: string } }).captureSet.id;
  madeSets.push(setId);
  await api.dispose();
  // the engine's own reading of a generated slanted-edge capture, stored as the worker stores one
  const s = renderOpticsScene({ width: 1200, height: 800, screen: { x: 300, y: 200, w: 600, h: 400 }, pattern: 'slanted-edge', white: [0.45, 0.42, 0.4], sigma: 1.5, room: 0.08, noise: 0.003, seed: 5 });
  const result = analyzeCapture({ on: { raster: s.on }, off: { raster: s.off }, pattern: 'slanted-edge', ghostOffset: 'none', optics: { degreesPerPixel: 0.01, displayResolution: { width: 1280, height: 720 } } });
  expect(result.sharpness).not.toBeNull();
  const [analysis] = await db('analyses').insert({ lab_id: lab.id, capture_set_id: setId, status: 'done', engine_version: result.engineVersion, progress: 100, stage: 'done', finished_at: new Date() }).returning<{ id: string }[]>('id');
  await db('readings').insert({ lab_id: lab.id, analysis_id: (analysis as { id: string }).id, capture_set_id: setId, revision_id: rev.id, project_id: rev.project_id, engine_version: result.engineVersion, ambient_contrast_ratio: result.ambientContrastRatio, warning_count: result.warnings.length, result: JSON.stringify(result) });

  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${setId}`);
  const optics = page.getByTestId('optics-details');
  await expect(optics.getByTestId('mtf-chart')).toBeVisible();
  await expect(optics.getByTestId('mtf-chart').locator('path.recharts-curve').first()).toBeVisible();
  const mtf50 = optics.getByTestId('sharpness').locator('[data-metric="mtf50"]');
  await expect(mtf50).toContainText((result.sharpness?.mtf50 as number).toFixed(3));
  await expect(mtf50).toContainText('cycles/pixel');
  await expect(optics.getByTestId('geometry').locator('[data-metric="fovH"]')).toContainText((result.geometry?.fovH as number).toFixed(2));
  await expect(optics.getByTestId('geometry').locator('[data-metric="dpp"]')).toContainText('from the camera profile');
  await expect(optics.getByTestId('geometry').locator('[data-metric="ppd"]')).toContainText((result.geometry?.pixelsPerDegree as number).toFixed(1));
  await expect(optics.getByTestId('display-colour').locator('[data-metric="uv"]')).toContainText('CIE 1976 UCS');
  await expect(page.getByText('slanted-edge pattern')).toBeVisible();
});

test('an admin keeps a camera’s degrees per pixel; an angle no lens gives is refused with nothing saved', async ({ page }) => {
  const db = getDb();
  const lab = await demoLab();
  const stamp = Date.now();
  const details = { patch: { x: 1, y: 1, w: 10, h: 10 }, meterCdm2: 250, meanY: 0.4, exposure: { exposureTime: 0.01, fNumber: 8, iso: 100, factor: 0.015625 }, photoName: 'patch.jpg', imageWidth: 400, imageHeight: 300 };
  const [p] = await db('camera_profiles').insert({ lab_id: lab.id, make: 'e2e optics', model: `angle ${stamp}`, name: `Angle camera ${stamp}`, k: 600, calibration: JSON.stringify(details) }).returning<{ id: string }[]>('id');
  const id = (p as { id: string }).id;
  madeProfiles.push(id);
  await signIn(page, 'admin@example.test');
  await page.goto('/settings/cameras');
  const item = page.getByTestId(`camera-e2e-optics-angle-${stamp}`);
  await expect(item.getByTestId('camera-angle')).toContainText('not measured');
  const form = item.getByTestId('degrees-per-pixel-form');
  await expect(form.getByText('Measured on a target of known angle.')).toBeVisible();
  await form.getByLabel('Degrees per pixel').fill('3');
  await form.getByRole('button', { name: 'Save' }).click();
  await expect(form.getByText(/At most 0\.5° per pixel/).first()).toBeVisible();
  expect((await db('camera_profiles').where({ id }).first('degrees_per_pixel')).degrees_per_pixel).toBeNull();
  await form.getByLabel('Degrees per pixel').fill('0.0125');
  await form.getByRole('button', { name: 'Save' }).click();
  await expect(form.getByRole('status')).toContainText('Saved');
  await expect(item.getByTestId('camera-angle')).toContainText('0.0125° per pixel');
  expect((await db('camera_profiles').where({ id }).first('degrees_per_pixel')).degrees_per_pixel).toBe(0.0125);
});
