import { spawn, type ChildProcess } from 'node:child_process';
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { DEMO_PASSWORD } from '../../db/seeds/demo-data';
import { hashPassword } from '../../lib/auth/password';
import { freePort } from '../fixtures/free-port';
import { apiAs, baseURL, linkIn, signIn, waitForMail } from './helpers';

// Accounts and sign-in against the running production server (and, for what needs a proxy in
// front, a second copy of the same build that trusts loopback as its proxy).
const stamp = Date.now();
const PASSWORD = 'violet-prism-bench-7';

async function verifiedPerson(name: string): Promise<{ email: string; id: string }> {
  const db = getDb();
  const email = `${name}-${stamp}@example.test`;
  const [u] = await db('users').insert({ email, name, password_hash: await hashPassword(PASSWORD), email_verified_at: new Date() }).returning<{ id: string }[]>('id');
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  await db('memberships').insert({ lab_id: lab.id, user_id: u!.id, role: 'viewer' });
  return { email, id: u!.id };
}

/** A client with a CSRF token for next-auth's credentials callback. */
async function client(base = baseURL): Promise<{ ctx: APIRequestContext; csrf: string }> {
  const ctx = await request.newContext({ baseURL: base, extraHTTPHeaders: { origin: new URL(base).origin } });
  const { csrfToken } = (await (await ctx.get('/api/auth/csrf')).json()) as { csrfToken: string };
  return { ctx, csrf: csrfToken };
}

/** One credentials sign-in with a body written out by hand (repeated fields, JSON, odd spellings). */
async function attempt(c: { ctx: APIRequestContext; csrf: string }, body: { form?: string; json?: Record<string, string> }, headers: Record<string, string> = {}): Promise<{ status: number; ms: number; url: string }> {
  const t0 = Date.now();
  const res = body.json
    ? await c.ctx.post('/api/auth/callback/credentials', { headers: { 'content-type': 'application/json', ...headers }, data: JSON.stringify({ csrfToken: c.csrf, json: 'true', ...body.json }), maxRedirects: 0 })
    : await c.ctx.post('/api/auth/callback/credentials', { headers: { 'content-type': 'application/x-www-form-urlencoded', ...headers }, data: `csrfToken=${encodeURIComponent(c.csrf)}&json=true&${body.form}`, maxRedirects: 0 });
  const ms = Date.now() - t0;
  const json = (await res.json().catch(() => ({}))) as { url?: string };
  return { status: res.status(), ms, url: json.url ?? res.headers().location ?? '' };
}

const enc = encodeURIComponent;

test.afterAll(async () => {
  await getDb()('users').where('email', 'like', `%-${stamp}@example.test`).delete();
  await closeDb();
});

test.describe('sign-in callback', () => {
  test('a crafted callbackUrl is answered without an error and never leaves the site', async () => {
    const person = await verifiedPerson('callback');
    const port = new URL(baseURL).port;
    for (const callbackUrl of [`http://localhost:${port}.evil.example/`, 'https://evil.example/', '//evil.example/', '/\\evil.example']) {
      const c = await client();
      const res = await attempt(c, { form: `email=${enc(person.email)}&password=${PASSWORD}&callbackUrl=${enc(callbackUrl)}` });
      expect(res.status, callbackUrl).toBe(200);
      expect(new URL(res.url).origin, callbackUrl).toBe(new URL(baseURL).origin);
      expect(new URL(res.url).pathname.startsWith('//'), callbackUrl).toBe(false);
      // in the query string too, on next-auth's pages and its JSON routes
      for (const path of ['/api/auth/signin', '/api/auth/session', '/api/auth/csrf', '/api/auth/providers']) {
        const res = await c.ctx.get(`${path}?callbackUrl=${enc(callbackUrl)}`, { maxRedirects: 0 });
        expect(res.status(), `${path} ${callbackUrl}`).toBeLessThan(500);
      }
      const viaQuery = await c.ctx.post(`/api/auth/callback/credentials?callbackUrl=${enc(callbackUrl)}`, {
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        data: `csrfToken=${enc(c.csrf)}&json=true&email=${enc(person.email)}&password=${PASSWORD}`,
        maxRedirects: 0,
      });
      expect(viaQuery.status(), `query ${callbackUrl}`).toBe(200);
      expect(new URL(((await viaQuery.json()) as { url: string }).url).origin).toBe(new URL(baseURL).origin);
      // and in next-auth's callback-url cookie, which a sibling site could have set: cleared, not a 500
      for (const path of ['/api/auth/session', '/api/auth/callback/credentials']) {
        const withCookie = await c.ctx.fetch(path, {
          method: path.endsWith('credentials') ? 'POST' : 'GET',
          headers: { cookie: `next-auth.callback-url=${enc(callbackUrl)}`, 'content-type': 'application/x-www-form-urlencoded' },
          data: path.endsWith('credentials') ? `csrfToken=${enc(c.csrf)}&json=true&email=${enc(person.email)}&password=${PASSWORD}` : undefined,
          maxRedirects: 0,
        });
        expect(withCookie.status(), `cookie ${path} ${callbackUrl}`).toBeLessThan(500);
      }
      await c.ctx.dispose();
    }
  });
});

test.describe('behind a trusted proxy', () => {
  let server: ChildProcess | undefined;
  let proxied = '';

  test.beforeAll(async () => {
    const port = await freePort();
    proxied = `http://localhost:${port}`;
    server = spawn('node', ['scripts/web.mjs', '-p', String(port), '-H', '127.0.0.1'], {
      env: { ...process.env, PORT: String(port), WEB_PROCESSES: '1', TRUSTED_PROXIES: '127.0.0.1', NEXTAUTH_URL: proxied },
      stdio: 'ignore',
    });
    for (let i = 0; i < 150; i++) {
      const ok = await fetch(`${proxied}/api/health`).then((r) => r.ok).catch(() => false);
      if (ok) return;
      await new Promise((r) => setTimeout(r, 200));
    }
    throw new Error('the second server did not start');
  });

  test.afterAll(() => {
    server?.kill('SIGTERM');
  });

  test('the last of repeated email fields is the one limited', async () => {
    const victim = await verifiedPerson('last-field');
    const c = await client(proxied);
    const statuses: number[] = [];
    const from = { 'x-forwarded-for': '198.51.100.31' };
    for (let i = 0; i < 10; i++) statuses.push((await attempt(c, { form: `email=decoy-${i}-${stamp}%40example.test&email=${enc(victim.email)}&password=wrong-guess-${i}` }, from)).status);
    expect(statuses.every((s) => s === 401), statuses.join(',')).toBe(true);
    // the victim's address has had its ten tries from this client, whatever decoy came first
    expect((await attempt(c, { form: `email=decoy-x-${stamp}%40example.test&email=${enc(victim.email)}&password=${PASSWORD}` }, from)).status).toBe(429);
    await c.ctx.dispose();
  });

  test('a JSON body, and any case or spacing of the address, count under the same address', async () => {
    const victim = await verifiedPerson('json-body');
    const c = await client(proxied);
    const spellings = [victim.email, victim.email.toUpperCase(), `  ${victim.email}  `, victim.email.replace(/^j/, 'J')];
    const from = { 'x-forwarded-for': '198.51.100.32' };
    for (let i = 0; i < 10; i++) expect((await attempt(c, { json: { email: spellings[i % spellings.length]!, password: `wrong-guess-${i}` } }, from)).status).toBe(401);
    expect((await attempt(c, { form: `email=${enc(victim.email)}&password=${PASSWORD}` }, from)).status).toBe(429);
    await c.ctx.dispose();
  });


  test('only the hops the trusted proxy vouches for count: addresses a client prepends change nothing', async () => {
    test.setTimeout(120_000);
    const c = await client(proxied);
    const statuses: number[] = [];
    // the proxy (loopback) appends the address it saw, 198.51.100.7; the client made up the rest
    for (let i = 0; i < 101; i++) {
      const r = await attempt(c, { form: `email=spray-${i}-${stamp}%40example.test&password=wrong-guess` }, { 'x-forwarded-for': `10.${i}.0.1, 198.51.100.7` });
      statuses.push(r.status);
      if (r.status === 429) break;
    }
    expect(statuses.at(-1), `${statuses.length} attempts`).toBe(429);
    expect(statuses.length).toBe(101);
    await c.ctx.dispose();
  });

  test('an attacker hitting the limit does not lock the owner out: the owner signs in from another client, after a short delay', async () => {
    const owner = await verifiedPerson('owner');
    const attacker = await client(proxied);
    const from = (ip: string) => ({ 'x-forwarded-for': ip });
    for (let i = 0; i < 10; i++) expect((await attempt(attacker, { form: `email=${enc(owner.email)}&password=wrong-guess-${i}` }, from('203.0.113.66'))).status).toBe(401);
    expect((await attempt(attacker, { form: `email=${enc(owner.email)}&password=wrong-guess-x` }, from('203.0.113.66'))).status).toBe(429);

    // more failures from other clients: each try on the address now waits, longer each time
    const waits: number[] = [];
    for (let i = 0; i < 3; i++) {
      const other = await client(proxied);
      const r = await attempt(other, { form: `email=${enc(owner.email)}&password=wrong-again-${i}` }, from(`203.0.113.${100 + i}`));
      expect(r.status).toBe(401);
      waits.push(r.ms);
      await other.ctx.dispose();
    }
    expect(waits[0]).toBeGreaterThanOrEqual(250);
    expect(waits[1]).toBeGreaterThanOrEqual(500);
    expect(waits[2]).toBeGreaterThanOrEqual(1000);

    const ownerClient = await client(proxied);
    const mine = await attempt(ownerClient, { form: `email=${enc(owner.email)}&password=${PASSWORD}` }, from('198.51.100.200'));
    expect(mine.status).toBe(200);
    expect(mine.ms).toBeGreaterThanOrEqual(2000);
    expect((await ownerClient.ctx.get('/api/projects')).status()).toBe(200);
    await attacker.ctx.dispose();
    await ownerClient.ctx.dispose();
  });
});

test('sign-out ends the session: a copy of the cookie kept from before no longer works', async () => {
  const person = await verifiedPerson('sign-out');
  const api = await apiAs(person.email, PASSWORD);
  expect((await api.get('/api/projects')).status()).toBe(200);
  const kept = await api.storageState();
  const { csrfToken } = (await (await api.get('/api/auth/csrf')).json()) as { csrfToken: string };
  const out = await api.post('/api/auth/signout', { form: { csrfToken, json: 'true' }, maxRedirects: 0 });
  expect(out.status()).toBeLessThan(400);
  const copy = await request.newContext({ baseURL, storageState: kept });
  expect((await copy.get('/api/projects')).status()).toBe(401);
  await copy.dispose();
  await api.dispose();
  // signing in again opens a new session
  const again = await apiAs(person.email, PASSWORD);
  expect((await again.get('/api/projects')).status()).toBe(200);
  await again.dispose();
});

test('after sign-in, a next that another host hides in stays on the site', async ({ page }) => {
  // another host answers for itself, so a browser sent there shows it (the sign-in URL names it too)
  await page.route((url) => url.hostname.endsWith('evil.example'), (route) => route.fulfill({ status: 200, contentType: 'text/html', body: '<h1>evil</h1>' }));
  for (const next of ['/\\evil.example', '//evil.example', 'https://evil.example/x', '/%5Cevil.example']) {
    await page.context().clearCookies();
    await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
    await page.getByLabel('E-mail').fill('viewer@example.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname !== '/sign-in' || !u.host.startsWith('localhost'));
    await page.waitForLoadState('load');
    expect(new URL(page.url()).origin, next).toBe(new URL(baseURL).origin);
  }
  // a path on the site is still followed
  await page.context().clearCookies();
  await page.goto(`/sign-in?next=${encodeURIComponent('/settings/tokens')}`);
  await page.getByLabel('E-mail').fill('viewer@example.test');
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL('**/settings/tokens');
});

test('a new sign-up can only confirm its address until it opens the link; an address in use gets the same answer', async ({ page, browser }) => {
  const email = `newcomer-${stamp}@example.test`;
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill('Oona Reyes');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByLabel('Lab name').fill(`Reyes bench ${stamp}`);
  await page.getByRole('button', { name: 'Create lab' }).click();
  const answer = (await page.getByRole('status').textContent()) ?? '';
  expect(answer).toContain('Check your inbox');

  // the same form for an address that has an account answers the same
  const other = await browser.newContext();
  const again = await other.newPage();
  await again.goto('/sign-up');
  await again.getByLabel('Your name').fill('Someone Else');
  const taken = await verifiedPerson('taken');
  await again.getByLabel('E-mail').fill(taken.email);
  await again.getByLabel('Password').fill(PASSWORD);
  await again.getByLabel('Lab name').fill(`Another bench ${stamp}`);
  await again.getByRole('button', { name: 'Create lab' }).click();
  expect(((await again.getByRole('status').textContent()) ?? '').replace(taken.email, email)).toBe(answer);
  await other.close();

  // signed in but unconfirmed: the lab's pages send it to the verify page, the API refuses it
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL('**/verify');
  await expect(page.getByRole('heading', { name: 'Confirm your address' })).toBeVisible();
  await page.goto('/projects');
  await page.waitForURL('**/verify');
  const refused = await page.request.get('/api/projects');
  expect(refused.status()).toBe(403);

  await page.goto(linkIn((await waitForMail(email, /Confirm your address/)).text, '/verify/'));
  await expect(page.getByRole('heading', { name: 'Address confirmed' })).toBeVisible();
  await page.goto('/projects');
  await expect(page.getByTestId('role')).toHaveText('Admin');
});

test('the local inbox shows a person only their own mail, never another account’s reset link', async ({ page }) => {
  const victim = await verifiedPerson('inbox-victim');
  const anon = await request.newContext({ baseURL, extraHTTPHeaders: { origin: new URL(baseURL).origin } });
  expect((await anon.post('/api/password-reset', { data: { email: victim.email } })).status()).toBe(200);
  const victimsLink = linkIn((await waitForMail(victim.email, /Reset your Veilmeter password/)).text, '/reset/');
  await anon.dispose();

  await signIn(page, 'viewer@example.test');
  await page.goto('/settings/inbox');
  await expect(page.getByText('This page shows only mail sent to your own address')).toBeVisible();
  expect(await page.content()).not.toContain(victimsLink);
  expect(await page.content()).not.toContain(victim.email);
});
