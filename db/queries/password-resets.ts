import { getDb } from '../index';
import { hashSecret, newSecret } from '../../lib/security/tokens';
import { recordAudit } from './audit';
import { endSessions, markEmailVerified } from './users';

export const RESET_TTL_MS = 60 * 60 * 1000;

/** Returns the one-time secret for a reset link; earlier unused links of the user stop working. */
export async function createPasswordReset(userId: string): Promise<string> {
  const token = newSecret();
  await getDb().transaction(async (trx) => {
    await trx('password_resets').where({ user_id: userId }).whereNull('used_at').update({ used_at: trx.fn.now() });
    await trx('password_resets').insert({ user_id: userId, token_hash: hashSecret(token), expires_at: new Date(Date.now() + RESET_TTL_MS) });
  });
  return token;
}

export async function isResetUsable(token: string): Promise<boolean> {
  const row = await getDb()('password_resets').where({ token_hash: hashSecret(token) }).whereNull('used_at').where('expires_at', '>', new Date()).first('id');
  return !!row;
}

/** Sets the new password and spends the link in one transaction; false when the link is spent or expired. */
export async function spendPasswordReset(token: string, passwordHash: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const row = await trx('password_resets').where({ token_hash: hashSecret(token) }).whereNull('used_at').where('expires_at', '>', new Date()).forUpdate().first<{ id: string; user_id: string } | undefined>('id', 'user_id');
    if (!row) return false;
    await trx('password_resets').where({ id: row.id }).update({ used_at: trx.fn.now() });
    // the new password ends every session the old one opened, and the link proved the address
    await trx('users').where({ id: row.user_id }).update({ password_hash: passwordHash, updated_at: trx.fn.now() });
    await endSessions(row.user_id, trx);
    await markEmailVerified(row.user_id, trx);
    const labs = await trx('memberships').where({ user_id: row.user_id }).pluck('lab_id');
    for (const labId of labs) await recordAudit({ labId, userId: row.user_id, action: 'auth.password-reset' }, trx);
    return true;
  });
}
