import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { apiAs, signIn } from './helpers';

// capture sets this file adds to the demo's first revision go again, so later specs see the demo as seeded
const made: string[] = [];
let api: APIRequestContext;

test.beforeAll(async () => {
  api = await apiAs('tester@example.test');
});

test.afterAll(async () => {
  if (made.length) await getDb()('capture_sets').whereIn('id', made).delete();
  await api.dispose();
  await closeDb();
});

type Rect = { x: number; y: number; w: number; h: number };

async function upload(setId: string, role: string, name: string, bytes: Buffer): Promise<void> {
  const res = await api.post(`/api/captures/${setId}/photos?role=${role}`, { data: bytes, headers: { 'content-type': 'application/octet-stream', 'x-file-name': name } });
  expect(res.status(), await res.text()).toBeLessThan(300);
}

/** A capture set of its own with generated on and off photos and, when given, a saved screen. */
async function setWithPhotos(label: string, seed: number, screen?: Rect): Promise<{ id: string; capture: RenderedCapture }> {
  const db = getDb();
  const rev = await db('revisions as r').join('labs as l', 'l.id', 'r.lab_id').where('l.name', 'Kestrel Row Optics Lab').orderBy('r.position').first('r.id');
  const res = await api.post('/api/captures', { data: { revisionId: rev.id, label, variant: 'bare', pattern: 'full' } });
  expect(res.status()).toBe(201);
  const id = ((await res.json()) as { captureSet: { id: string } }).captureSet.id;
  made.push(id);
  const capture = await renderCapture({ width: 800, height: 600, seed });
  await upload(id, 'on', `${label}-on.jpg`, capture.on);
  await upload(id, 'off', `${label}-off.jpg`, capture.off);
  if (screen) {
    const put = await api.put(`/api/captures/${id}/regions`, { data: { regions: [{ kind: 'screen', ...screen, source: 'marked' }] } });
    expect(put.status()).toBe(200);
  }
  return { id, capture };
}

/** Screen position of a photo pixel in the editor. */
async function pixel(page: Page, W: number, H: number): Promise<(x: number, y: number) => { x: number; y: number }> {
  const box = await page.getByTestId('region-svg').boundingBox();
  if (!box) throw new Error('no editor');
  return (x, y) => ({ x: box.x + (x / W) * box.width, y: box.y + (y / H) * box.height });
}

async function rectOf(page: Page, kind: string): Promise<Rect> {
  const r = page.getByTestId(`rect-${kind}`);
  const n = async (a: string) => Number(await r.getAttribute(a));
  return { x: await n('x'), y: await n('y'), w: await n('width'), h: await n('height') };
}

async function typeRect(page: Page, name: string, r: Rect): Promise<void> {
  await page.getByLabel(`${name} x (px)`).fill(String(r.x));
  await page.getByLabel(`${name} y (px)`).fill(String(r.y));
  await page.getByLabel(`${name} width (px)`).fill(String(r.w));
  await page.getByLabel(`${name} height (px)`).fill(String(r.h));
  await page.getByLabel(`${name} height (px)`).press('Enter');
}

test('with the Ghost tool a drag that starts inside the screen draws a ghost and leaves the screen where it was', async ({ page }) => {
  const stamp = Date.now();
  const probe = await renderCapture({ width: 800, height: 600, seed: 7101 });
  const screen = probe.truth.screen;
  const { id } = await setWithPhotos(`Ghost tool ${stamp}`, 7101, screen);
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${id}`);
  await expect(page.getByTestId('rect-screen')).toBeVisible();
  expect(await rectOf(page, 'screen')).toEqual(screen);

  await page.getByRole('button', { name: /^Ghost/ }).click();
  const at = await pixel(page, 800, 600);
  const a = at(screen.x + 30, screen.y + 25);
  const b = at(screen.x + 30 + 160, screen.y + 25 + 120);
  await page.mouse.move(a.x, a.y);
  // the line above the photo says what a drag from here does
  await expect(page.getByTestId('drag-hint')).toHaveText('Drag to draw the ghost rectangle.');
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2, { steps: 4 });
  await page.mouse.move(b.x, b.y, { steps: 4 });
  await page.mouse.up();

  expect(await rectOf(page, 'screen')).toEqual(screen);
  const ghost = await rectOf(page, 'ghost');
  expect(Math.abs(ghost.x - (screen.x + 30))).toBeLessThanOrEqual(2);
  expect(Math.abs(ghost.y - (screen.y + 25))).toBeLessThanOrEqual(2);
  expect(Math.abs(ghost.w - 160)).toBeLessThanOrEqual(3);
  await expect(page.getByTestId('label-ghost')).toHaveText('Ghost');
  await expect(page.getByTestId('rect-ghost')).toHaveAttribute('data-pattern', 'dotted');
  await expect(page.getByTestId('rect-screen')).toHaveAttribute('data-pattern', 'solid');

  // inside the ghost, the Ghost tool moves the ghost; the screen tool would move the screen
  const inGhost = at(ghost.x + 40, ghost.y + 40);
  await page.mouse.move(inGhost.x, inGhost.y);
  await expect(page.getByTestId('drag-hint')).toHaveText('Drag to move the ghost.');
  await page.getByRole('button', { name: /^Screen/ }).click();
  await page.mouse.move(inGhost.x + 1, inGhost.y + 1);
  await expect(page.getByTestId('drag-hint')).toHaveText('Drag to move the screen.');

  await page.getByRole('button', { name: 'Save regions' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Regions saved' })).toBeVisible();
  const rows = await getDb()('regions').where({ capture_set_id: id }).orderBy('kind').select('kind', 'x', 'y', 'w', 'h');
  expect(rows.find((r) => r.kind === 'screen')).toMatchObject({ ...screen });
  expect(rows.find((r) => r.kind === 'ghost')).toMatchObject({ ...ghost });
});

test('typed x, y, w and h move the rectangle, out-of-photo values are refused with a message, keys step 1, 10 and 100 px', async ({ page }) => {
  const stamp = Date.now();
  const { id } = await setWithPhotos(`Typed ${stamp}`, 7102);
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${id}`);
  await expect(page.getByTestId('region-svg')).toBeVisible();

  await typeRect(page, 'Background', { x: 40, y: 30, w: 120, h: 90 });
  expect(await rectOf(page, 'background')).toEqual({ x: 40, y: 30, w: 120, h: 90 });
  await expect(page.getByTestId('label-background')).toHaveText('Background');

  // past the right edge: a message with the largest width that fits, and the rectangle stays
  await page.getByLabel('Background x (px)').fill('700');
  await page.getByLabel('Background x (px)').press('Enter');
  await expect(page.getByTestId('coords-background').getByRole('alert')).toHaveText('x + w is 820 px, past the photo’s right edge at 800 px: at most 100 px at x 700');
  expect(await rectOf(page, 'background')).toEqual({ x: 40, y: 30, w: 120, h: 90 });
  await page.getByLabel('Background width (px)').fill('100');
  await page.getByLabel('Background width (px)').press('Enter');
  expect(await rectOf(page, 'background')).toEqual({ x: 700, y: 30, w: 100, h: 90 });

  // arrow keys on the photo act on the chosen tool's rectangle
  await page.getByRole('button', { name: /^Background/ }).click();
  await page.getByTestId('region-canvas').focus();
  await page.keyboard.press('ArrowLeft');
  await page.keyboard.press('Shift+ArrowLeft');
  await page.keyboard.press('Alt+ArrowLeft');
  expect((await rectOf(page, 'background')).x).toBe(700 - 1 - 10 - 100);
  await page.keyboard.press('r');
  await page.keyboard.press('Shift+ArrowDown');
  expect(await rectOf(page, 'background')).toEqual({ x: 589, y: 30, w: 100, h: 100 });
});

test('Analyse after an unsaved edit saves it first and the reading uses it; a refused save analyses nothing', async ({ page }) => {
  test.setTimeout(150_000);
  const stamp = Date.now();
  const probe = await renderCapture({ width: 800, height: 600, seed: 7103 });
  const t = probe.truth.screen;
  const { id } = await setWithPhotos(`Unsaved ${stamp}`, 7103, t);
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${id}`);
  await expect(page.getByTestId('rect-screen')).toBeVisible();
  const analyses = async () => Number((await getDb()('analyses').where({ capture_set_id: id }).count<{ count: string }[]>('* as count'))[0]?.count ?? 0);

  // a save the server refuses: the error shows and nothing is analysed
  const inset = { x: t.x + 12, y: t.y + 9, w: t.w - 24, h: t.h - 18 };
  await typeRect(page, 'Screen', inset);
  await expect(page.getByTestId('unsaved-regions-hint')).toBeVisible();
  await page.route(`**/api/captures/${id}/regions`, (route) => route.fulfill({ status: 503, contentType: 'application/json', body: JSON.stringify({ error: { message: 'The database is busy' } }) }));
  await page.getByRole('button', { name: 'Analyse', exact: true }).click();
  await expect(page.getByRole('alert').filter({ hasText: 'Nothing was analysed: the region edits could not be saved. The database is busy' })).toBeVisible();
  expect(await analyses()).toBe(0);
  await page.unroute(`**/api/captures/${id}/regions`);

  // the same edit, saved on the way to the analysis
  await page.getByRole('button', { name: 'Analyse', exact: true }).click();
  const progress = page.getByTestId('analysis-progress');
  await expect(progress).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  const saved = await getDb()('regions').where({ capture_set_id: id, kind: 'screen' }).first('x', 'y', 'w', 'h', 'source');
  expect(saved).toEqual({ ...inset, source: 'marked' });
  const reading = await getDb()('readings').where({ capture_set_id: id }).orderBy('created_at', 'desc').first('result');
  expect(reading.result.screen).toMatchObject({ ...inset, source: 'marked' });
  await expect(page.getByText(`screen marked at ${inset.x}, ${inset.y}, ${inset.w} × ${inset.h}`)).toBeVisible({ timeout: 20_000 });
  await expect(page.getByRole('button', { name: 'Saved', exact: true })).toBeVisible();
  await expect(page.getByTestId('photos-changed')).toHaveCount(0);

  // a photo added after the reading: the page says the reading describes the earlier photos
  await upload(id, 'ambient', `Unsaved ${stamp}-world.jpg`, probe.ambient);
  await page.reload();
  await expect(page.getByTestId('photos-changed')).toContainText('The photos changed after the newest reading was made');
});

test('a refused upload stays listed after the next drop until dismissed; a photo is replaced and removed from its slot', async ({ page }) => {
  test.setTimeout(120_000);
  const stamp = Date.now();
  const { id } = await setWithPhotos(`Photos ${stamp}`, 7104);
  const more = await renderCapture({ width: 800, height: 600, seed: 7105 });
  await signIn(page, 'tester@example.test');
  await page.goto(`/captures/${id}`);

  // the thumbnail of each photo comes from its authorised route, small and cached
  const thumb = page.getByTestId('thumb-on');
  await expect(thumb).toBeVisible();
  await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(192);
  const src = (await thumb.getAttribute('src')) as string;
  const res = await page.request.get(src);
  expect(res.headers()['content-type']).toBe('image/webp');
  expect(res.headers()['cache-control']).toContain('private');
  expect((await res.body()).byteLength).toBeLessThan(20_000);

  const drop = page.getByTestId('multi-drop-input');
  await drop.setInputFiles({ name: `notes-${stamp}-on.jpg`, mimeType: 'image/jpeg', buffer: Buffer.from('these are lab notes, not a photo\n'.repeat(4)) });
  const refused = page.getByTestId('upload-item').filter({ hasText: `notes-${stamp}-on.jpg` });
  await expect(refused.getByRole('alert')).toContainText('is not an image');
  await drop.setInputFiles({ name: `world-${stamp}.jpg`, mimeType: 'image/jpeg', buffer: more.ambient });
  await expect(page.getByTestId('upload-item').filter({ hasText: `world-${stamp}.jpg` })).toContainText('Uploaded.', { timeout: 30_000 });
  await expect(refused.getByRole('alert')).toContainText('is not an image');
  await refused.getByRole('button', { name: `Dismiss notes-${stamp}-on.jpg` }).click();
  await expect(refused).toHaveCount(0);

  // Replace: the new file takes the on photo's place
  const before = await getDb()('photos').where({ capture_set_id: id, role: 'on' }).first('id');
  await page.getByTestId(`replace-input-${before.id}`).setInputFiles({ name: `reshoot-${stamp}-on.jpg`, mimeType: 'image/jpeg', buffer: more.on });
  await expect(page.getByTestId('upload-item').filter({ hasText: `reshoot-${stamp}-on.jpg` })).toContainText(`Uploaded in place of Photos ${stamp}-on.jpg.`, { timeout: 30_000 });
  await expect(page.getByTestId('slot-on')).toContainText(`reshoot-${stamp}-on.jpg`);
  await expect(page.getByTestId('slot-on')).not.toContainText(`Photos ${stamp}-on.jpg`);
  const on = await getDb()('photos').where({ capture_set_id: id, role: 'on' }).select('id', 'original_name');
  expect(on).toHaveLength(1);
  expect(on[0].original_name).toBe(`reshoot-${stamp}-on.jpg`);

  // Remove asks first: dismissing keeps the photo
  const offName = `Photos ${stamp}-off.jpg`;
  page.once('dialog', (d) => {
    expect(d.message()).toContain(`Remove ${offName} (display off)?`);
    void d.dismiss();
  });
  await page.getByRole('button', { name: `Remove ${offName}` }).click();
  await page.waitForTimeout(300);
  expect(await getDb()('photos').where({ capture_set_id: id, role: 'off' }).first('id')).toBeTruthy();
  page.once('dialog', (d) => void d.accept());
  await page.getByRole('button', { name: `Remove ${offName}` }).click();
  await expect(page.getByTestId('slot-off')).not.toContainText(offName);
  expect(await getDb()('photos').where({ capture_set_id: id, role: 'off' }).first('id')).toBeUndefined();
});
