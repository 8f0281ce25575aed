import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { getEnv } from '../../env';

export type CaughtMail = { id: string; receivedAt: string; from: string; to: string[]; envelopeTo?: string[]; subject: string; text: string };

/** Who a caught message was delivered to: the SMTP envelope's recipients (the To header only for messages caught before they were recorded). */
export function recipientsOf(m: CaughtMail): string[] {
  return (m.envelopeTo ?? m.to).map((a) => a.trim().toLowerCase());
}

/**
 * Messages the local mail catcher saved for one address, newest first (development and tests
 * only). A person sees only mail delivered to their own address: a reset or invitation link is a
 * key to an account, so a list of everyone's mail would hand over every account.
 */
export async function listCaughtMailFor(address: string, limit = 100): Promise<CaughtMail[]> {
  const want = address.trim().toLowerCase();
  if (!want) return [];
  const dir = join(getEnv().DATA_DIR, 'mail');
  const files = (await readdir(dir).catch(() => [] as string[])).filter((f) => f.endsWith('.json')).sort().reverse();
  const out: CaughtMail[] = [];
  for (const f of files) {
    if (out.length >= limit) break;
    try {
      const m = JSON.parse(await readFile(join(dir, f), 'utf8')) as CaughtMail;
      if (recipientsOf(m).includes(want)) out.push(m);
    } catch {
      // A file still being written is skipped; it shows on the next look.
    }
  }
  return out;
}
