import { defineConfig } from '@playwright/test';

const port = Number(process.env.PORT ?? 3107);

export default defineConfig({
  testDir: 'tests/e2e',
  timeout: 60_000,
  expect: { timeout: 15_000 },
  fullyParallel: false,
  workers: 1,
  retries: 0,
  reporter: [['list']],
  outputDir: process.env.DATA_DIR ? `${process.env.DATA_DIR}/playwright` : 'test-results',
  use: {
    baseURL: `http://localhost:${port}`,
    launchOptions: {
      executablePath: '/usr/bin/chromium',
      args: ['--no-sandbox', '--headless=new', '--disable-gpu', '--disable-quic', '--no-first-run',
        '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    },
    screenshot: 'only-on-failure',
    trace: 'off',
  },
  webServer: {
    command: `node scripts/web.mjs -p ${port} -H 127.0.0.1`,
    url: `http://127.0.0.1:${port}/api/health`,
    reuseExistingServer: false,
    timeout: 60_000,
    stdout: 'ignore',
    stderr: 'pipe',
  },
});
