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

/** Files that may import the Knex instance itself: the query modules, migrations, seeds, tools and tests. */
const DB_INSTANCE_ALLOWED = [
  'db/**',
  'scripts/**',
  'bench/**',
  'tests/**',
  // still sending their own SQL, to move into db/queries (both are being changed as this is written)
  'lib/targets/notify.ts',
  'worker/sweeper.ts',
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
    // the measurement engine, the planner's physics, the statistics and the test patterns
    files: ['lib/photometry/**', 'lib/optics/**', 'lib/stats/**', 'lib/patterns/**'],
    rules: { 'no-restricted-imports': ['error', { patterns: [...ENGINE_FORBIDDEN, ...DB_INSTANCE] }] },
  },
];

export default config;
