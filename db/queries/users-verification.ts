import { getDb } from '../index';
import { hashSecret, newSecret } from '../../lib/security/tokens';
import { recordAudit } from './audit';
import { markEmailVerified } from './users';

export const VERIFICATION_TTL_MS = 48 * 60 * 60 * 1000;

/** Returns the one-time secret for an address-verification link; earlier unused links of the user stop working. */
export async function createEmailVerification(userId: string): Promise<string> {
  const token = newSecret();
  await getDb().transaction(async (trx) => {
    await trx('email_verifications').where({ user_id: userId }).whereNull('used_at').update({ used_at: trx.fn.now() });
    await trx('email_verifications').insert({ user_id: userId, token_hash: hashSecret(token), expires_at: new Date(Date.now() + VERIFICATION_TTL_MS) });
  });
  return token;
}

/** Spends a verification link and marks its user's address as proved; the user's id, or null when the link is spent or expired. */
export async function spendEmailVerification(token: string): Promise<string | null> {
  return getDb().transaction(async (trx) => {
    const row = await trx('email_verifications')
      .where({ token_hash: hashSecret(token) })
      .whereNull('used_at')
      .where('expires_at', '>', new Date())
      .forUpdate()
      .first<{ id: string; user_id: string } | undefined>('id', 'user_id');
    if (!row) return null;
    await trx('email_verifications').where({ id: row.id }).update({ used_at: trx.fn.now() });
    await markEmailVerified(row.user_id, trx);
    const labs = await trx('memberships').where({ user_id: row.user_id }).pluck('lab_id');
    for (const labId of labs) await recordAudit({ labId, userId: row.user_id, action: 'auth.email-verified' }, trx);
    return row.user_id;
  });
}
