import { getDb } from '../index';

/**
 * Stored answers for the rig API's Idempotency-Key header (lib/server/api-v1/idempotency.ts). A key is
 * one caller's (a token, or a signed-in person) in one lab; the first request claims it with a
 * unique insert before doing anything, so two copies sent at once never both run.
 */
export type IdempotencyClaim =
  | { kind: 'run'; id: string }
  | { kind: 'replay'; status: number; contentType: string | null; body: Uint8Array }
  | { kind: 'mismatch' }
  | { kind: 'busy' };

type Row = { id: string; request: string; body_hash: string; status: number | null; content_type: string | null; body: Buffer | null; running: boolean };

export async function claimIdempotencyKey(o: { labId: string; caller: string; key: string; request: string; bodyHash: string; ttlSeconds: number; lockSeconds: number }): Promise<IdempotencyClaim> {
  const db = getDb();
  const where = { lab_id: o.labId, caller: o.caller, key: o.key };
  // an expired key is as good as unused
  await db('idempotency_keys').where(where).andWhere('expires_at', '<', db.fn.now()).delete();
  const inserted = await db('idempotency_keys')
    .insert({
      ...where,
      request: o.request,
      body_hash: o.bodyHash,
      locked_until: db.raw(`now() + make_interval(secs => ?)`, [o.lockSeconds]),
      expires_at: db.raw(`now() + make_interval(secs => ?)`, [o.ttlSeconds]),
    })
    .onConflict(['lab_id', 'caller', 'key'])
    .ignore()
    .returning<{ id: string }[]>('id');
  if (inserted[0]) return { kind: 'run', id: inserted[0].id };

  const row = (await db('idempotency_keys').where(where).first('id', 'request', 'body_hash', 'status', 'content_type', 'body', db.raw('locked_until > now() AS running'))) as Row | undefined;
  // deleted in between (the first request failed and let go of it): claim it afresh
  if (!row) return claimIdempotencyKey(o);
  if (row.request !== o.request || row.body_hash.trim() !== o.bodyHash) return { kind: 'mismatch' };
  if (row.status !== null) return { kind: 'replay', status: row.status, contentType: row.content_type, body: new Uint8Array(row.body ?? Buffer.alloc(0)) };
  if (row.running) return { kind: 'busy' };
  // the first request's process died while it held the key: take it over, one taker only
  const taken = await db('idempotency_keys')
    .where({ id: row.id })
    .whereNull('status')
    .andWhere('locked_until', '<=', db.fn.now())
    .update({ locked_until: db.raw(`now() + make_interval(secs => ?)`, [o.lockSeconds]) })
    .returning<{ id: string }[]>('id');
  return taken[0] ? { kind: 'run', id: taken[0].id } : { kind: 'busy' };
}

/** Keeps the first request's answer for replays until the key expires. */
export async function saveIdempotentAnswer(labId: string, id: string, answer: { status: number; contentType: string | null; body: Uint8Array }): Promise<void> {
  await getDb()('idempotency_keys').where({ lab_id: labId, id }).update({ status: answer.status, content_type: answer.contentType, body: Buffer.from(answer.body) });
}

/** Lets go of a key whose request ended without an answer worth keeping (a server error, a broken upload). */
export async function releaseIdempotencyKey(labId: string, id: string): Promise<void> {
  await getDb()('idempotency_keys').where({ lab_id: labId, id }).whereNull('status').delete();
}

/** Deletes expired keys, at most `limit` at a time; returns how many went. */
export async function purgeExpiredIdempotencyKeys(limit = 1000): Promise<number> {
  const db = getDb();
  return db('idempotency_keys').whereIn('id', db('idempotency_keys').where('expires_at', '<', db.fn.now()).limit(limit).select('id')).delete();
}

/** Records that a token created this capture set (a rig may delete its own sets). */
export async function markCaptureSetFromToken(labId: string, captureSetId: string, tokenId: string): Promise<void> {
  await getDb()('capture_sets').where({ lab_id: labId, id: captureSetId }).update({ created_by_token: tokenId });
}

/** The token that created a capture set of this lab, or null (made in the app, or not found). */
export async function captureSetToken(labId: string, captureSetId: string): Promise<string | null> {
  const row = (await getDb()('capture_sets').where({ lab_id: labId, id: captureSetId }).first('created_by_token')) as { created_by_token: string | null } | undefined;
  return row?.created_by_token ?? null;
}
