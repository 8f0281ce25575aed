import 'server-only';
import { NextResponse } from 'next/server';
import { resolveApiToken, type TokenActor, type TokenScope } from '../../db/queries/api-tokens';
import { AppError } from '../errors';
import { consume, RateLimited } from '../security/rate-limit';
import { can, type Permission } from './permissions';
import { errorResponse } from './with-auth';

type Ctx<P> = { params: Promise<P> };
type Handler<P> = (req: Request, ctx: { actor: TokenActor; params: P }) => Promise<Response>;

/**
 * Wraps a /api/v1 route for capture rigs: bearer token → owner's current role in the token's
 * lab → scope and permission → per-token rate limit. A revoked or unknown token is 401.
 */
export function withToken<P = Record<string, never>>(handler: Handler<P>, opts: { scope: TokenScope; permission: Permission }) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      const header = req.headers.get('authorization') ?? '';
      const match = /^Bearer\s+(vmk_[A-Za-z0-9_-]{10,200})$/.exec(header.trim());
      if (!match?.[1]) throw new AppError(401, 'Send an API token as "Authorization: Bearer vmk_…"', 'unauthorized');
      const actor = await resolveApiToken(match[1]);
      if (!actor) throw new AppError(401, 'This token is unknown or revoked', 'unauthorized');
      if (!actor.scopes.includes(opts.scope)) throw new AppError(403, `This token lacks the "${opts.scope}" scope`, 'forbidden');
      if (!can(actor.role, opts.permission)) throw new AppError(403, 'The token owner’s role in this lab does not allow this', 'forbidden');
      await consume([['tokenApi', actor.tokenId]]);
      return await handler(req, { actor, params: await ctx.params });
    } catch (err) {
      if (err instanceof RateLimited) {
        return NextResponse.json({ error: { code: 'rate_limited', message: 'Too many requests for this token' } }, { status: 429, headers: { 'Retry-After': String(err.retryAfterS) } });
      }
      return errorResponse(err);
    }
  };
}
