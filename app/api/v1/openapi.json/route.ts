import { openApiDocument } from '@/lib/server/api-v1/openapi';

/** The rig API's OpenAPI 3.1 document: public, so a client can be generated before a token exists. */
export async function GET(): Promise<Response> {
  return new Response(JSON.stringify(openApiDocument()), { status: 200, headers: { 'content-type': 'application/json', 'cache-control': 'public, max-age=300' } });
}
