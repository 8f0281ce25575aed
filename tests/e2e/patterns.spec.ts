import { expect, request, test } from '@playwright/test';
import { PATTERN_KINDS, PATTERN_MAX_SIZE, PATTERN_MIN_SIZE } from '../../lib/patterns';
import { baseURL, signIn } from './helpers';

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

function ihdr(body: Buffer): { width: number; height: number } {
  expect([...body.subarray(0, 8)]).toEqual(PNG_SIGNATURE);
  expect(body.subarray(12, 16).toString('latin1')).toBe('IHDR');
  return { width: body.readUInt32BE(16), height: body.readUInt32BE(20) };
}

test('every pattern kind comes as a PNG of exactly the requested size without a session', async () => {
  const anon = await request.newContext({ baseURL });
  for (const kind of PATTERN_KINDS) {
    const res = await anon.get(`/api/patterns/${kind}.png?width=333&height=217`);
    expect(res.status(), kind).toBe(200);
    expect(res.headers()['content-type']).toBe('image/png');
    expect(res.headers()['cache-control']).toContain('public');
    expect(ihdr(await res.body())).toEqual({ width: 333, height: 217 });
  }
  const odd = await anon.get(`/api/patterns/checkerboard.png?width=${PATTERN_MIN_SIZE}&height=${PATTERN_MAX_SIZE}`);
  expect(ihdr(await odd.body())).toEqual({ width: PATTERN_MIN_SIZE, height: PATTERN_MAX_SIZE });
  await anon.dispose();
});

test('an unknown pattern answers 404 and a bad size 422, both as JSON with a clear message', async () => {
  const anon = await request.newContext({ baseURL });
  const unknown = await anon.get('/api/patterns/zebra.png?width=640&height=480');
  expect(unknown.status()).toBe(404);
  expect(((await unknown.json()) as { error: { code: string } }).error.code).toBe('not_found');

  for (const q of ['width=7&height=480', 'width=5&height=480', `width=640&height=${PATTERN_MAX_SIZE + 1}`, 'width=640', 'width=64.5&height=48', 'width=abc&height=480', 'width=1e3&height=480']) {
    const res = await anon.get(`/api/patterns/white.png?${q}`);
    expect(res.status(), q).toBe(422);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('invalid_size');
    expect(body.error.message).toContain(`${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE}`);
  }
  await anon.dispose();
});

test('the fullscreen page shows the pattern on black with the cursor hidden and steps with the keys', async ({ browser }) => {
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.goto('/patterns/show?kind=white&width=320&height=240');
  const img = page.getByTestId('pattern-image');
  await expect(img).toHaveAttribute('src', '/api/patterns/white.png?width=320&height=240');
  await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth)).toBe(320);
  expect(await img.evaluate((el: HTMLImageElement) => el.naturalHeight)).toBe(240);
  const show = page.getByTestId('pattern-show');
  expect(await show.evaluate((el) => getComputedStyle(el).cursor)).toBe('none');
  expect(await show.evaluate((el) => getComputedStyle(el).backgroundColor)).toBe('rgb(0, 0, 0)');
  await expect(page.getByRole('navigation')).toHaveCount(0);

  await page.keyboard.press('ArrowRight');
  await expect(img).toHaveAttribute('src', '/api/patterns/black.png?width=320&height=240');
  await expect(page).toHaveURL(/kind=black/);
  await page.keyboard.press('Space');
  await expect(img).toHaveAttribute('src', /checkerboard\.png/);
  await page.keyboard.press('ArrowLeft');
  await page.keyboard.press('ArrowLeft');
  await page.keyboard.press('ArrowLeft');
  // past the first kind it wraps round to the last
  await expect(img).toHaveAttribute('src', /slanted-edge\.png/);
  await expect(page.getByTestId('show-hint')).toHaveClass(/opacity-0/, { timeout: 8000 });
  await context.close();
});

test('the generator refuses a bad custom size beside the input, previews a good one and links to download and fullscreen', async ({ page }) => {
  await signIn(page, 'tester@example.test');
  await page.goto('/patterns?kind=grey-steps&preset=custom&width=4&height=600');
  await expect(page.locator('#width-error')).toContainText(`from ${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE}`);
  await expect(page.getByTestId('pattern-preview')).toHaveCount(0);

  await page.getByLabel('Custom width (px)').fill('1000');
  await page.getByRole('button', { name: 'Update preview' }).click();
  await expect(page.getByTestId('pattern-title')).toHaveText('Grey steps · 1000 × 600');
  await expect(page.getByTestId('pattern-preview')).toBeVisible();
  await expect(page.getByRole('link', { name: 'Download PNG' })).toHaveAttribute('href', '/api/patterns/grey-steps.png?width=1000&height=600');
  await expect(page.getByTestId('pattern-guide')).toContainText('Camera linearity check');
  await expect(page.getByTestId('pattern-cautions')).toContainText('laser');
  await page.screenshot({ path: `${test.info().outputDir}/patterns.png`, fullPage: true });

  await page.getByLabel('Pattern', { exact: true }).selectOption('checkerboard');
  await page.getByLabel('Size', { exact: true }).selectOption('640x480');
  await page.getByRole('button', { name: 'Update preview' }).click();
  await expect(page.getByTestId('pattern-title')).toHaveText('4 × 4 checkerboard · 640 × 480');
  await page.getByRole('link', { name: 'Show fullscreen' }).click();
  await expect(page.getByTestId('pattern-image')).toHaveAttribute('src', '/api/patterns/checkerboard.png?width=640&height=480');
  // The key handler exists only once the page has hydrated: keep pressing until it answers.
  await expect(async () => {
    await page.keyboard.press('q');
    await expect(page).toHaveURL(/\/patterns\?kind=checkerboard&preset=640x480/, { timeout: 1000 });
  }).toPass({ timeout: 15_000 });
});
