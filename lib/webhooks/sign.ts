import { createHmac, timingSafeEqual } from 'node:crypto';

/** The header a receiver checks: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>" under the webhook's secret>`. */
export const SIGNATURE_HEADER = 'veilmeter-signature';

export function signPayload(secret: string, body: string, unixSeconds: number): string {
  const mac = createHmac('sha256', secret).update(`${unixSeconds}.${body}`).digest('hex');
  return `t=${unixSeconds},v1=${mac}`;
}

/** What a receiver does (and the tests): the signature matches and is at most `toleranceS` old. */
export function verifySignature(secret: string, body: string, header: string, nowS: number, toleranceS = 300): boolean {
  const parts = Object.fromEntries(header.split(',').map((p) => p.trim().split('=', 2) as [string, string]));
  const t = Number(parts.t);
  if (!Number.isInteger(t) || Math.abs(nowS - t) > toleranceS || !parts.v1) return false;
  const want = Buffer.from(signPayload(secret, body, t).split('v1=')[1] as string, 'hex');
  const got = Buffer.from(parts.v1, 'hex');
  return want.length === got.length && timingSafeEqual(want, got);
}
