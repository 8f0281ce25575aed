import 'server-only';
import { getCaptureSet, type CaptureSet } from '@/db/queries/capture-sets';
import { notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/ids';

export { idOr404 };

export async function captureSetOr404(labId: string, raw: string): Promise<CaptureSet> {
  const set = await getCaptureSet(labId, idOr404(raw, 'capture set'));
  if (!set) throw notFound('No such capture set');
  return set;
}
