import { lookup } from 'node:dns/promises';
import { isIP } from 'node:net';

/**
 * Whether an address is one a webhook must not reach in production: loopback, private networks,
 * link-local (cloud metadata services live there), carrier-grade NAT, unspecified and multicast,
 * IPv4 or IPv6 (IPv4-mapped IPv6 checked as IPv4). Ranges from RFC 1918, RFC 6598, RFC 3927,
 * RFC 4193 and RFC 4291.
 */
export function isPrivateAddress(address: string): boolean {
  const kind = isIP(address);
  if (kind === 4) {
    const [a, b] = address.split('.').map(Number) as [number, number];
    return a === 0 || a === 10 || a === 127 || (a === 100 && b >= 64 && b <= 127) || (a === 169 && b === 254) || (a === 172 && b >= 16 && b <= 31) || (a === 192 && b === 168) || a >= 224;
  }
  if (kind === 6) {
    const x = address.toLowerCase();
    const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/.exec(x);
    if (mapped) return isPrivateAddress(mapped[1] as string);
    if (x === '::' || x === '::1') return true;
    const first = parseInt(x.split(':')[0] || '0', 16);
    return (first & 0xfe00) === 0xfc00 || (first & 0xffc0) === 0xfe80 || (first & 0xff00) === 0xff00;
  }
  return true;
}

/**
 * A webhook URL as Veilmeter will post to it, or a message saying why not: http(s) only, no
 * credentials in it, and (unless `allowPrivate`) a host whose every address is public.
 */
export async function checkWebhookUrl(raw: string, opts: { allowPrivate: boolean; resolve?: (host: string) => Promise<string[]> }): Promise<{ ok: true; url: URL } | { ok: false; message: string }> {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return { ok: false, message: 'Give a full address such as https://rig-hub.example.test/veilmeter' };
  }
  if (url.protocol !== 'https:' && url.protocol !== 'http:') return { ok: false, message: 'The address must start with https:// (or http://)' };
  if (url.username || url.password) return { ok: false, message: 'Leave user names and passwords out of the address: check the signature header instead' };
  if (opts.allowPrivate) return { ok: true, url };
  const host = url.hostname.replace(/^\[|\]$/g, '');
  let addresses: string[];
  try {
    addresses = isIP(host) ? [host] : await (opts.resolve ?? (async (h) => (await lookup(h, { all: true, verbatim: true })).map((a) => a.address)))(host);
  } catch {
    return { ok: false, message: `${url.hostname} could not be found` };
  }
  if (addresses.length === 0 || addresses.some(isPrivateAddress)) {
    return { ok: false, message: `${url.hostname} is a local or private address; webhooks go to public servers (an admin may allow private ones with WEBHOOKS_ALLOW_PRIVATE=1)` };
  }
  return { ok: true, url };
}
