import { expect, test, type Page } from '@playwright/test';
import { linkIn, signIn, waitForMail } from './helpers';

// The demo lab as seeded: the lead sees every main page; the project, revision and capture set
// below are the demo's.
const PROJECT = 'Visor VX birdbath';
const REVISION = 'VX-B';

type Pages = { project: string; revision: string; capture: string; captureLabel: string; compare: string; planner: string };

/** Walks from the projects list to the demo's project, revision, a capture set, compare and the planner. */
async function demoPages(page: Page): Promise<Pages> {
  await page.goto('/projects');
  await page.getByRole('link', { name: PROJECT }).first().click();
  await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
  const project = new URL(page.url()).pathname;
  await page.goto(`${project}/compare`);
  const compare = new URL(page.url()).pathname + new URL(page.url()).search;
  await page.goto(project);
  await page.getByRole('link', { name: REVISION, exact: true }).first().click();
  await page.waitForURL(/\/revisions\/[0-9a-f-]{36}$/);
  const revision = new URL(page.url()).pathname;
  const setLink = page.locator('a[href^="/captures/"]').first();
  const captureLabel = (await setLink.innerText()).trim();
  const capture = (await setLink.getAttribute('href'))!;
  return { project, revision, capture, captureLabel, compare, planner: `${revision}/stack` };
}

async function widthOf(page: Page): Promise<{ scroll: number; client: number; wide: string[] }> {
  return page.evaluate(() => {
    const root = document.documentElement;
    // what sticks out past the viewport, to name it when the check fails
    const wide = [...document.querySelectorAll('body *')]
      .filter((el) => el.getBoundingClientRect().right > root.clientWidth + 1 && !el.closest('[data-table-scroll], .overflow-x-auto'))
      .slice(0, 5)
      .map((el) => `${el.tagName.toLowerCase()}.${String(el.className).slice(0, 60)} → ${Math.round(el.getBoundingClientRect().right)}`);
    return { scroll: root.scrollWidth, client: root.clientWidth, wide };
  });
}

test.describe('at 390 px wide', () => {
  test.use({ viewport: { width: 390, height: 844 } });

  test('no main page scrolls sideways; tables scroll inside their panel', async ({ page }) => {
    await page.goto('/sign-in');
    expect((await widthOf(page)).scroll, '/sign-in').toBeLessThanOrEqual(390);
    await signIn(page, 'lead@example.test');
    const p = await demoPages(page);
    const urls = ['/projects', p.project, p.revision, p.capture, p.compare, p.planner, '/patterns', '/settings/cameras', '/settings'];
    for (const url of urls) {
      await page.goto(url);
      await page.waitForLoadState('networkidle');
      const w = await widthOf(page);
      expect(w.scroll, `${url} is ${w.scroll} px wide: ${w.wide.join('; ')}`).toBeLessThanOrEqual(390);
    }
  });
});

test.describe('at 1440 px wide', () => {
  test.use({ viewport: { width: 1440, height: 900 } });

  test('every data table fits its panel: no column is cut off', async ({ page }) => {
    await signIn(page, 'lead@example.test');
    const p = await demoPages(page);
    for (const url of ['/projects', p.project, p.revision, p.compare, p.planner, '/settings', '/settings/cameras']) {
      await page.goto(url);
      await page.waitForLoadState('networkidle');
      const over = await page.evaluate(() =>
        [...document.querySelectorAll<HTMLElement>('[data-table-scroll]')].filter((el) => el.offsetParent !== null && el.scrollWidth > el.clientWidth + 1).map((el) => `${el.querySelector('table')?.dataset.testid ?? 'table'}: ${el.scrollWidth} > ${el.clientWidth}`),
      );
      expect(over, url).toEqual([]);
    }
  });

  test('the sort mark shows only on the sorted column, which alone carries aria-sort', async ({ page }) => {
    await signIn(page, 'lead@example.test');
    const table = page.locator('table').first();
    const marks = table.locator('[data-testid="sort-mark"]');
    const count = await marks.count();
    expect(count).toBeGreaterThan(3);
    // unsorted: no heading claims an order, and no mark shows
    await expect(table.locator('th[aria-sort]')).toHaveCount(0);
    for (let i = 0; i < count; i++) await expect(marks.nth(i)).toHaveCSS('opacity', '0');
    await table.getByRole('button', { name: 'Revisions' }).click();
    await expect(table.locator('th[aria-sort]')).toHaveCount(1);
    const sorted = table.locator('th[aria-sort="ascending"]');
    await expect(sorted).toContainText('Revisions');
    await expect(sorted.locator('[data-testid="sort-mark"]')).toHaveAttribute('data-mark', 'ascending');
    await expect(sorted.locator('[data-testid="sort-mark"]')).toHaveCSS('opacity', '1');
    await expect(table.locator('[data-testid="sort-mark"][data-mark="idle"]')).toHaveCount(count - 1);
    await expect(table.locator('th:not([aria-sort]) [data-testid="sort-mark"]').first()).toHaveCSS('opacity', '0');
    // a neutral mark on the heading under the pointer
    const other = table.getByRole('button', { name: 'Updated' });
    await other.hover();
    await expect(other.locator('[data-testid="sort-mark"]')).toHaveAttribute('data-mark', 'idle');
    await expect(other.locator('[data-testid="sort-mark"]')).not.toHaveCSS('opacity', '0');
    await table.getByRole('button', { name: 'Revisions' }).click();
    await expect(table.locator('th[aria-sort="descending"]')).toContainText('Revisions');
  });

  test('each page has its own title; an id of another lab or none names nothing', async ({ page }) => {
    // ten page loads, the compare page's statistics among them: more than the default minute on a busy machine
    test.setTimeout(150_000);
    await signIn(page, 'lead@example.test');
    await expect(page).toHaveTitle('Projects — Veilmeter');
    const p = await demoPages(page);
    await page.goto(p.project);
    await expect(page).toHaveTitle(`${PROJECT} — Veilmeter`);
    await page.goto(p.revision);
    await expect(page).toHaveTitle(`${REVISION} · ${PROJECT} — Veilmeter`);
    await page.goto(p.capture);
    await expect(page).toHaveTitle(`${p.captureLabel} · ${REVISION} · ${PROJECT} — Veilmeter`);
    await page.goto(p.compare);
    await expect(page).toHaveTitle(`Compare · ${PROJECT} — Veilmeter`);
    await page.goto(p.planner);
    await expect(page).toHaveTitle(`Stack planner · ${REVISION} · ${PROJECT} — Veilmeter`);
    await page.goto('/projects/00000000-0000-4000-8000-000000000000');
    await expect(page).toHaveTitle('Not found — Veilmeter');
  });
});

test('a new lab’s first visit: a guide to the capture flow with the first action, dismissible, gone once a project exists', async ({ page, browser }) => {
  // the demo's ids, to ask for from the new lab
  const lead = await browser.newPage();
  await signIn(lead, 'lead@example.test');
  const demo = await demoPages(lead);
  await lead.close();

  const email = `guide-${Date.now()}@example.test`;
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill('Ines Varga');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill('a-long-enough-password');
  await page.getByLabel('Lab name').fill('Varga waveguide bench');
  await page.getByRole('button', { name: 'Create lab' }).click();
  await expect(page.getByRole('status')).toContainText('Check your inbox');
  await page.goto(linkIn((await waitForMail(email, /Confirm your address/)).text, '/verify/'));
  await signIn(page, email, 'a-long-enough-password');

  const guide = page.getByTestId('first-visit-guide');
  await expect(guide).toBeVisible();
  for (const step of ['Create a project', 'Add a revision', 'Add a capture set', 'Photograph on, off and ambient', 'Mark the regions', 'Analyse', 'Compare and follow trends']) {
    await expect(guide.getByText(step, { exact: true })).toBeVisible();
  }
  await expect(guide.getByRole('note', { name: 'Cautions' })).toContainText('Never point');

  // dismissed, it stays away after a reload
  await guide.getByRole('button', { name: 'Dismiss the guide' }).click();
  await expect(guide).toHaveCount(0);
  await page.reload();
  await expect(page.getByTestId('first-visit-guide')).toHaveCount(0);
  await page.context().clearCookies({ name: 'vm-guide' });
  await page.reload();
  await expect(page.getByTestId('first-visit-guide')).toBeVisible();

  // its primary action leads to the new-project form
  await page.getByRole('link', { name: 'Create your first project' }).click();
  await expect(page.locator('#new-project input[name="name"]')).toBeFocused();
  await page.keyboard.type('Varga waveguide W1');
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('link', { name: 'Varga waveguide W1' })).toBeVisible();
  await page.reload();
  await expect(page.getByTestId('first-visit-guide')).toHaveCount(0);

  // another lab's project, revision and capture set: 404, and the title names none of them
  for (const url of [demo.project, demo.revision, demo.capture, demo.compare]) {
    const res = await page.goto(url);
    expect(res?.status(), url).toBe(404);
    await expect(page).toHaveTitle('Not found — Veilmeter');
  }
});

test('the capture set’s edit form offers the revision’s variants, and the page links its PDF report', async ({ page }) => {
  await signIn(page, 'lead@example.test');
  const p = await demoPages(page);
  await page.goto(p.capture);
  await page.getByText('Edit label, variant, pattern and conditions').click();
  const form = page.getByRole('form', { name: 'Edit capture set' });
  const list = await form.getByLabel('Variant (for A/B)').getAttribute('list');
  expect(list).toBeTruthy();
  const options = await page.locator(`datalist[id="${list}"] option`).evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
  expect(options).toEqual(['with polarizer', 'without polarizer']);
  await expect(form).toContainText('In this revision: with polarizer, without polarizer');
  const href = await page.getByRole('link', { name: 'PDF report' }).getAttribute('href');
  expect(href).toBe(`/api${p.capture}/report.pdf`);
  const res = await page.request.get(href!);
  expect(res.status()).toBe(200);
  expect(res.headers()['content-type']).toBe('application/pdf');
  const body = await res.body();
  expect(body.subarray(0, 5).toString()).toBe('%PDF-');
  expect(body.toString('latin1')).toMatch(/\/BaseFont \/[A-Z]{6}\+DejaVuSans/);
});
