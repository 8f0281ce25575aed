import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { getEnv } from '../env';

export type CaughtMail = { id: string; receivedAt: string; from: string; to: string[]; subject: string; text: string };

/** Messages the local mail catcher saved, newest first (development and tests only). */
export async function listCaughtMail(limit = 100): Promise<CaughtMail[]> {
  const dir = join(getEnv().DATA_DIR, 'mail');
  const files = (await readdir(dir).catch(() => [] as string[])).filter((f) => f.endsWith('.json')).sort().reverse().slice(0, limit);
  const out: CaughtMail[] = [];
  for (const f of files) {
    try {
      out.push(JSON.parse(await readFile(join(dir, f), 'utf8')) as CaughtMail);
    } catch {
      // A file still being written is skipped; it shows on the next look.
    }
  }
  return out;
}
