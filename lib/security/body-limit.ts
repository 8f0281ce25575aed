import { AppError } from '../errors';

/** The largest JSON body any route takes: the longest form (a capture set with 4000 characters of notes) is far below. */
export const JSON_BODY_LIMIT = 64 * 1024;

function tooLarge(maxBytes: number, what: string): AppError {
  return new AppError(413, `${what} is larger than ${formatBytes(maxBytes)}, the limit for this request`, 'too_large');
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;
  if (n >= 1024) return `${Math.round(n / 1024)} KB`;
  return `${n} bytes`;
}

/**
 * Reads a request body counting its bytes as they arrive, and stops with 413 as soon as it passes
 * `maxBytes`: a declared Content-Length over the limit is refused before reading, and a chunked
 * body without one is cut off at the limit instead of being buffered whole.
 */
export async function readBodyLimited(req: Request, maxBytes: number, what = 'The request body'): Promise<Uint8Array> {
  const declared = Number(req.headers.get('content-length') ?? NaN);
  if (Number.isFinite(declared) && declared > maxBytes) {
    await req.body?.cancel().catch(() => undefined);
    throw tooLarge(maxBytes, what);
  }
  const reader = req.body?.getReader();
  if (!reader) return new Uint8Array(0);
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(maxBytes, what);
    }
    chunks.push(value);
  }
  if (chunks.length === 1) return chunks[0] as Uint8Array;
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** Reads a JSON body of at most `maxBytes`; too large is 413, malformed JSON is the caller's mistake (422). */
export async function readJsonLimited(req: Request, maxBytes = JSON_BODY_LIMIT): Promise<unknown> {
  return parseJsonBody(await readBodyLimited(req, maxBytes));
}

/** Parses a body read as bytes: not UTF-8 or not JSON is the caller's mistake (422). */
export function parseJsonBody(bytes: Uint8Array): unknown {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new AppError(422, 'The request body is not valid UTF-8 text', 'invalid_json');
  }
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new AppError(422, 'The request body is not valid JSON', 'invalid_json');
  }
}

/**
 * Reads a multipart or url-encoded form of at most `maxBytes`, counted while it streams in, then
 * parses it. Only the counted bytes are ever held.
 */
export async function readFormLimited(req: Request, maxBytes: number, what = 'The form'): Promise<FormData> {
  const bytes = await readBodyLimited(req, maxBytes, what);
  const type = req.headers.get('content-type') ?? '';
  try {
    return await new Response(bytes as BodyInit, { headers: { 'content-type': type } }).formData();
  } catch {
    throw new AppError(422, 'Send the form as multipart/form-data', 'invalid');
  }
}
