// Playwright: end-to-end tests against the built app and the local fakes (scripts/e2e-server.ts),
// in Debian's Chromium, on a phone-sized viewport unless a test says otherwise.
import { defineConfig } from '@playwright/test';

// Same offset as scripts/e2e-server.ts: lets two e2e runs share one machine.
const offset = Number(process.env.E2E_PORT_OFFSET ?? 0);

export default defineConfig({
  testDir: '.',
  outputDir: '../../test-results',
  timeout: 60_000,
  expect: { timeout: 10_000 },
  fullyParallel: false,
  workers: 1,
  // One retry on CI only: a shared, loaded machine can stall a page; a retried pass is reported as flaky.
  retries: process.env.CI ? 1 : 0,
  reporter: [['list']],
  use: {
    baseURL: `http://localhost:${3100 + offset}`,
    viewport: { width: 390, height: 844 },
    screenshot: 'only-on-failure',
    trace: 'off',
    launchOptions: {
      executablePath: '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-dev-shm-usage', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
    },
  },
  webServer: {
    command: 'npx tsx scripts/e2e-server.ts',
    cwd: '../..',
    url: `http://127.0.0.1:${3100 + offset}/api/v1/health`,
    reuseExistingServer: !process.env.CI,
    timeout: 180_000,
    stdout: 'pipe',
    stderr: 'pipe',
  },
});
