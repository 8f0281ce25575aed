import { isIP } from 'node:net';
import { getEnv } from '../env';

/**
 * Set by scripts/web.mjs on every request to the socket's remote address, replacing whatever the
 * client sent under that name, so it is the one address a client cannot choose.
 */
export const PEER_HEADER = 'x-veilmeter-peer';

function normalise(ip: string): string {
  const t = ip.trim().replace(/^\[|\]$/g, '');
  return t.startsWith('::ffff:') && isIP(t.slice(7)) === 4 ? t.slice(7) : t;
}

/**
 * The proxies whose X-Forwarded-For and X-Forwarded-Proto are believed: the TRUSTED_PROXIES
 * setting (comma-separated addresses; none when unset).
 */
export function trustedProxies(): Set<string> {
  return new Set(getEnv().TRUSTED_PROXIES.map(normalise).filter((s) => s !== ''));
}

/** The address of whoever opened the connection to this server. */
export function peerAddress(req: Request): string {
  return normalise(req.headers.get(PEER_HEADER) ?? '') || 'unknown';
}

/** True when the connection comes from a configured proxy, whose forwarding headers count. */
export function fromTrustedProxy(req: Request): boolean {
  const trusted = trustedProxies();
  return trusted.size > 0 && trusted.has(peerAddress(req));
}

/**
 * The client's address for limits: the socket's peer, or, when the peer is a trusted proxy, the
 * nearest address in X-Forwarded-For that is not itself a trusted proxy (reading from the right,
 * since everything left of the last trusted hop may be made up by the client).
 */
export function clientAddress(req: Request): string {
  const peer = peerAddress(req);
  const trusted = trustedProxies();
  if (!trusted.has(peer)) return peer;
  const hops = (req.headers.get('x-forwarded-for') ?? '').split(',').map(normalise).filter((s) => s !== '');
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = hops[i] as string;
    if (!trusted.has(hop)) return hop;
  }
  return peer;
}

/** Whether the request reached us over https: NEXTAUTH_URL says so, or a trusted proxy does. */
export function servedOverHttps(req: Request): boolean {
  if (getEnv().NEXTAUTH_URL.startsWith('https://')) return true;
  return fromTrustedProxy(req) && (req.headers.get('x-forwarded-proto') ?? '').split(',')[0]?.trim() === 'https';
}
