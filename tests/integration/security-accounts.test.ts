import { execFileSync } from 'node:child_process';
import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { jar, setRequestHeaders, signInAs as signInWithVersion } from '../fixtures/request-context';

// Accounts and sign-in against real PostgreSQL and Redis: the route handlers, server actions and
// pages run as in `next start`, with the request's cookies and headers supplied here. Limits are
// counted under a prefix of this run's own, mail goes to the local catcher's folder of this run.
const tag = `${process.pid}-${Date.now()}`;
const dataDir = mkdtempSync(join(tmpdir(), 'vm-sec-'));
process.env.QUEUE_PREFIX = `secacc${process.pid}`;
process.env.DATA_DIR = dataDir;
process.env.MAIL_CATCHER = '1';
delete process.env.SMTP_HOST;

vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));
// pages redirect by throwing; the test reads where to
vi.mock('next/navigation', () => ({
  redirect: (to: string) => {
    throw Object.assign(new Error(`redirect ${to}`), { digest: `NEXT_REDIRECT;${to}` });
  },
  notFound: () => {
    throw Object.assign(new Error('not found'), { digest: 'NEXT_NOT_FOUND' });
  },
}));

const { getDb, closeDb } = await import('../../db/index');
const { createUserWithLab } = await import('../../db/queries/users');
const { createPasswordReset } = await import('../../db/queries/password-resets');
const { removeMember } = await import('../../db/queries/members');
const { createInvitation } = await import('../../db/queries/invitations');
const { hashPassword } = await import('../../lib/auth/password');
const { getEnv } = await import('../../lib/env');
const { GET: projectsGET } = await import('../../app/api/projects/route');
const { POST: resetPOST } = await import('../../app/api/password-reset/route');
const { POST: resetCompletePOST } = await import('../../app/api/password-reset/complete/route');
const actions = await import('../../app/(auth)/actions');
const { default: InboxPage } = await import('../../app/(lab)/settings/inbox/page');
const transport = await import('../../lib/server/mail/transport');

const PEER = 'x-veilmeter-peer';
const PASSWORD = 'violet-prism-bench-7';
const labs: string[] = [];
const users: string[] = [];

/** A person with their own lab, address verified unless told otherwise. */
async function person(name: string, opts: { verified?: boolean; password?: string } = {}) {
  const email = `${name}-${tag}@example.test`;
  const made = await createUserWithLab({ email, name, labName: `Lab of ${name} ${tag}`, passwordHash: await hashPassword(opts.password ?? PASSWORD) });
  if (opts.verified !== false) await getDb()('users').where({ id: made.userId }).update({ email_verified_at: new Date() });
  labs.push(made.labId);
  users.push(made.userId);
  return { ...made, email };
}

/** Signs in as next-auth would after a password check: a session JWT carrying the user's session version. */
async function signInAs(userId: string): Promise<void> {
  const row = await getDb()('users').where({ id: userId }).first<{ session_version?: number }>('*');
  await signInWithVersion(userId, { sessionVersion: row?.session_version ?? 0 });
}

async function listProjects(): Promise<{ status: number; body: { error?: { code?: string } } }> {
  const res = await projectsGET(new Request('http://127.0.0.1/api/projects'), { params: Promise.resolve({}) } as never);
  return { status: res.status, body: (await res.json()) as { error?: { code?: string } } };
}

function asClient(address: string): void {
  setRequestHeaders({ [PEER]: address });
}

function form(fields: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.append(k, v);
  return f;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;

beforeAll(async () => {
  await getDb().raw('select 1');
});

afterAll(async () => {
  await getDb()('labs').whereIn('id', labs).delete();
  await getDb()('users').whereIn('id', users).delete();
  await getDb()('users').where('email', 'like', `%-${tag}@example.test`).delete();
  await closeDb();
  rmSync(dataDir, { recursive: true, force: true });
});

describe('the local inbox', () => {
  it('shows a signed-in person only the mail delivered to their own address', async () => {
    const admin = await person('inbox-admin');
    const stranger = await person('inbox-stranger');
    const dir = join(dataDir, 'mail');
    mkdirSync(dir, { recursive: true });
    const mail = (id: string, to: string, subject: string, text: string) =>
      writeFileSync(join(dir, `${id}.json`), JSON.stringify({ id, receivedAt: new Date().toISOString(), from: 'Veilmeter', to: [to], envelopeTo: [to], subject, text, html: '' }));
    mail('1-1', admin.email, 'Reset your Veilmeter password', 'Reset: http://localhost/reset/the-admins-secret-reset-token');
    mail('1-2', stranger.email, 'You already have a Veilmeter account', 'Sign in: http://localhost/sign-in/strangers-own-mail');
    // a message whose To header names the stranger but that was delivered to the admin only
    writeFileSync(join(dir, '1-3.json'), JSON.stringify({ id: '1-3', receivedAt: new Date().toISOString(), from: 'x', to: [stranger.email], envelopeTo: [admin.email], subject: 'Join', text: 'http://localhost/invite/admins-invitation', html: '' }));

    await signInAs(stranger.userId);
    const html = renderToStaticMarkup(await InboxPage());
    expect(html).toContain('strangers-own-mail');
    expect(html).not.toContain('the-admins-secret-reset-token');
    expect(html).not.toContain('admins-invitation');

    await signInAs(admin.userId);
    const own = renderToStaticMarkup(await InboxPage());
    expect(own).toContain('the-admins-secret-reset-token');
    expect(own).not.toContain('strangers-own-mail');
  });

  it('is off unless asked for: the scripts and a plain npm start default to a real relay; the demo-mail start and npm test ask for the catcher', () => {
    const base = { NODE_ENV: 'production' as const, PATH: process.env.PATH ?? '', DATA_DIR: '/x', PORT: '1', PGPORT: '1', REDIS_PORT: '1', PGDATABASE: 'x', PGPASSWORD: 'p', REDIS_PASSWORD: 'p' };
    const catcher = (env: Record<string, string>) => execFileSync('bash', ['-c', '. scripts/env.sh; printf %s "$MAIL_CATCHER"'], { env: { ...base, ...env } }).toString();
    expect(catcher({})).toBe('0');
    expect(catcher({ MAIL_CATCHER: '1' })).toBe('1');
    const pkg = JSON.parse(readFileSync('package.json', 'utf8')) as { scripts: Record<string, string> };
    expect(pkg.scripts.start).not.toMatch(/MAIL_CATCHER/);
    expect(pkg.scripts['start:demo-mail']).toMatch(/^MAIL_CATCHER=1 bash scripts\/start\.sh$/);
    expect(readFileSync('scripts/test.sh', 'utf8')).toMatch(/export MAIL_CATCHER=1/);
    expect(readFileSync('scripts/start.sh', 'utf8')).toMatch(/if \[ "\$MAIL_CATCHER" = 1 \]; then\n\s+mail_start/);
  });

  it('sends through the configured SMTP relay, with its user, password and TLS mode', () => {
    const env = { ...getEnv(), MAIL_CATCHER: '0' as const, SMTP_HOST: 'relay.example.test', SMTP_PORT: 465, SMTP_USER: 'veilmeter', SMTP_PASSWORD: 'relay-secret', SMTP_TLS: 'tls' as const };
    expect(transport.transportOptions(env)).toMatchObject({ host: 'relay.example.test', port: 465, secure: true, auth: { user: 'veilmeter', pass: 'relay-secret' } });
    expect(transport.transportOptions({ ...env, SMTP_PORT: 587, SMTP_TLS: 'starttls' })).toMatchObject({ port: 587, secure: false, requireTLS: true });
    expect(transport.transportOptions({ ...env, SMTP_HOST: undefined })).toBeNull();
    expect(transport.transportOptions({ ...env, MAIL_CATCHER: '1' })).toMatchObject({ host: '127.0.0.1', ignoreTLS: true });
  });
});

describe('sessions end', () => {
  it('a password reset ends the sessions opened before it', async () => {
    const p = await person('reset-ends');
    await signInAs(p.userId);
    const stolen = jar.get('next-auth.session-token')!;
    expect((await listProjects()).status).toBe(200);
    const token = await createPasswordReset(p.userId);
    const res = await resetCompletePOST(new Request('http://127.0.0.1/api/password-reset/complete', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, password: 'amber-lens-rig-2031', confirm: 'amber-lens-rig-2031' }) }));
    expect(res.status).toBe(200);
    jar.set('next-auth.session-token', stolen);
    expect((await listProjects()).status).toBe(401);
    await signInAs(p.userId);
    expect((await listProjects()).status).toBe(200);
  });

  it('removal from the last lab ends the sessions, so a later invitation does not revive an old token', async () => {
    const admin = await person('remover');
    const member = await person('removed');
    // the member joins the admin's lab, then leaves their own
    await getDb()('memberships').insert({ lab_id: admin.labId, user_id: member.userId, role: 'viewer' });
    await getDb()('memberships').where({ lab_id: member.labId, user_id: member.userId }).delete();
    await signInAs(member.userId);
    const old = jar.get('next-auth.session-token')!;
    expect((await listProjects()).status).toBe(200);
    expect(await removeMember(admin.labId, admin.userId, member.userId)).toBe('ok');
    await getDb()('memberships').insert({ lab_id: admin.labId, user_id: member.userId, role: 'viewer' });
    jar.set('next-auth.session-token', old);
    expect((await listProjects()).status).toBe(401);
  });
});

describe('e-mail verification', () => {
  it('an unverified sign-up can only verify: the API refuses it until the link is opened', async () => {
    asClient('198.51.100.10');
    const email = `unverified-${tag}@example.test`;
    const out = await actions.signUpAction(form({ name: 'Una Verde', email, password: PASSWORD, labName: `Unverified lab ${tag}` }));
    expect(out.ok, JSON.stringify(out)).toBe(true);
    const user = await getDb()('users').where({ email }).first<{ id: string; email_verified_at: Date | null }>('id', 'email_verified_at');
    users.push(user.id);
    expect(user.email_verified_at).toBeNull();
    await signInAs(user.id);
    const refused = await listProjects();
    expect(refused.status).toBe(403);
    expect(refused.body.error?.code).toBe('unverified');
    // it may ask for a new link, and that link proves the address
    const resent = await actions.resendVerificationAction();
    expect(resent.ok, resent.message).toBe(true);
    const { spendEmailVerification, createEmailVerification } = await import('../../db/queries/users-verification');
    expect(await spendEmailVerification(await createEmailVerification(user.id))).toBe(user.id);
    expect((await listProjects()).status).toBe(200);
  });

  it('an invitation link opened proves the address of the account it joins', async () => {
    const admin = await person('inviter');
    const invitee = await person('invitee', { verified: false });
    const { token } = await createInvitation(admin.labId, admin.userId, invitee.email, 'viewer');
    asClient('198.51.100.11');
    const out = await actions.acceptInvitationAction(form({ token, password: PASSWORD }));
    expect(out.ok, JSON.stringify(out)).toBe(true);
    const row = await getDb()('users').where({ id: invitee.userId }).first<{ email_verified_at: Date | null }>('email_verified_at');
    expect(row.email_verified_at).not.toBeNull();
  });
});

describe('invitation acceptance', () => {
  it('limits password checks on an existing account, per invitation and per client', async () => {
    const admin = await person('inv-admin');
    const target = await person('inv-target');
    const { token } = await createInvitation(admin.labId, admin.userId, target.email, 'lead');
    const answers: string[] = [];
    for (let i = 0; i < 11; i++) {
      asClient(`198.51.100.${20 + i}`);
      answers.push((await actions.acceptInvitationAction(form({ token, password: `guess-number-${i}` }))).message ?? '');
    }
    expect(answers.slice(0, 10).every((m) => /password does not match/.test(m)), answers.join(' | ')).toBe(true);
    expect(answers[10]).toMatch(/Too many password attempts/);
    // the right password waits too: the invitation's guesses are spent for now
    asClient('198.51.100.99');
    expect((await actions.acceptInvitationAction(form({ token, password: PASSWORD }))).message).toMatch(/Too many password attempts/);
    expect(await getDb()('memberships').where({ lab_id: admin.labId, user_id: target.userId }).first()).toBeUndefined();
  });
});

describe('user enumeration', () => {
  it('sign-up answers the same, in about the same time, for a known and an unknown address', async () => {
    const known = await person('known-signup');
    const times = { known: [] as number[], unknown: [] as number[] };
    const answers = { known: new Set<string>(), unknown: new Set<string>() };
    for (let i = 0; i < 3; i++) {
      for (const kind of ['known', 'unknown'] as const) {
        asClient(`203.0.113.${kind === 'known' ? 10 + i : 40 + i}`);
        const email = kind === 'known' ? known.email : `fresh-${i}-${tag}@example.test`;
        const t0 = performance.now();
        const out = await actions.signUpAction(form({ name: 'Sam Ple', email, password: PASSWORD, labName: `Enum lab ${i} ${tag}` }));
        times[kind].push(performance.now() - t0);
        answers[kind].add(JSON.stringify({ ok: out.ok, message: out.message, fieldErrors: out.fieldErrors }));
        if (kind === 'unknown') users.push(...(await getDb()('users').where({ email }).pluck('id')));
      }
    }
    expect([...answers.known]).toEqual([...answers.unknown]);
    expect(answers.known.size).toBe(1);
    const [k, u] = [median(times.known), median(times.unknown)];
    expect(Math.abs(k - u), `known ${k.toFixed(0)} ms, unknown ${u.toFixed(0)} ms`).toBeLessThan(Math.max(60, 0.25 * Math.max(k, u)));
    // the known address's account is untouched: still one account, the old password
    expect(await getDb()('users').whereRaw('lower(email) = ?', [known.email]).count<{ count: string }[]>('* as count')).toEqual([{ count: '1' }]);
  });

  it('a reset request answers the same, in about the same time, for a known and an unknown address', async () => {
    const known = await Promise.all([0, 1, 2, 3, 4].map((i) => person(`known-reset-${i}`)));
    const times = { known: [] as number[], unknown: [] as number[] };
    const bodies = new Set<string>();
    for (let i = 0; i < 5; i++) {
      for (const kind of ['known', 'unknown'] as const) {
        const email = kind === 'known' ? known[i]!.email : `nobody-${i}-${tag}@example.test`;
        const req = new Request('http://127.0.0.1/api/password-reset', { method: 'POST', headers: { 'content-type': 'application/json', [PEER]: `192.0.2.${i * 2 + (kind === 'known' ? 0 : 1)}` }, body: JSON.stringify({ email }) });
        const t0 = performance.now();
        const res = await resetPOST(req);
        times[kind].push(performance.now() - t0);
        expect(res.status).toBe(200);
        bodies.add(await res.text());
      }
    }
    expect(bodies.size).toBe(1);
    const [k, u] = [median(times.known), median(times.unknown)];
    expect(Math.abs(k - u), `known ${k.toFixed(0)} ms, unknown ${u.toFixed(0)} ms`).toBeLessThan(Math.max(50, 0.25 * Math.max(k, u)));
  });
});

describe('sign-up', () => {
  it('is rate limited per client', async () => {
    const answers: string[] = [];
    for (let i = 0; i < 11; i++) {
      asClient('203.0.113.77');
      const out = await actions.signUpAction(form({ name: 'Rapid Fire', email: `burst-${i}-${tag}@example.test`, password: PASSWORD, labName: `Burst lab ${i} ${tag}` }));
      answers.push(out.message ?? '');
    }
    users.push(...(await getDb()('users').where('email', 'like', `burst-%-${tag}@example.test`).pluck('id')));
    expect(answers.slice(0, 10).every((m) => /Check your inbox/.test(m)), answers.join(' | ')).toBe(true);
    expect(answers[10]).toMatch(/Too many sign-ups/);
  });

  it('refuses common passwords, patterns, the address itself and anything past 72 bytes, with a clear message', async () => {
    const cases: [string, RegExp][] = [
      ['password1234', /common passwords/],
      ['Qwerty2024!!', /common passwords/],
      ['zzzzzzzzzzzz', /one character/],
      ['0123456789', /straight run/],
      [`weak-check-${tag}@example.test`, /e-mail address/],
      ['a plain sentence of some length, '.repeat(3), /at most 72 bytes/],
      ['ütf8 ünïcödé wörds ünd mörë '.repeat(3), /at most 72 bytes/],
    ];
    for (const [password, message] of cases) {
      asClient('203.0.113.88');
      const out = await actions.signUpAction(form({ name: 'Weak Check', email: `weak-check-${tag}@example.test`, password, labName: `Weak lab ${tag}` }));
      expect(out.ok, password).toBe(false);
      expect(out.fieldErrors?.password?.join(' '), password).toMatch(message);
    }
    expect(await getDb()('users').where({ email: `weak-check-${tag}@example.test` }).first()).toBeUndefined();
    // the same rule where a password is set through a reset link
    const p = await person('reset-weak');
    const token = await createPasswordReset(p.userId);
    const res = await resetCompletePOST(new Request('http://127.0.0.1/api/password-reset/complete', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, password: 'letmein12345', confirm: 'letmein12345' }) }));
    expect(res.status).toBe(422);
    expect(JSON.stringify(await res.json())).toMatch(/common passwords/);
  });
});
