import { recordAudit } from '../../../db/queries/audit';
import { getUserByEmail, createUserWithLab } from '../../../db/queries/users';
import { createEmailVerification, spendEmailVerification } from '../../../db/queries/users-verification';
import { getEnv } from '../../env';
import { isUniqueViolation } from '../../errors';
import { accountExistsMail, verifyMail } from '../mail/templates';
import { sendMailLater } from '../mail/transport';
import { addressKey, spend } from './limits';
import { hashPassword } from '../../auth/password';

/**
 * The shortest time a sign-up or reset request takes to answer. Both do about the same work
 * whether or not the address has an account (a bcrypt hash, one message sent after the answer),
 * and waiting out this floor hides what difference is left (a few database writes).
 */
export const ANSWER_FLOOR_MS = 400;

/** Runs `work`, then waits until `floorMs` have passed since the start. */
export async function evenly<T>(floorMs: number, work: () => Promise<T>): Promise<T> {
  const start = Date.now();
  try {
    return await work();
  } finally {
    const left = floorMs - (Date.now() - start);
    if (left > 0) await new Promise((r) => setTimeout(r, left));
  }
}

export const SIGN_UP_ANSWER = 'Check your inbox: we sent a link to confirm your address. Open it, then sign in.';

/** Sends a fresh verification link to an account whose address is not yet proved. */
export async function sendVerification(user: { id: string; email: string }): Promise<void> {
  const token = await createEmailVerification(user.id);
  // sent after the answer: a slow relay must not make this path slower than the others
  void sendMailLater(verifyMail(user.email, `${getEnv().NEXTAUTH_URL}/verify/${token}`));
}

/**
 * Starts a lab for a new address, or, when the address has an account already, tells its owner
 * by mail and makes nothing. The caller answers SIGN_UP_ANSWER either way, in about the same
 * time, so the form tells no one which addresses have accounts. The new account can do nothing
 * but verify its address until the link in the mail is opened.
 */
export async function signUp(input: { email: string; name: string; password: string; labName: string }, client: string): Promise<void> {
  const email = addressKey(input.email);
  await spend([
    ['signUpClient', client],
    ['signUpAddress', email],
  ]);
  await evenly(ANSWER_FLOOR_MS, async () => {
    // the hash is made either way, so a known address answers no sooner than a new one
    const passwordHash = await hashPassword(input.password);
    const existing = await getUserByEmail(email);
    if (existing) return tellOwner(existing.email);
    try {
      const { userId, labId } = await createUserWithLab({ email, name: input.name, labName: input.labName, passwordHash });
      await recordAudit({ labId, userId, action: 'lab.create', targetType: 'lab', targetId: labId });
      await sendVerification({ id: userId, email });
    } catch (err) {
      // the same address signed up twice at once: the second is told like any known address
      if (!isUniqueViolation(err)) throw err;
      await tellOwner(email);
    }
  });
}

async function tellOwner(email: string): Promise<void> {
  const base = getEnv().NEXTAUTH_URL;
  void sendMailLater(accountExistsMail(email, `${base}/sign-in`, `${base}/reset`));
}

/** Spends a verification link; true when it proved an address. */
export async function confirmEmail(token: string): Promise<boolean> {
  if (token.length < 10 || token.length > 200) return false;
  return (await spendEmailVerification(token)) !== null;
}
