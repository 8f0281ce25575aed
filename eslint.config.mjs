import nextVitals from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';

// Layout boundaries (DEVELOPERS.md, "Layout"). An import is matched by its text, relative or
// through the `@/` alias; tests/unit/lint/boundaries.test.ts shows each rule failing.
const DB_INSTANCE = [
  {
    regex: '(^|/)db(/index(\\.ts)?)?$',
    message: 'The Knex instance (db/index.ts) is reached through db/queries: add or reuse a query function there.',
  },
];
const ENGINE_FORBIDDEN = [
  { regex: '^((\\.\\./)+|@/)db(/|$)', message: 'Engine modules are pure: no database. Take the values as arguments.' },
  // the project's app/ and components/ folders (lib/photometry/components.ts is the engine's own)
  { regex: '^((\\.\\./){2,}|@/)(app|components)(/|$)', message: 'Engine modules are pure: nothing from the web app (app/, components/).' },
  { regex: '^next(-auth)?(/|$)', message: 'Engine modules are pure: no Next.js or next-auth.' },
];

// lib/ outside lib/server is pure of I/O: no database, sessions, queues, mail or object store. What
// reaches those lives in lib/server (imported by app/, worker/ and scripts/, never by pure lib/).
const PURE_LIB_FORBIDDEN = [
  { regex: '^((\\.\\./)+|@/)db(/|$)', message: 'lib/ outside lib/server does no I/O: no database. Put this in lib/server or take the values as arguments.' },
  { regex: '^((\\.\\./)+|@/lib/)server(/|$)', message: 'lib/ outside lib/server does no I/O: it may not import lib/server. Move the importing module to lib/server, or pass what it needs in.' },
  { regex: '^(next-auth|next/headers|bullmq|ioredis|nodemailer|@aws-sdk/.*)$', message: 'lib/ outside lib/server does no I/O: sessions, queues, mail and the object store are reached from lib/server.' },
];

/** Files that may import the Knex instance itself: the query modules, migrations, seeds, tools and tests. */
const DB_INSTANCE_ALLOWED = [
  'db/**',
  'scripts/**',
  'bench/**',
  'tests/**',
];

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: ['.next/**', '.next-*/**', '.build/**', 'node_modules/**', '.data/**', '.test-data/**', 'test-results/**', 'playwright-report/**', 'next-env.d.ts'],
  },
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['**/*.{ts,tsx,js,mjs}'],
    ignores: DB_INSTANCE_ALLOWED,
    rules: { 'no-restricted-imports': ['error', { patterns: DB_INSTANCE }] },
  },
  {
    files: ['lib/**'],
    ignores: ['lib/server/**', 'lib/photometry/**', 'lib/optics/**', 'lib/stats/**', 'lib/patterns/**'],
    rules: { 'no-restricted-imports': ['error', { patterns: [...PURE_LIB_FORBIDDEN, ...DB_INSTANCE] }] },
  },
  {
    // the measurement engine, the planner's physics, the statistics and the test patterns
    files: ['lib/photometry/**', 'lib/optics/**', 'lib/stats/**', 'lib/patterns/**'],
    rules: { 'no-restricted-imports': ['error', { patterns: [...ENGINE_FORBIDDEN, ...PURE_LIB_FORBIDDEN, ...DB_INSTANCE] }] },
  },
];

export default config;
