import { request, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_PASSWORD } from '../../db/seeds/demo-data';

export const baseURL = `http://localhost:${process.env.PORT ?? 3107}`;

/** An API client signed in through next-auth's credentials flow, cookies kept. */
export async function apiAs(email: string, password = DEMO_PASSWORD): Promise<APIRequestContext> {
  const ctx = await request.newContext({ baseURL });
  const { csrfToken } = (await (await ctx.get('/api/auth/csrf')).json()) as { csrfToken: string };
  const res = await ctx.post('/api/auth/callback/credentials', { form: { csrfToken, email, password, json: 'true' }, maxRedirects: 0 });
  if (res.status() >= 400) throw new Error(`sign-in as ${email} answered ${res.status()}`);
  return ctx;
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL('**/projects');
}
