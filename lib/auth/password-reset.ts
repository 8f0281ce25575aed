import { createPasswordReset, spendPasswordReset } from '../../db/queries/password-resets';
import { getUserByEmail } from '../../db/queries/users';
import { getEnv } from '../env';
import { AppError } from '../errors';
import { sendMail } from '../mail/transport';
import { resetMail } from '../mail/templates';
import { consume } from '../security/rate-limit';
import { hashPassword } from './password';

export const RESET_REQUESTED = 'If an account uses that address, a reset link is on its way. It works once, for one hour.';

/** Sends a reset link when the address is known; the caller answers the same either way. */
export async function requestPasswordReset(email: string, ip: string): Promise<void> {
  await consume([
    ['resetIp', ip],
    ['resetAddress', email],
  ]);
  const user = await getUserByEmail(email);
  if (!user) return;
  const token = await createPasswordReset(user.id);
  await sendMail(resetMail(user.email, `${getEnv().NEXTAUTH_URL}/reset/${token}`));
}

export async function completePasswordReset(token: string, password: string): Promise<void> {
  const ok = await spendPasswordReset(token, await hashPassword(password));
  if (!ok) throw new AppError(410, 'This reset link has been used or has expired. Ask for a new one.', 'link_spent');
}
