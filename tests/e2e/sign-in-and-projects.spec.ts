import { expect, test } from '@playwright/test';
import { linkIn, signIn, waitForMail } from './helpers';

test('a wrong password shows an error on the form and opens no session', async ({ page, context }) => {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill('lead@example.test');
  await page.getByLabel('Password').fill('not-the-password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByText('That e-mail and password do not match an account.')).toBeVisible();
  const cookies = await context.cookies();
  expect(cookies.some((c) => c.name.includes('session-token'))).toBe(false);
  await page.goto('/projects');
  await expect(page).toHaveURL(/\/sign-in/);
});

test('a lead signs in, creates a project, sees it listed, renames it and signs out', async ({ page }) => {
  const name = `Bench visor ${Date.now()}`;
  await signIn(page, 'lead@example.test');
  await expect(page.getByRole('heading', { name: 'Projects', exact: true })).toBeVisible();
  await expect(page.getByTestId('role')).toHaveText('Lead');

  await page.getByLabel('Name').fill(name);
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('status')).toContainText('Created');
  const link = page.getByRole('link', { name });
  await expect(link).toBeVisible();

  await link.click();
  await expect(page.getByTestId('project-name')).toHaveText(name);
  await page.getByLabel('Project name').fill(`${name} (renamed)`);
  await page.getByRole('button', { name: 'Rename' }).click();
  await expect(page.getByTestId('project-name')).toHaveText(`${name} (renamed)`);

  await page.goto('/projects');
  await expect(page.getByRole('link', { name: `${name} (renamed)` })).toBeVisible();
  await page.screenshot({ path: `${test.info().outputDir}/projects.png`, fullPage: true });

  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL(/\/sign-in/);
  await page.goto('/projects');
  await expect(page).toHaveURL(/\/sign-in/);
});

test('the create form shows field errors for an empty or 500-character name', async ({ page }) => {
  await signIn(page, 'admin@example.test');
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByText('Enter a name')).toBeVisible();
  await page.getByLabel('Name').fill('x'.repeat(500));
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByText('Use at most 120 characters')).toBeVisible();
});

test('sign-up creates a lab whose creator is its admin once the address is confirmed', async ({ page }) => {
  const email = `founder-${Date.now()}@example.test`;
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill('Mira Castellan');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill('short');
  await page.getByLabel('Lab name').fill('Castellan optics bench');
  await page.getByRole('button', { name: 'Create lab' }).click();
  await expect(page.getByText('Use at least 10 characters')).toBeVisible();
  await expect(page.getByLabel('Lab name')).toHaveValue('Castellan optics bench');
  await page.getByLabel('Password').fill('a-long-enough-password');
  await page.getByRole('button', { name: 'Create lab' }).click();
  await expect(page.getByRole('status')).toContainText('Check your inbox');
  // the address is confirmed through the link in the mail the local catcher caught
  await page.goto(linkIn((await waitForMail(email, /Confirm your address/)).text, '/verify/'));
  await expect(page.getByRole('heading', { name: 'Address confirmed' })).toBeVisible();
  await signIn(page, email, 'a-long-enough-password');
  await expect(page.getByTestId('role')).toHaveText('Admin');
  await expect(page.getByText('Castellan optics bench').first()).toBeVisible();
});
