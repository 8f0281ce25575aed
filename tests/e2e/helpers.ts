import { request, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_PASSWORD } from '../../db/seeds/demo-data';

export const baseURL = `http://localhost:${process.env.PORT ?? 3107}`;

/** An API client signed in through next-auth's credentials flow, cookies kept. */
export async function apiAs(email: string, password = DEMO_PASSWORD): Promise<APIRequestContext> {
  // a browser sends its page's Origin with every write; the app refuses cookie writes without it
  const ctx = await request.newContext({ baseURL, extraHTTPHeaders: { origin: new URL(baseURL).origin } });
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

/** Waits for the local mail catcher to have saved a message to `to`; returns its text. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 15_000): Promise<{ subject: string; text: string }> {
  const { readdir, readFile } = await import('node:fs/promises');
  const dir = `${process.env.DATA_DIR}/mail`;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const files = (await readdir(dir).catch(() => [] as string[])).filter((f) => f.endsWith('.json')).sort().reverse();
    for (const f of files) {
      const m = JSON.parse(await readFile(`${dir}/${f}`, 'utf8')) as { to: string[]; subject: string; text: string };
      if (m.to.includes(to) && subject.test(m.subject)) return m;
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}

export function linkIn(text: string, path: string): string {
  const m = new RegExp(`https?://[^\\s]+${path}[^\\s]+`).exec(text);
  if (!m) throw new Error(`no ${path} link in mail`);
  return new URL(m[0]).pathname;
}
