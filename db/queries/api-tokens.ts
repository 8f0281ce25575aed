import { getDb } from '../index';
import { recordAudit } from './audit';
import { hashSecret, newSecret } from '../../lib/security/tokens';
import type { Role } from '../../lib/auth/permissions';
import type { TokenScope } from '../../lib/server/api-v1/scopes';

export { TOKEN_SCOPES, type TokenScope } from '../../lib/server/api-v1/scopes';

export type ApiToken = { id: string; name: string; prefix: string; scopes: TokenScope[]; lastUsedAt: Date | null; revokedAt: Date | null; createdAt: Date; userId: string; userEmail: string };
type Row = { id: string; name: string; prefix: string; scopes: TokenScope[]; last_used_at: Date | null; revoked_at: Date | null; created_at: Date; user_id: string; email: string };

const toToken = (r: Row): ApiToken => ({ id: r.id, name: r.name, prefix: r.prefix, scopes: r.scopes, lastUsedAt: r.last_used_at, revokedAt: r.revoked_at, createdAt: r.created_at, userId: r.user_id, userEmail: r.email });

/** Creates a token; the full secret is returned once and only its hash is kept. */
export async function createApiToken(labId: string, userId: string, name: string, scopes: TokenScope[]): Promise<{ token: string; record: ApiToken }> {
  const prefix = newSecret(6).replace(/[-_]/g, 'x').slice(0, 8);
  const token = `vmk_${prefix}_${newSecret(24)}`;
  return getDb().transaction(async (trx) => {
    const [row] = await trx('api_tokens').insert({ lab_id: labId, user_id: userId, name, prefix, token_hash: hashSecret(token), scopes }).returning<{ id: string }[]>('id');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'token.create', targetType: 'api_token', targetId: row.id, details: { name, prefix, scopes } }, trx);
    const rec = await trx('api_tokens as t').join('users as u', 'u.id', 't.user_id').where('t.id', row.id).first<Row>('t.*', 'u.email');
    return { token, record: toToken(rec) };
  });
}

/** The lab's tokens: everyone's for `all`, otherwise the person's own. */
export async function listApiTokens(labId: string, userId: string, all: boolean): Promise<ApiToken[]> {
  const q = getDb()('api_tokens as t').join('users as u', 'u.id', 't.user_id').where('t.lab_id', labId);
  if (!all) q.andWhere('t.user_id', userId);
  const rows: Row[] = await q.orderBy('t.created_at', 'desc').select('t.*', 'u.email');
  return rows.map(toToken);
}

export async function revokeApiToken(labId: string, actorId: string, id: string, anyOwner: boolean): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const q = trx('api_tokens').where({ lab_id: labId, id }).whereNull('revoked_at');
    if (!anyOwner) q.andWhere('user_id', actorId);
    const n = await q.update({ revoked_at: trx.fn.now() });
    if (n) await recordAudit({ labId, userId: actorId, action: 'token.revoke', targetType: 'api_token', targetId: id }, trx);
    return n > 0;
  });
}

export type TokenActor = { tokenId: string; userId: string; labId: string; role: Role; scopes: TokenScope[] };

/** Resolves a bearer token to its owner's current role in the token's lab; null if unknown or revoked. */
export async function resolveApiToken(token: string): Promise<TokenActor | null> {
  const row = await getDb()('api_tokens as t')
    .join('memberships as m', function () {
      this.on('m.lab_id', 't.lab_id').andOn('m.user_id', 't.user_id');
    })
    .where('t.token_hash', hashSecret(token))
    .whereNull('t.revoked_at')
    .first<{ id: string; user_id: string; lab_id: string; role: Role; scopes: TokenScope[] } | undefined>('t.id', 't.user_id', 't.lab_id', 'm.role', 't.scopes');
  if (!row) return null;
  await getDb()('api_tokens').where({ id: row.id }).update({ last_used_at: getDb().fn.now() });
  return { tokenId: row.id, userId: row.user_id, labId: row.lab_id, role: row.role, scopes: row.scopes };
}
