import { AppError } from '../errors';
import { decodeGroup, type GroupKey } from '../targets/compare';

// the one idOr404 (lib/ids.ts), still importable from here
export { idOr404 } from '../ids';

/** The two sides of a comparison from ?a=…&b=…; a clear 422 when one is missing or malformed. */
export function groupsFrom(url: string): { a: GroupKey; b: GroupKey } {
  const q = new URL(url).searchParams;
  const a = decodeGroup(q.get('a'));
  const b = decodeGroup(q.get('b'));
  if (!a || !b) {
    const fieldErrors: Record<string, string[]> = {};
    if (!a) fieldErrors.a = ['Pick group A: a revision id, optionally followed by ":" and a variant'];
    if (!b) fieldErrors.b = ['Pick group B: a revision id, optionally followed by ":" and a variant'];
    throw new AppError(422, 'Choose the two groups to compare', 'invalid', fieldErrors);
  }
  return { a, b };
}
