// The rig API reference page is rendered by the app from the same route table as the OpenAPI
// document: every route appears with its scope, permission, answers and errors.
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it, vi } from 'vitest';

vi.mock('server-only', () => ({}));
vi.mock('@/lib/server/auth/session', () => ({ requireActor: async () => ({ labId: 'lab', role: 'viewer' }) }));

const { default: ApiReferencePage } = await import('../../../app/(lab)/api-reference/page');
const { V1_ROUTE_LIST } = await import('../../../lib/server/api-v1/routes');
const { routeErrors } = await import('../../../lib/server/api-v1/openapi');

const html = renderToStaticMarkup(await ApiReferencePage());
const section = (id: string): string => {
  const start = html.indexOf(`data-testid="route-${id}"`);
  expect(start, id).toBeGreaterThan(0);
  const end = html.indexOf('</article>', start);
  return html.slice(start, end).replace(/<[^>]+>/g, ' ').replace(/&quot;/g, '"').replace(/&#x27;/g, "'").replace(/&amp;/g, '&');
};

describe('the rig API reference page', () => {
  it('lists every route of the table with its scope, permission, answers and errors', () => {
    for (const r of V1_ROUTE_LIST) {
      const text = section(r.id);
      expect(text, r.id).toContain(r.method);
      expect(text, r.id).toContain(`/api/v1${r.path}`);
      if (r.scope) expect(text, r.id).toContain(r.scope);
      if (r.permission) expect(text, r.id).toContain(r.permission);
      for (const status of Object.keys(r.answers)) expect(text, `${r.id} ${status}`).toContain(status);
      for (const status of Object.keys(routeErrors(r))) expect(text, `${r.id} error ${status}`).toContain(status);
    }
  });

  it('shows request and answer fields from the schemas', () => {
    const create = section('createCaptureSet');
    for (const field of ['revisionId', 'label', 'variant', 'pattern', 'ambientLux', 'captureSet', 'createdAt']) expect(create).toContain(field);
    expect(create).toMatch(/pattern\s*\?\s+one of "full" \| "checkerboard"/);
    expect(create).toContain('Idempotency-Key');
    const trend = section('getTrend');
    expect(trend).toContain('ETag');
    expect(trend).toContain('304');
    expect(section('uploadPhoto')).toMatch(/role\s+one of "on" \| "off" \| "ambient" \| "dark"/);
  });

  it('links the OpenAPI document and loads nothing from elsewhere', () => {
    expect(html).toContain('href="/api/v1/openapi.json"');
    expect(html).not.toMatch(/(src|href)="https?:/);
  });
});
