import { notFound } from './errors';
import { uuidSchema } from './schemas/common';

/**
 * A record id from a route's path, as the lowercase uuid the database stores. A malformed id
 * answers the same 404 as another lab's id, so neither says whether the record exists.
 */
export function idOr404(raw: string, what: string): string {
  const parsed = uuidSchema.safeParse(raw);
  if (!parsed.success) throw notFound(`No such ${what}`);
  return parsed.data.toLowerCase();
}
