import 'server-only';
import { createHash } from 'node:crypto';
import { NextResponse } from 'next/server';
import { z } from 'zod';
import { resolveApiToken } from '../../../db/queries/api-tokens';
import { claimIdempotencyKey, purgeExpiredIdempotencyKeys, releaseIdempotencyKey, saveIdempotentAnswer } from '../../../db/queries/idempotency';
import { getProjectDataVersion } from '../../../db/queries/trends';
import { getUserById } from '../../../db/queries/users';
import { can } from '../../auth/permissions';
import { actorWith, type Actor } from '../auth/session';
import { errorResponse } from '../auth/with-auth';
import { projectAnswer } from '../cache/project-answer';
import type { CachedBody } from '../cache/read-cache';
import { AppError, notFound } from '../../errors';
import { JSON_BODY_LIMIT, parseJsonBody, readBodyLimited } from '../../security/body-limit';
import { readUploadBody, uploadFileName } from '../../security/upload-body';
import { assertSameOrigin } from '../../security/origin';
import { consume } from '../security/rate-limit';
import { IDEMPOTENCY_TTL_HOURS, V1_ROUTES, type V1Route, type V1RouteId } from './routes';

type Routes = typeof V1_ROUTES;
type BodyOf<R> = R extends { body: { kind: 'json'; schema: infer S extends z.ZodType } } ? z.output<S> : undefined;
type QueryOf<R> = R extends { query: infer Q extends z.ZodType } ? z.output<Q> : undefined;

export type V1Context<K extends V1RouteId> = {
  actor: Actor;
  /** The bearer token acting, or null for a signed-in person. */
  tokenId: string | null;
  params: Record<string, string>;
  /** The JSON body, parsed with the route's schema. */
  input: BodyOf<Routes[K]>;
  /** The raw body of a binary (photo) route, counted while it arrived. */
  bytes: Uint8Array;
  query: QueryOf<Routes[K]>;
};

const BEARER = /^Bearer\s+(vmk_[A-Za-z0-9_-]{10,200})$/;
// visible ASCII, as the header's draft standard allows; long enough for a hash or a UUID
const IDEMPOTENCY_KEY = /^[\x21-\x7e]{1,255}$/;
const LOCK_SECONDS = 10 * 60;

async function tokenActor(header: string, route: V1Route): Promise<{ actor: Actor; tokenId: string }> {
  const match = BEARER.exec(header.trim());
  if (!match?.[1]) throw new AppError(401, 'Send an API token as "Authorization: Bearer vmk_…"', 'unauthorized');
  const t = await resolveApiToken(match[1]);
  if (!t) throw new AppError(401, 'This token is unknown or revoked', 'unauthorized');
  if (route.scope && !t.scopes.includes(route.scope)) throw new AppError(403, `This token lacks the "${route.scope}" scope`, 'forbidden');
  if (route.permission && !can(t.role, route.permission)) throw new AppError(403, 'The token owner’s role in this lab does not allow this', 'forbidden');
  await consume([['tokenApi', t.tokenId]]);
  const user = await getUserById(t.userId);
  if (!user) throw new AppError(401, 'This token is unknown or revoked', 'unauthorized');
  return { actor: { user, labId: t.labId, labName: '', role: t.role, memberships: [] }, tokenId: t.tokenId };
}

function searchObject(url: URL): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of url.searchParams) if (!(k in out)) out[k] = v;
  return out;
}

async function readBody(req: Request, route: V1Route): Promise<Uint8Array> {
  if (!route.body) return new Uint8Array(0);
  if (route.body.kind === 'json') {
    return readBodyLimited(req, JSON_BODY_LIMIT).catch((e: unknown) => {
      if (e instanceof AppError) throw e;
      throw new AppError(413, 'The request body arrived incomplete: the connection ended before it was whole', 'incomplete');
    });
  }
  return readUploadBody(req, uploadFileName(req));
}

let purgeCountdown = 0;

/** Runs `run` at most once per Idempotency-Key (lib/server/api-v1/routes.ts says which routes take one). */
async function idempotent(req: Request, labId: string, caller: string, key: string, body: Uint8Array, run: () => Promise<Response>): Promise<Response> {
  if (!IDEMPOTENCY_KEY.test(key)) throw new AppError(422, 'The Idempotency-Key is 1 to 255 visible ASCII characters', 'invalid', { 'Idempotency-Key': ['Use 1 to 255 visible ASCII characters'] });
  if (--purgeCountdown <= 0) {
    purgeCountdown = 200;
    void purgeExpiredIdempotencyKeys().catch(() => undefined);
  }
  const url = new URL(req.url);
  const claim = await claimIdempotencyKey({
    labId,
    caller,
    key,
    request: `${req.method.toUpperCase()} ${url.pathname}${url.search}`,
    bodyHash: createHash('sha256').update(body).digest('hex'),
    ttlSeconds: IDEMPOTENCY_TTL_HOURS * 3600,
    lockSeconds: LOCK_SECONDS,
  });
  if (claim.kind === 'mismatch') throw new AppError(422, 'This Idempotency-Key was already used for another request or body: use a new key for a new request', 'idempotency_mismatch');
  if (claim.kind === 'busy') return NextResponse.json({ error: { code: 'idempotency_busy', message: 'A request with this Idempotency-Key is still running: retry in a moment' } }, { status: 409, headers: { 'Retry-After': '1' } });
  if (claim.kind === 'replay') {
    const headers: Record<string, string> = { 'idempotent-replayed': 'true' };
    if (claim.contentType) headers['content-type'] = claim.contentType;
    return new Response(claim.status === 204 ? null : (claim.body as BodyInit), { status: claim.status, headers });
  }
  let kept = false;
  try {
    const res = await run();
    // only successful answers are kept: an error changed nothing, so the key may be used again
    if (res.status >= 200 && res.status < 300) {
      const bytes = new Uint8Array(await res.arrayBuffer());
      await saveIdempotentAnswer(labId, claim.id, { status: res.status, contentType: res.headers.get('content-type'), body: bytes });
      kept = true;
      return new Response(res.status === 204 ? null : bytes, { status: res.status, headers: res.headers });
    }
    return res;
  } finally {
    if (!kept) await releaseIdempotencyKey(labId, claim.id).catch(() => undefined);
  }
}

/**
 * A rig API route handler for the route `id` of the route table. It checks who acts (a bearer
 * token with the route's scope, or a signed-in person), their role's permission, the query and
 * the body (counted while it streams), runs writes at most once per Idempotency-Key, and turns
 * every error into the documented error answer. `declared` repeats the route's permission so a
 * reader of the route file sees it; the types make it equal to the table's.
 */
export function rigRoute<K extends V1RouteId>(id: K, declared: { permission: Routes[K]['permission'] }, handler: (req: Request, ctx: V1Context<K>) => Promise<Response>) {
  const route: V1Route = V1_ROUTES[id];
  void declared;
  return async (req: Request, ctx: { params: Promise<Record<string, string>> }): Promise<Response> => {
    try {
      const params = ctx.params ? await ctx.params : {};
      if (!route.permission) return await handler(req, { actor: null as unknown as Actor, tokenId: null, params, input: undefined as BodyOf<Routes[K]>, bytes: new Uint8Array(0), query: undefined as QueryOf<Routes[K]> });
      const bearer = req.headers.get('authorization');
      let actor: Actor;
      let tokenId: string | null = null;
      if (bearer) {
        ({ actor, tokenId } = await tokenActor(bearer, route));
      } else {
        assertSameOrigin(req);
        actor = await actorWith(route.permission);
      }
      const url = new URL(req.url);
      const query = (route.query ? route.query.parse(searchObject(url)) : undefined) as QueryOf<Routes[K]>;
      const raw = await readBody(req, route);
      const input = (route.body?.kind === 'json' ? route.body.schema.parse(parseJsonBody(raw)) : undefined) as BodyOf<Routes[K]>;
      const run = () => handler(req, { actor, tokenId, params, input, bytes: raw, query });
      const key = route.idempotent ? req.headers.get('idempotency-key') : null;
      if (key === null) return await run();
      return await idempotent(req, actor.labId, tokenId ? `token:${tokenId}` : `user:${actor.user.id}`, key.trim(), raw, run);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** The route's answer for `status`, sent through its schema: unknown fields are dropped, a missing one is our bug (500). */
export function v1Answer<K extends V1RouteId>(id: K, status: number, body: unknown, headers: Record<string, string> = {}): Response {
  return new Response(v1Bytes(id, status, body), { status, headers: { 'content-type': 'application/json', 'cache-control': 'private, no-store', ...headers } });
}

export function v1Bytes(id: V1RouteId, status: number, body: unknown): Uint8Array<ArrayBuffer> {
  const answer = (V1_ROUTES[id] as V1Route).answers[status];
  if (!answer || !('json' in answer)) throw new Error(`route ${id} documents no JSON answer ${status}`);
  // through JSON first: dates become the ISO strings the document promises
  const plain = JSON.parse(JSON.stringify(body)) as unknown;
  const parsed = answer.json.safeParse(plain);
  if (!parsed.success) throw new Error(`the ${id} answer does not match its published shape: ${z.prettifyError(parsed.error)}`);
  return new TextEncoder().encode(JSON.stringify(parsed.data));
}

/** The ETag of one representation of a project read at one data version. */
export function projectEtag(kind: string, version: string): string {
  return `W/"${createHash('sha256').update(`${kind}\u0000${version}`).digest('base64url').slice(0, 27)}"`;
}

function matches(ifNoneMatch: string | null, etag: string): boolean {
  if (!ifNoneMatch) return false;
  const bare = (t: string) => t.trim().replace(/^W\//, '');
  return ifNoneMatch.split(',').some((t) => t.trim() === '*' || bare(t) === bare(etag));
}

/**
 * A project read with an ETag from the project's data version (which every write to its readings,
 * capture sets, revisions or targets moves): 304 when If-None-Match names it, else the body from
 * the read cache (lib/server/cache/project-answer.ts) at that same version.
 */
export async function conditionalProjectRead(
  req: Request,
  labId: string,
  projectId: string,
  kind: string,
  headers: (meta: Record<string, string>) => Record<string, string>,
  build: () => Promise<CachedBody>,
): Promise<Response> {
  const version = await getProjectDataVersion(labId, projectId);
  if (!version) throw notFound('No such project');
  const etag = projectEtag(kind, version);
  const validators = { etag, 'cache-control': 'private, no-cache' };
  if (matches(req.headers.get('if-none-match'), etag)) return new Response(null, { status: 304, headers: validators });
  const res = await projectAnswer(req, { labId, project: { id: projectId, version } }, projectId, `v1:${kind}`, (meta) => ({ ...headers(meta), ...validators }), build);
  return res;
}
