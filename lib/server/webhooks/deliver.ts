import { getDelivery, recordDeliveryAttempt } from '../../../db/queries/webhooks';
import { SIGNATURE_HEADER, signPayload } from '../../webhooks/sign';
import { checkWebhookUrl } from '../../webhooks/url-policy';

export const DELIVERY_TIMEOUT_MS = 10_000;

export class DeliveryFailed extends Error {}

/**
 * Posts one delivery, signed; throws DeliveryFailed on anything but a 2xx answer so the queue
 * retries it (`final`: this was the last attempt, so the delivery is marked failed).
 */
export async function deliverWebhook(labId: string, deliveryId: string, o: { allowPrivate: boolean; final: boolean; now?: () => number }): Promise<'delivered' | 'gone'> {
  const d = await getDelivery(labId, deliveryId);
  if (!d || d.status !== 'pending') return 'gone';
  const fail = async (status: number | null, error: string): Promise<never> => {
    await recordDeliveryAttempt(labId, deliveryId, { ok: false, final: o.final, status, error });
    throw new DeliveryFailed(error);
  };
  // checked again at each delivery: a name may point elsewhere since it was registered
  const allowed = await checkWebhookUrl(d.url, { allowPrivate: o.allowPrivate });
  if (!allowed.ok) return fail(null, allowed.message);
  const body = JSON.stringify({ id: d.id, event: d.event, createdAt: d.createdAt.toISOString(), data: d.payload });
  const t = Math.floor((o.now ?? Date.now)() / 1000);
  let res: Response;
  try {
    res = await fetch(allowed.url, {
      method: 'POST',
      body,
      redirect: 'manual',
      signal: AbortSignal.timeout(DELIVERY_TIMEOUT_MS),
      headers: { 'content-type': 'application/json', 'user-agent': 'Veilmeter-Webhooks/1', 'veilmeter-event': d.event, 'veilmeter-delivery': d.id, [SIGNATURE_HEADER]: signPayload(d.secret, body, t) },
    });
    await res.arrayBuffer().catch(() => undefined);
  } catch (e) {
    return fail(null, `No answer: ${e instanceof Error ? e.message : String(e)}`.slice(0, 300));
  }
  if (res.status < 200 || res.status >= 300) return fail(res.status, `Answered ${res.status}`);
  await recordDeliveryAttempt(labId, deliveryId, { ok: true, final: o.final, status: res.status, error: null });
  return 'delivered';
}
