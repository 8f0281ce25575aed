import 'server-only';
import { NextResponse } from 'next/server';
import { AppError, toErrorResponse } from '../errors';
import { actorWith, type Actor } from './session';
import type { Permission } from './permissions';

type Ctx<P> = { params: Promise<P> };
type Handler<P> = (req: Request, ctx: { actor: Actor; params: P }) => Promise<Response>;

/** Wraps a route handler: session → role from the database → permission → handler; errors become safe JSON. */
export function withAuth<P = Record<string, never>>(handler: Handler<P>, opts: { permission: Permission }) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      const actor = await actorWith(opts.permission);
      return await handler(req, { actor, params: await ctx.params });
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export function errorResponse(err: unknown): Response {
  const { status, body } = toErrorResponse(err);
  return NextResponse.json(body, { status });
}

/** Reads a JSON body; malformed JSON is the caller's mistake (422), not ours. */
export async function readJson(req: Request): Promise<unknown> {
  try {
    return await req.json();
  } catch {
    throw new AppError(422, 'The request body is not valid JSON', 'invalid_json');
  }
}
