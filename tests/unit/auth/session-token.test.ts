import { encode } from 'next-auth/jwt';
import { describe, expect, it } from 'vitest';
import { sessionToken, sessionUserId } from '../../../lib/server/auth/session-token';

const SECRET = 'unit-test-secret-with-enough-length-000';
const jar = (cookies: Record<string, string>) => ({ getAll: () => Object.entries(cookies).map(([name, value]) => ({ name, value })) });

describe('session token read by the proxy and the handlers', () => {
  it('gives the user of a valid token, from memory the second time', async () => {
    const token = await encode({ token: { sub: 'user-1' }, secret: SECRET });
    expect(await sessionUserId(jar({ 'next-auth.session-token': token }), false, SECRET)).toBe('user-1');
    expect(await sessionUserId(jar({ 'next-auth.session-token': token }), false, SECRET)).toBe('user-1');
  });

  it('refuses a token sealed with another secret, a tampered one, none, and one without a user', async () => {
    const other = await encode({ token: { sub: 'user-1' }, secret: `${SECRET}-other` });
    expect(await sessionUserId(jar({ 'next-auth.session-token': other }), false, SECRET)).toBeNull();
    const token = await encode({ token: { sub: 'user-2' }, secret: SECRET });
    const tampered = token.slice(0, -4) + (token.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    expect(await sessionUserId(jar({ 'next-auth.session-token': tampered }), false, SECRET)).toBeNull();
    expect(await sessionUserId(jar({}), false, SECRET)).toBeNull();
    const anonymous = await encode({ token: { name: 'no sub' }, secret: SECRET });
    expect(await sessionUserId(jar({ 'next-auth.session-token': anonymous }), false, SECRET)).toBeNull();
  });

  it('refuses an expired token (beyond the 15 s leeway)', async () => {
    const expired = await encode({ token: { sub: 'user-3' }, secret: SECRET, maxAge: -60 });
    expect(await sessionUserId(jar({ 'next-auth.session-token': expired }), false, SECRET)).toBeNull();
  });

  it('reads the secure cookie name only when asked to, and joins numbered chunks in order', async () => {
    const token = await encode({ token: { sub: 'user-4' }, secret: SECRET });
    expect(await sessionUserId(jar({ '__Secure-next-auth.session-token': token }), false, SECRET)).toBeNull();
    expect(await sessionUserId(jar({ '__Secure-next-auth.session-token': token }), true, SECRET)).toBe('user-4');
    const half = Math.floor(token.length / 2);
    const chunks = jar({ 'next-auth.session-token.1': token.slice(half), 'next-auth.session-token.0': token.slice(0, half) });
    expect(sessionToken(chunks, false)).toBe(token);
    expect(await sessionUserId(chunks, false, SECRET)).toBe('user-4');
  });
});
