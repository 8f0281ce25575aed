import { createPasswordReset, spendPasswordReset } from '../../../db/queries/password-resets';
import { getUserByEmail } from '../../../db/queries/users';
import { getEnv } from '../../env';
import { AppError } from '../../errors';
import { sendMailLater } from '../mail/transport';
import { resetMail } from '../mail/templates';
import { consume } from '../security/rate-limit';
import { ANSWER_FLOOR_MS, evenly } from './accounts';
import { addressKey } from './limits';
import { hashPassword } from '../../auth/password';

export const RESET_REQUESTED = 'If an account uses that address, a reset link is on its way. It works once, for one hour.';

/**
 * Sends a reset link when the address is known; the caller answers the same either way, and in
 * about the same time: the mail goes out after the answer, and the answer waits out a floor.
 */
export async function requestPasswordReset(email: string, ip: string): Promise<void> {
  const address = addressKey(email);
  await consume([
    ['resetIp', ip],
    ['resetAddress', address],
  ]);
  await evenly(ANSWER_FLOOR_MS, async () => {
    const user = await getUserByEmail(address);
    if (!user) return;
    const token = await createPasswordReset(user.id);
    void sendMailLater(resetMail(user.email, `${getEnv().NEXTAUTH_URL}/reset/${token}`));
  });
}

/** Sets the new password; every session of the account ends and its address counts as proved. */
export async function completePasswordReset(token: string, password: string): Promise<void> {
  const ok = await spendPasswordReset(token, await hashPassword(password));
  if (!ok) throw new AppError(410, 'This reset link has been used or has expired. Ask for a new one.', 'link_spent');
}
