import bcrypt from 'bcryptjs';

const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(plain, hash);
}

let dummy: string | undefined;

/** Compares against a throwaway hash, so an unknown address takes as long as a known one. */
export async function verifyNothing(plain: string): Promise<false> {
  dummy ??= await bcrypt.hash('veilmeter-no-such-user', COST);
  await bcrypt.compare(plain, dummy);
  return false;
}
