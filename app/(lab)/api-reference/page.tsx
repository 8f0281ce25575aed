import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { RAW_LIST } from '@/lib/image/raw-formats';
import { openApiDocument, routeErrors } from '@/lib/server/api-v1/openapi';
import { IDEMPOTENCY_TTL_HOURS, SCOPE_LABELS, TOKEN_SCOPES, V1_ROUTE_LIST, pathParams, type V1Route } from '@/lib/server/api-v1/routes';
import { requireActor } from '@/lib/server/auth/session';

export const metadata = { title: 'Rig API reference' };

type Schema = {
  type?: string | string[];
  format?: string;
  enum?: unknown[];
  const?: unknown;
  properties?: Record<string, Schema>;
  required?: string[];
  items?: Schema;
  prefixItems?: Schema[];
  anyOf?: Schema[];
  oneOf?: Schema[];
  additionalProperties?: Schema | boolean;
  description?: string;
  default?: unknown;
  minimum?: number;
  maximum?: number;
  minLength?: number;
  maxLength?: number;
  maxItems?: number;
  $ref?: string;
};

const SAFE_INT = 9007199254740991;

/** A one-line type: "string (uuid)", "one of full | checkerboard", "number or null", "[integer, number]". */
function typeText(s: Schema): string {
  if (s.enum) return `one of ${s.enum.map((v) => JSON.stringify(v)).join(' | ')}`;
  if (s.const !== undefined) return JSON.stringify(s.const);
  const alts = s.anyOf ?? s.oneOf;
  if (alts) return alts.map(typeText).join(' or ');
  if (s.prefixItems) return `[${s.prefixItems.map(typeText).join(', ')}]`;
  const types = Array.isArray(s.type) ? s.type : s.type ? [s.type] : [];
  if (types.length === 0) return 'any';
  return types
    .map((t) => {
      if (t === 'array') return `array of ${s.items ? typeText(s.items) : 'any'}`;
      if (t === 'string' && s.format) return `string (${s.format})`;
      return t;
    })
    .join(' or ');
}

function limits(s: Schema): string {
  const out: string[] = [];
  if (s.minimum !== undefined && s.minimum !== 0) out.push(`≥ ${s.minimum}`);
  if (s.maximum !== undefined && s.maximum < SAFE_INT) out.push(`≤ ${s.maximum}`);
  if (s.minLength) out.push(s.minLength === 1 ? 'not empty' : `at least ${s.minLength} characters`);
  if (s.maxLength) out.push(`at most ${s.maxLength} characters`);
  if (s.maxItems) out.push(`at most ${s.maxItems} items`);
  if (s.default !== undefined) out.push(`default ${JSON.stringify(s.default)}`);
  return out.join(', ');
}

function objectOf(s: Schema): Schema | null {
  if (s.properties) return s;
  if (s.items && (s.items.properties || s.items.items)) return objectOf(s.items);
  const alts = s.anyOf ?? s.oneOf;
  return alts?.map(objectOf).find((x) => x !== null) ?? null;
}

/** An object's fields, nested objects indented below their field. */
function Fields({ schema, depth = 0 }: { schema: Schema; depth?: number }) {
  const obj = objectOf(schema);
  if (!obj?.properties) return <p className="font-mono text-xs text-muted">{typeText(schema)}</p>;
  const required = new Set(obj.required ?? []);
  return (
    <ul className={depth ? 'ml-4 border-l border-line pl-3' : ''}>
      {Object.entries(obj.properties).map(([name, f]) => {
        const nested = objectOf(f);
        const note = [limits(f), f.description].filter(Boolean).join(' · ');
        return (
          <li key={name} className="py-0.5 text-xs">
            <code className="font-mono text-ink">{name}</code>
            {required.has(name) ? null : <span className="text-muted">?</span>} <span className="font-mono text-muted">{nested ? (f.type === 'array' || f.items ? 'array of objects' : 'object') : typeText(f)}</span>
            {note ? <span className="text-muted"> — {note}</span> : null}
            {obj.additionalProperties && typeof obj.additionalProperties === 'object' && depth === 0 && name === Object.keys(obj.properties!).at(-1) ? <span className="text-muted"> (further fields may follow)</span> : null}
            {nested && depth < 4 ? <Fields schema={f} depth={depth + 1} /> : null}
          </li>
        );
      })}
    </ul>
  );
}

const schemaNamed = (name: string): Schema => ((openApiDocument().components as { schemas: Record<string, Schema> }).schemas[name] ?? {}) as Schema;

const METHOD_TONE: Record<string, string> = { GET: 'text-glow', POST: 'text-pass', PUT: 'text-warn', PATCH: 'text-warn', DELETE: 'text-fail' };

function Route({ r }: { r: V1Route & { id: string } }) {
  const query = r.query ? (openApiQuery(r) ?? []) : [];
  return (
    <article id={r.id} className="space-y-3 border-b border-line py-5 last:border-b-0" data-testid={`route-${r.id}`}>
      <header>
        <h3 className="font-mono text-sm">
          <span className={`font-semibold ${METHOD_TONE[r.method] ?? ''}`}>{r.method}</span> /api/v1{r.path}
        </h3>
        <p className="text-sm text-ink">{r.summary}</p>
        {r.description ? <p className="text-sm text-muted">{r.description}</p> : null}
      </header>
      <dl className="grid grid-cols-[10rem_1fr] gap-x-3 gap-y-1 text-xs">
        <dt className="text-muted">Token scope</dt>
        <dd>{r.scope ? <code className="font-mono">{r.scope}</code> : 'none: public'}</dd>
        <dt className="text-muted">Role permission</dt>
        <dd>{r.permission ? <code className="font-mono">{r.permission}</code> : 'none'}</dd>
        {pathParams(r).length ? (
          <>
            <dt className="text-muted">Path</dt>
            <dd>{pathParams(r).map((p) => <code key={p} className="mr-2 font-mono">{`{${p}}`}: uuid</code>)}</dd>
          </>
        ) : null}
        {query.length ? (
          <>
            <dt className="text-muted">Query</dt>
            <dd>
              {query.map((q) => (
                <div key={q.name}>
                  <code className="font-mono">{q.name}</code>
                  {q.required ? '' : '?'} <span className="font-mono text-muted">{typeText(q.schema)}</span>
                  {limits(q.schema) || q.schema.description ? <span className="text-muted"> — {[limits(q.schema), q.schema.description].filter(Boolean).join(' · ')}</span> : null}
                </div>
              ))}
            </dd>
          </>
        ) : null}
        {r.idempotent ? (
          <>
            <dt className="text-muted">Idempotency-Key</dt>
            <dd>accepted: a retry with the same key and body answers the first success again</dd>
          </>
        ) : null}
        {r.conditional ? (
          <>
            <dt className="text-muted">ETag</dt>
            <dd>sent; If-None-Match with it answers 304 while the project’s data is unchanged</dd>
          </>
        ) : null}
      </dl>
      {r.body ? (
        <section>
          <h4 className="text-xs font-semibold uppercase tracking-wide text-muted">Request body</h4>
          {r.body.kind === 'json' ? <Fields schema={schemaNamed(r.body.name)} /> : <p className="text-xs">{r.body.description}: the file’s bytes (JPEG, PNG, TIFF, WebP or camera raw: {RAW_LIST})</p>}
        </section>
      ) : null}
      <section>
        <h4 className="text-xs font-semibold uppercase tracking-wide text-muted">Answers</h4>
        {Object.entries(r.answers).map(([status, a]) => (
          <div key={status} className="mt-1">
            <p className="text-xs">
              <span className="font-mono text-pass">{status}</span> {a.description}
              {'csv' in a ? <span className="text-muted"> (text/csv)</span> : null}
            </p>
            {'json' in a ? <Fields schema={schemaNamed(a.name)} /> : null}
          </div>
        ))}
        {r.conditional ? (
          <p className="mt-1 text-xs">
            <span className="font-mono text-pass">304</span> Not modified
          </p>
        ) : null}
      </section>
      <section>
        <h4 className="text-xs font-semibold uppercase tracking-wide text-muted">Errors</h4>
        <ul className="text-xs">
          {Object.entries(routeErrors(r)).map(([status, text]) => (
            <li key={status}>
              <span className="font-mono text-fail">{status}</span> {text}
            </li>
          ))}
        </ul>
      </section>
    </article>
  );
}

function openApiQuery(r: V1Route & { id: string }): { name: string; required: boolean; schema: Schema }[] | null {
  const op = (openApiDocument().paths as Record<string, Record<string, { parameters?: { name: string; in: string; required: boolean; schema: Schema }[] }>>)[r.path]?.[r.method.toLowerCase()];
  return op?.parameters?.filter((p) => p.in === 'query') ?? null;
}

export default async function ApiReferencePage() {
  await requireActor();
  const tags = [...new Set(V1_ROUTE_LIST.map((r) => r.tag))];
  return (
    <div className="space-y-6">
      <PageTitle kicker="Capture rigs and lab scripts" title="Rig API reference" />
      <Panel title="Using it">
        <div className="space-y-2 text-sm">
          <p>
            Every route lives under <code className="font-mono">/api/v1</code>. Send a lab API token (Settings → API tokens) as <code className="font-mono">Authorization: Bearer vmk_…</code>; it acts as
            its owner with their role in the lab, limited to its scopes. The same description as an OpenAPI 3.1 document, for generating a client:{' '}
            <a className="text-glow underline" href="/api/v1/openapi.json">
              /api/v1/openapi.json
            </a>{' '}
            (no token needed).
          </p>
          <p>
            <strong>Safe retries.</strong> Every write takes an <code className="font-mono">Idempotency-Key</code> header (1–255 visible ASCII characters). The same key with the same request and body
            answers the first success again for {IDEMPOTENCY_TTL_HOURS} hours (marked <code className="font-mono">Idempotent-Replayed: true</code>) without doing it twice; with another body it answers
            422; while the first is still running, 409 with Retry-After. Error answers are not kept: fix the cause and send the same key again.
          </p>
          <p>
            <strong>Conditional reads.</strong> Project reads (trend, readings, CSV) send an <code className="font-mono">ETag</code>; send it back as <code className="font-mono">If-None-Match</code> to get
            304 while nothing in the project changed.
          </p>
          <p>
            <strong>Errors</strong> answer <code className="font-mono">{'{ "error": { "code", "message", "fieldErrors"? } }'}</code>. Ids of other labs, unknown ids and malformed ids all answer 404.
          </p>
          <p>
            From a shell, <code className="font-mono">npx veilmeter push --server URL --revision ID --on on.jpg --off off.jpg --wait</code> does a whole capture (see{' '}
            <code className="font-mono">npx veilmeter push --help</code>).
          </p>
        </div>
        <h3 className="mt-4 text-xs font-semibold uppercase tracking-wide text-muted">Token scopes</h3>
        <ul className="text-xs">
          {TOKEN_SCOPES.map((s) => (
            <li key={s}>
              <code className="font-mono">{s}</code> — {SCOPE_LABELS[s]}
            </li>
          ))}
        </ul>
      </Panel>
      {tags.length === 0 ? <EmptyState title="No routes" /> : null}
      {tags.map((tag) => (
        <Panel key={tag} title={tag}>
          {V1_ROUTE_LIST.filter((r) => r.tag === tag).map((r) => (
            <Route key={r.id} r={r} />
          ))}
        </Panel>
      ))}
    </div>
  );
}
