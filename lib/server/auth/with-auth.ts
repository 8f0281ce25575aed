import 'server-only';
import { NextResponse } from 'next/server';
import { resolveApiToken, type TokenScope } from '../../../db/queries/api-tokens';
import { getUserById } from '../../../db/queries/users';
import { AppError, toErrorResponse } from '../../errors';
import { consume, RateLimited } from '../security/rate-limit';
import { readJsonLimited } from '../../security/body-limit';
import { assertSameOrigin } from '../../security/origin';
import { can, type Permission } from '../../auth/permissions';
import { actorWith, type Actor } from './session';

type Ctx<P> = { params: Promise<P> };
type Handler<P> = (req: Request, ctx: { actor: Actor; params: P }) => Promise<Response>;

/** A read permission needs a token's `read` scope; anything that writes needs `capture:write`. */
export function scopeFor(permission: Permission): TokenScope {
  return permission.endsWith('.read') ? 'read' : 'capture:write';
}

const BEARER = /^Bearer\s+(vmk_[A-Za-z0-9_-]{10,200})$/;

/**
 * A capture rig's bearer token, acting as its owner with their current role in the token's lab.
 * Unknown or revoked → 401; missing scope or role → 403; each token is rate limited.
 */
async function tokenActor(header: string, permission: Permission): Promise<Actor> {
  const match = BEARER.exec(header.trim());
  if (!match?.[1]) throw new AppError(401, 'Send an API token as "Authorization: Bearer vmk_…"', 'unauthorized');
  const t = await resolveApiToken(match[1]);
  if (!t) throw new AppError(401, 'This token is unknown or revoked', 'unauthorized');
  const scope = scopeFor(permission);
  if (!t.scopes.includes(scope)) throw new AppError(403, `This token lacks the "${scope}" scope`, 'forbidden');
  if (!can(t.role, permission)) throw new AppError(403, 'The token owner’s role in this lab does not allow this', 'forbidden');
  await consume([['tokenApi', t.tokenId]]);
  const user = await getUserById(t.userId);
  if (!user) throw new AppError(401, 'This token is unknown or revoked', 'unauthorized');
  return { user, labId: t.labId, labName: '', role: t.role, memberships: [] };
}

function onRigApi(req: Request): boolean {
  try {
    return new URL(req.url).pathname.startsWith('/api/v1/');
  } catch {
    return false;
  }
}

/**
 * Wraps a route handler: who is acting (session cookie, or a bearer token under /api/v1) → role
 * from the database → permission → handler; every error becomes safe JSON. `projectParam` names
 * the route parameter holding a project id whose data version the handler will want
 * (lib/server/cache/project-answer.ts), so it comes with the role in one query.
 */
export function withAuth<P = Record<string, never>>(handler: Handler<P>, opts: { permission: Permission; projectParam?: keyof P & string }) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      const params = await ctx.params;
      // tokens are for the rig API under /api/v1 only; elsewhere a bearer header counts for
      // nothing and the session decides (so a token is no way around it on the app's own routes)
      const bearer = onRigApi(req) ? req.headers.get('authorization') : null;
      if (!bearer) assertSameOrigin(req);
      // a project read has its project's data version looked up with the session's role
      const projectId = opts.projectParam ? (params as Record<string, unknown>)[opts.projectParam] : undefined;
      const actor = bearer ? await tokenActor(bearer, opts.permission) : await actorWith(opts.permission, typeof projectId === 'string' ? projectId : undefined);
      return await handler(req, { actor, params });
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export function errorResponse(err: unknown): Response {
  if (err instanceof RateLimited) {
    return NextResponse.json({ error: { code: 'rate_limited', message: 'Too many requests: wait and try again' } }, { status: 429, headers: { 'Retry-After': String(err.retryAfterS) } });
  }
  const { status, body, headers } = toErrorResponse(err);
  return NextResponse.json(body, { status, headers });
}

/** Reads a JSON body, counted as it streams (413 past lib/security/body-limit.ts's limit); malformed JSON is 422. */
export const readJson = (req: Request): Promise<unknown> => readJsonLimited(req);
