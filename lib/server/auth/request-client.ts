import 'server-only';
import { headers } from 'next/headers';
import { clientAddress } from '../../security/client-ip';

/** The client's address inside a server action, read as the route handlers read it (lib/security/client-ip.ts). */
export async function actionClientAddress(): Promise<string> {
  return clientAddress(new Request('http://action.invalid/', { headers: new Headers(await headers()) }));
}
