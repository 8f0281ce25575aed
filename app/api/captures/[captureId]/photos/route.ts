import { NextResponse } from 'next/server';
import { withAuth } from '@/lib/auth/with-auth';
import { AppError } from '@/lib/errors';
import { photoEncodingSchema } from '@/lib/schemas/capture-set';
import { MAX_UPLOAD_BYTES, photoRoleSchema } from '@/lib/schemas/upload';
import { ingestPhoto } from '@/lib/storage/ingest-photo';
import { captureSetOr404 } from '../../lookup';

type P = { captureId: string };

const tooLarge = (name: string) => new AppError(413, `${name} is larger than 60 MB, the limit a photo: export a JPEG at high quality or a compressed TIFF`, 'too_large');

// The body is the file itself (one request a file, so the browser can report progress per file).
async function readLimited(req: Request, name: string): Promise<Uint8Array> {
  const declared = Number(req.headers.get('content-length') ?? NaN);
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_BYTES) throw tooLarge(name);
  const reader = req.body?.getReader();
  if (!reader) return new Uint8Array(0);
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > MAX_UPLOAD_BYTES) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(name);
    }
    chunks.push(value);
  }
  // fewer bytes than announced: the transfer (or a proxy's body limit) cut the file short
  if (Number.isFinite(declared) && total < declared) {
    throw new AppError(413, `${name} arrived incomplete (${total} of ${declared} bytes): the server's request size limit cut it short. Ask your admin to raise it, or send a smaller file.`, 'incomplete');
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

function fileName(req: Request): string {
  const raw = req.headers.get('x-file-name') ?? '';
  let name = raw;
  try {
    name = decodeURIComponent(raw);
  } catch {
    // keep the raw header text
  }
  // a display name only: it never becomes a storage key or a path
  return name.replace(/[\u0000-\u001f\u007f/\\]/g, '_').trim().slice(0, 200) || 'photo';
}

export const POST = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const role = photoRoleSchema.safeParse(new URL(req.url).searchParams.get('role'));
    if (!role.success) throw new AppError(422, 'Say which photo this is: on, off, ambient or dark', 'invalid', { role: ['Pick a role'] });
    // optional: how this photo's values encode light (linear or srgb); without it the set and the file decide
    const rawEncoding = new URL(req.url).searchParams.get('encoding');
    const encoding = rawEncoding === null || rawEncoding === '' || rawEncoding === 'auto' ? { success: true as const, data: { encoding: null } } : photoEncodingSchema.safeParse({ encoding: rawEncoding });
    if (!encoding.success) throw new AppError(422, 'The encoding is linear, srgb or auto (follow the capture set and the file)', 'invalid', { encoding: ['Pick linear, srgb or auto'] });
    const name = fileName(req);
    const bytes = await readLimited(req, name);
    const { photo, duplicate } = await ingestPhoto({ labId: actor.labId, userId: actor.user.id, captureSetId: set.id, role: role.data, name, bytes, encoding: encoding.data.encoding });
    const { storageKey: _s, previewKey: _p, ...shown } = photo;
    return NextResponse.json({ photo: shown, duplicate }, { status: duplicate ? 200 : 201 });
  },
  { permission: 'capture.write' },
);
