// `veilmeter push`: sends one capture to a Veilmeter server through the rig API (/api/v1) with a
// lab API token: creates the capture set, uploads the photos with a progress line, applies a
// region template, starts the analysis and (with --wait) prints the reading. Every write carries an
// Idempotency-Key derived from the inputs (the files' SHA-256, the revision, the variant, the
// label and the template), so running the same command again after a broken connection resumes
// where it stopped instead of making a second capture set.
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { request as httpRequest } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import { CommandFailed, UsageError, type Command } from './command';

const ROLES = ['on', 'off', 'ambient', 'dark'] as const;
type Role = (typeof ROLES)[number];
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Exit statuses of push (beyond 0 done and 2 bad input). */
export const PUSH_EXIT = { connection: 1, refused: 3, analysisFailed: 4 } as const;

type Reply = { status: number; json: Record<string, unknown> | null; text: string; headers: Record<string, string> };

type Conn = { api: string; token: string; progress: NodeJS.WritableStream };

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function refused(what: string, r: Reply): CommandFailed {
  const err = (r.json?.error ?? null) as { message?: string; fieldErrors?: Record<string, string[]> } | null;
  const fields = err?.fieldErrors ? ` (${Object.entries(err.fieldErrors).map(([k, v]) => `${k}: ${v.join(', ')}`).join('; ')})` : '';
  const message = err?.message ?? (r.text.trim().slice(0, 200) || 'no explanation');
  return new CommandFailed(`the server refused to ${what}: ${r.status} ${message}${fields}`, PUSH_EXIT.refused);
}

/** One HTTP request; the body is written in pieces so `onProgress` can follow an upload. */
function send(conn: Conn, method: string, path: string, o: { body?: Uint8Array; headers?: Record<string, string>; onProgress?: (sent: number, total: number) => void } = {}): Promise<Reply> {
  const url = new URL(`${conn.api}${path}`);
  const request = url.protocol === 'https:' ? httpsRequest : httpRequest;
  const headers: Record<string, string> = { authorization: `Bearer ${conn.token}`, accept: 'application/json', ...(o.headers ?? {}) };
  if (o.body) headers['content-length'] = String(o.body.byteLength);
  return new Promise((resolve, reject) => {
    const req = request(url, { method, headers, timeout: 120_000 }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('error', reject);
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        let json: Record<string, unknown> | null = null;
        try {
          json = text ? (JSON.parse(text) as Record<string, unknown>) : null;
        } catch {
          json = null;
        }
        const h: Record<string, string> = {};
        for (const [k, v] of Object.entries(res.headers)) if (typeof v === 'string') h[k] = v;
        resolve({ status: res.statusCode ?? 0, json, text, headers: h });
      });
    });
    req.on('timeout', () => req.destroy(new Error('no answer for 120 s')));
    req.on('error', reject);
    if (!o.body) {
      req.end();
      return;
    }
    const body = o.body;
    const piece = 256 * 1024;
    let at = 0;
    const pump = () => {
      while (at < body.byteLength) {
        const end = Math.min(body.byteLength, at + piece);
        const ok = req.write(body.subarray(at, end));
        at = end;
        o.onProgress?.(at, body.byteLength);
        if (!ok) {
          req.once('drain', pump);
          return;
        }
      }
      req.end();
    };
    pump();
  });
}

/** A request that waits out "busy" (the same key still running) and rate limits, then answers. */
async function call(conn: Conn, what: string, method: string, path: string, o: Parameters<typeof send>[3] = {}, ok: number[] = [200, 201, 202]): Promise<Reply> {
  for (let attempt = 0; ; attempt++) {
    let r: Reply;
    try {
      r = await send(conn, method, path, o);
    } catch (e) {
      throw new CommandFailed(`the connection to ${new URL(conn.api).host} failed while trying to ${what} (${e instanceof Error ? e.message : String(e)}): run the same command again to resume`, PUSH_EXIT.connection);
    }
    if (ok.includes(r.status)) return r;
    const busy = r.status === 409 && (r.json?.error as { code?: string } | undefined)?.code === 'idempotency_busy';
    if ((busy || r.status === 429) && attempt < 60) {
      await sleep(Math.min(30, Math.max(1, Number(r.headers['retry-after'] ?? 1))) * 1000);
      continue;
    }
    throw refused(what, r);
  }
}

const mb = (n: number) => `${(n / 1048576).toFixed(1)} MB`;

function progressLine(out: NodeJS.WritableStream, label: string): (sent: number, total: number) => void {
  const tty = (out as NodeJS.WriteStream).isTTY === true;
  let shown = -1;
  return (sent, total) => {
    const pct = total ? Math.floor((100 * sent) / total) : 100;
    if (tty) {
      out.write(`\r${label}  ${String(pct).padStart(3)}%  ${mb(sent)} of ${mb(total)}`);
      if (sent >= total) out.write('\n');
    } else if (pct >= shown + 25 || sent >= total) {
      // without a terminal: a line at each quarter, so a log shows how far it got
      shown = pct - (pct % 25);
      out.write(`${label}  ${String(pct).padStart(3)}%  ${mb(sent)} of ${mb(total)}\n`);
    }
  };
}

function fmt(v: unknown, digits = 4): string {
  if (typeof v !== 'number' || !Number.isFinite(v)) return '—';
  return Math.abs(v) >= 1000 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : v.toFixed(digits);
}

function readingTable(captureSetId: string, analysisId: string, reading: Record<string, unknown>): string {
  const r = (reading.result ?? {}) as Record<string, unknown>;
  const ghost = r.ghost as { ratio?: number; dx?: number; dy?: number } | null | undefined;
  const rows: [string, string][] = [
    ['capture set', captureSetId],
    ['analysis', analysisId],
    ['engine', String(r.engineVersion ?? '—')],
    ['ambient contrast ratio', fmt(reading.ambientContrastRatio, 3)],
    ['Michelson', fmt(r.michelson)],
    ['uniformity (min/max)', fmt(r.uniformity, 3)],
    ['ghost ratio', ghost && typeof ghost.ratio === 'number' ? `${(100 * ghost.ratio).toFixed(2)}% at ${ghost.dx},${ghost.dy} px` : 'none found'],
    ['transmission', typeof r.transmission === 'number' ? `${(100 * r.transmission).toFixed(1)}%` : '—'],
  ];
  const width = Math.max(...rows.map(([k]) => k.length));
  const lines = rows.map(([k, v]) => `${k.padEnd(width)}  ${v}`);
  for (const w of (r.warnings ?? []) as { code: string; message: string }[]) lines.push(`warning ${w.code}: ${w.message}`);
  return lines.join('\n');
}

/** The idempotency keys of one push: the same inputs give the same keys. */
export function pushKeys(input: { revision: string; variant: string; label: string; template: string | null; files: Partial<Record<Role, string>> }): { create: string; upload: (role: Role) => string; template: string; analyse: string } {
  const files = ROLES.filter((r) => input.files[r]).map((r) => `${r}=${input.files[r]}`);
  const base = createHash('sha256').update(JSON.stringify([input.revision.toLowerCase(), input.variant, input.label, input.template, files])).digest('hex').slice(0, 40);
  return { create: `push-${base}-create`, upload: (role) => `push-${base}-upload-${role}`, template: `push-${base}-template`, analyse: `push-${base}-analyse` };
}

async function run(args: string[], out: NodeJS.WritableStream): Promise<void> {
  let values: Record<string, string | boolean | undefined>;
  try {
    ({ values } = parseArgs({
      args,
      options: {
        server: { type: 'string' },
        token: { type: 'string' },
        revision: { type: 'string' },
        on: { type: 'string' },
        off: { type: 'string' },
        ambient: { type: 'string' },
        dark: { type: 'string' },
        template: { type: 'string' },
        variant: { type: 'string', default: '' },
        label: { type: 'string' },
        wait: { type: 'boolean', default: false },
        timeout: { type: 'string', default: '900' },
        json: { type: 'boolean', default: false },
      },
      strict: true,
      allowPositionals: false,
    }));
  } catch (e) {
    throw new UsageError(`${e instanceof Error ? e.message : String(e)} (see veilmeter push --help)`);
  }
  const server = typeof values.server === 'string' ? values.server : process.env.VEILMETER_SERVER;
  if (!server) throw new UsageError('give the server: --server https://veilmeter.example.test');
  let base: URL;
  try {
    base = new URL(server);
  } catch {
    throw new UsageError(`--server "${server}" is not a URL: give it as https://host[:port]`);
  }
  if (base.protocol !== 'http:' && base.protocol !== 'https:') throw new UsageError(`--server must be an http or https URL, not ${base.protocol}`);
  const token = (typeof values.token === 'string' ? values.token : process.env.VEILMETER_TOKEN ?? '').trim();
  if (!token) throw new UsageError('give an API token: --token vmk_… or the VEILMETER_TOKEN environment variable (make one in Settings → API tokens)');
  if (!/^vmk_[A-Za-z0-9_-]{10,200}$/.test(token)) throw new UsageError('the API token should look like vmk_… (copy it whole from Settings → API tokens)');
  const revision = typeof values.revision === 'string' ? values.revision.trim() : '';
  if (!UUID.test(revision)) throw new UsageError(revision ? `--revision "${revision}" is not a revision id (a UUID: see GET /api/v1/projects)` : 'give the revision: --revision ID (GET /api/v1/projects lists them)');
  if (typeof values.on !== 'string' || typeof values.off !== 'string') throw new UsageError('give at least the on and off photos: --on FILE --off FILE');
  const timeoutS = Number(values.timeout);
  if (!Number.isFinite(timeoutS) || timeoutS <= 0) throw new UsageError(`--timeout needs a number of seconds, got "${String(values.timeout)}"`);

  const files: Partial<Record<Role, { path: string; bytes: Uint8Array; sha256: string }>> = {};
  for (const role of ROLES) {
    const path = values[role];
    if (typeof path !== 'string') continue;
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await readFile(path));
    } catch (e) {
      throw new UsageError(`cannot read the ${role} photo ${path}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : e instanceof Error ? e.message : String(e)}`);
    }
    if (bytes.byteLength === 0) throw new UsageError(`the ${role} photo ${path} is empty`);
    if (bytes.byteLength > 60 * 1024 * 1024) throw new UsageError(`the ${role} photo ${path} is ${mb(bytes.byteLength)}; the limit is 60 MB a photo`);
    files[role] = { path, bytes, sha256: createHash('sha256').update(bytes).digest('hex') };
  }
  const variant = String(values.variant ?? '');
  const label = typeof values.label === 'string' && values.label.trim() ? values.label.trim() : basename(files.on!.path).replace(/\.[A-Za-z0-9]+$/, '');
  const templateName = typeof values.template === 'string' && values.template.trim() ? values.template.trim() : null;
  const keys = pushKeys({ revision, variant, label, template: templateName, files: Object.fromEntries(Object.entries(files).map(([r, f]) => [r, f.sha256])) });
  const conn: Conn = { api: `${base.origin}${base.pathname.replace(/\/+$/, '')}/api/v1`, token, progress: process.stderr };
  const json = { 'content-type': 'application/json' };

  const created = await call(conn, 'create the capture set', 'POST', '/captures', { body: Buffer.from(JSON.stringify({ revisionId: revision, label, variant })), headers: { ...json, 'idempotency-key': keys.create } });
  const captureSetId = (created.json?.captureSet as { id: string }).id;
  if (!values.json) conn.progress.write(`capture set ${captureSetId}${created.headers['idempotent-replayed'] ? ' (made by an earlier run of this command)' : ''}\n`);

  for (const role of ROLES) {
    const f = files[role];
    if (!f) continue;
    const name = basename(f.path);
    await call(conn, `upload the ${role} photo ${name}`, 'POST', `/captures/${captureSetId}/photos?role=${role}`, {
      body: f.bytes,
      headers: { 'content-type': 'application/octet-stream', 'x-file-name': encodeURIComponent(name), 'idempotency-key': keys.upload(role) },
      onProgress: progressLine(conn.progress, `uploading ${role.padEnd(7)} ${name}`),
    });
  }

  if (templateName) {
    const listed = await call(conn, 'list the region templates', 'GET', `/captures/${captureSetId}/templates`);
    const templates = (listed.json?.templates ?? []) as { id: string; name: string }[];
    const t = templates.find((x) => x.name === templateName) ?? templates.find((x) => x.name.toLowerCase() === templateName.toLowerCase());
    if (!t) throw new UsageError(`the project has no region template "${templateName}"${templates.length ? ` (it has: ${templates.map((x) => x.name).join(', ')})` : ' (it has none)'}`);
    await call(conn, `apply the template ${t.name}`, 'POST', `/captures/${captureSetId}/templates/apply`, { body: Buffer.from(JSON.stringify({ templateId: t.id })), headers: { ...json, 'idempotency-key': keys.template } });
  }

  const started = await call(conn, 'start the analysis', 'POST', `/captures/${captureSetId}/analyses`, { headers: { 'idempotency-key': keys.analyse } }, [202]);
  const analysisId = (started.json?.analysis as { id: string }).id;
  if (!values.wait) {
    out.write(values.json ? `${JSON.stringify({ captureSetId, analysisId, status: 'queued', reading: null })}\n` : `analysis ${analysisId} queued for capture set ${captureSetId}\n`);
    return;
  }

  const t0 = Date.now();
  let lastStage = '';
  for (;;) {
    const polled = await call(conn, 'check the analysis', 'GET', `/analyses/${analysisId}`);
    const analysis = polled.json?.analysis as { status: string; stageLabel: string; progress: number; error: string | null };
    const reading = polled.json?.reading as Record<string, unknown> | null;
    if (analysis.status === 'failed') {
      if (values.json) out.write(`${JSON.stringify({ captureSetId, analysisId, status: 'failed', error: analysis.error, reading: null })}\n`);
      throw new CommandFailed(`the analysis failed: ${analysis.error ?? 'no reason given'}`, PUSH_EXIT.analysisFailed);
    }
    if (analysis.status === 'done' && reading) {
      out.write(values.json ? `${JSON.stringify({ captureSetId, analysisId, status: 'done', reading })}\n` : `${readingTable(captureSetId, analysisId, reading)}\n`);
      return;
    }
    if (!values.json && analysis.stageLabel !== lastStage) {
      lastStage = analysis.stageLabel;
      conn.progress.write(`analysis: ${lastStage}\n`);
    }
    if (Date.now() - t0 > timeoutS * 1000) throw new CommandFailed(`the analysis is still ${analysis.status} after ${timeoutS} s: run the same command again later to pick it up`, PUSH_EXIT.connection);
    await sleep(1000);
  }
}

const help = `Usage: veilmeter push --server URL --token TOKEN --revision ID --on FILE --off FILE [options]

Sends one capture to a Veilmeter server through its rig API (/api/v1): creates a capture set in the
revision, uploads the photos (with a progress line on stderr), applies a region template, starts the
analysis and, with --wait, waits for it and prints the reading.

Running the same command again is safe: every step carries an Idempotency-Key made from the inputs
(the photos' SHA-256, the revision, the variant, the label and the template), so after a broken
connection a rerun resumes where it stopped and never makes a second capture set. The server keeps
these keys for 24 hours; to measure the same files again on purpose, change --label or --variant.

Where:
  --server URL            the Veilmeter server, e.g. https://veilmeter.example.test
                          (or the VEILMETER_SERVER environment variable)
  --token TOKEN           a lab API token, vmk_… (or VEILMETER_TOKEN): scopes read and capture:write
  --revision ID           the revision's id (GET /api/v1/projects lists projects and revisions)

Photos (JPEG, PNG, TIFF, WebP or camera raw — DNG, CR2, CR3, NEF, ARW, RAF, ORF, RW2, PEF, SRW —
at most 60 MB each; the same camera settings for all):
  --on FILE               display on, showing the test pattern (required)
  --off FILE              the same view with the display dark (required)
  --ambient FILE          the same scene with the optics out of the path
  --dark FILE             display on, room dark

The capture set:
  --label TEXT            its label (default: the on photo's file name without extension)
  --variant TEXT          the variant measured, e.g. "left eye" (default: none)
  --template NAME         place the project's region template NAME (default: the screen is detected)

Output:
  --wait                  wait for the analysis and print the reading (default: print the ids and return)
  --timeout SECONDS       how long --wait waits (default 900)
  --json                  one JSON object on stdout: { captureSetId, analysisId, status, reading }
  -h, --help              this text

Exit status:
  0  done (with --wait: the reading is printed)
  1  the connection failed, or --wait ran out of time: run the same command again to resume
  2  bad arguments or input: a missing or unreadable file, no token, an unknown template name
  3  the server refused: a bad or revoked token, a missing scope, an unknown revision, a photo it
     cannot measure; the server's message is printed
  4  the analysis failed; its reason is printed

Example:
  export VEILMETER_TOKEN=vmk_…
  npx veilmeter push --server https://veilmeter.example.test --revision 6f1c…e2 \\
    --on on.jpg --off off.jpg --ambient ambient.jpg --template "Bench jig A" --variant "left eye" --wait`;

export const pushCommand: Command = {
  summary: 'upload a capture to a Veilmeter server, analyse it and print the reading',
  help,
  run,
};
