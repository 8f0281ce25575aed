import 'server-only';
import { getCaptureSet, type CaptureSet } from '../../../db/queries/capture-sets';
import { notFound } from '../../errors';
import { uuidSchema } from '../../schemas/common';

/** Malformed ids and other labs' ids answer the same 404. */
export function idOr404(raw: string | undefined, what: string): string {
  const parsed = uuidSchema.safeParse(raw);
  if (!parsed.success) throw notFound(`No such ${what}`);
  return parsed.data;
}

export async function captureSetOr404(labId: string, raw: string | undefined): Promise<CaptureSet> {
  const set = await getCaptureSet(labId, idOr404(raw, 'capture set'));
  if (!set) throw notFound('No such capture set');
  return set;
}
