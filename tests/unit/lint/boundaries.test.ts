// The layout's import boundaries (eslint.config.mjs), shown on source text linted under made-up
// paths: the engine folders import nothing from the database, the web app or Next; lib/ outside
// lib/server does no I/O; and only the query modules, migrations, seeds, tools and tests reach the
// Knex instance (db/index.ts).
import { join } from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..', '..');
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: root });
});

/** The messages of the boundary rule for `code` as if it were the file at `path`. */
async function boundaryErrors(path: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: join(root, path) });
  return (result?.messages ?? []).filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

const use = (spec: string) => `import * as m from '${spec}';\nexport const used = m;\n`;

describe('import boundaries', () => {
  const engine: [string, string, RegExp][] = [
    ['lib/photometry/fake-metric.ts', '../../db/index', /no database/],
    ['lib/photometry/fake-metric.ts', '@/db/queries/readings', /no database/],
    ['lib/optics/fake-model.ts', '../../db/queries/stacks', /no database/],
    ['lib/stats/fake-test.ts', '../../app/api/health/route', /web app/],
    ['lib/patterns/fake-pattern.ts', '@/components/ui/button', /web app/],
    ['lib/photometry/fake-metric.ts', 'next/server', /Next\.js/],
    ['lib/stats/fake-test.ts', 'next-auth', /Next\.js/],
    ['lib/optics/fake-model.ts', 'next', /Next\.js/],
  ];
  it.each(engine)('%s may not import %s', async (path, spec, message) => {
    const errors = await boundaryErrors(path, use(spec));
    // db/index breaks both rules, so it may get two messages
    expect(errors.length).toBeGreaterThanOrEqual(1);
    expect(errors.join('\n')).toMatch(message);
  });

  it('lets engine modules import each other and their own files', async () => {
    expect(await boundaryErrors('lib/photometry/fake-metric.ts', use('./components'))).toEqual([]);
    expect(await boundaryErrors('lib/photometry/fake-metric.ts', use('../stats/welch'))).toEqual([]);
    expect(await boundaryErrors('lib/optics/fake-model.ts', use('fft.js'))).toEqual([]);
  });

  const pureLib: [string, string, RegExp][] = [
    ['lib/format/fake.ts', '../server/auth/session', /may not import lib\/server/],
    ['lib/targets/fake.ts', '@/lib/server/queue/producer', /may not import lib\/server/],
    ['lib/photometry/fake-metric.ts', '../server/storage', /may not import lib\/server/],
    ['lib/auth/fake.ts', '@/db/queries/users', /no database/],
    ['lib/reports/fake.ts', '../../db/queries/exports', /no database/],
    ['lib/schemas/fake.ts', 'bullmq', /queues, mail/],
    ['lib/security/fake.ts', 'ioredis', /queues, mail/],
    ['lib/image/fake.ts', 'next-auth', /queues, mail/],
    ['lib/webhooks/fake.ts', '@aws-sdk/client-s3', /queues, mail/],
  ];
  it.each(pureLib)('pure %s may not import %s', async (path, spec, message) => {
    const errors = await boundaryErrors(path, use(spec));
    expect(errors.length).toBeGreaterThanOrEqual(1);
    expect(errors.join('\n')).toMatch(message);
  });

  it('lets lib/server, the web app and the worker reach queries, queues and lib/server', async () => {
    expect(await boundaryErrors('lib/server/fake.ts', use('../../db/queries/users'))).toEqual([]);
    expect(await boundaryErrors('lib/server/fake.ts', use('bullmq'))).toEqual([]);
    expect(await boundaryErrors('lib/server/fake.ts', use('../format'))).toEqual([]);
    expect(await boundaryErrors('app/api/fake/route.ts', use('@/lib/server/auth/session'))).toEqual([]);
    expect(await boundaryErrors('worker/fake.ts', use('../lib/server/queue/jobs'))).toEqual([]);
    expect(await boundaryErrors('lib/format/fake.ts', use('./numbers'))).toEqual([]);
  });

  it('keeps the Knex instance to the query modules, migrations, seeds, tools and tests', async () => {
    for (const path of ['lib/server/auth/fake.ts', 'app/api/fake/route.ts', 'worker/fake.ts', 'components/fake.tsx']) {
      for (const spec of ['@/db/index', '@/db', path.startsWith('lib/server/') ? '../../../db/index' : path.startsWith('lib/') ? '../../db/index' : '../db/index']) {
        const errors = await boundaryErrors(path, use(spec));
        expect(errors, `${path} → ${spec}`).toHaveLength(1);
        expect(errors[0]).toMatch(/db\/queries/);
      }
    }
    for (const [path, spec] of [
      ['db/queries/fake.ts', '../index'],
      ['db/migrations/20991231000000_fake.ts', '../index'],
      ['db/seeds/fake.ts', '../index'],
      ['scripts/fake.ts', '../db/index'],
      ['tests/integration/fake.test.ts', '../../db/index'],
      ['lib/server/auth/fake.ts', '@/db/queries/users'],
      ['app/api/fake/route.ts', '@/db/queries/projects'],
    ] as const) {
      expect(await boundaryErrors(path, use(spec)), `${path} → ${spec}`).toEqual([]);
    }
  });
});
