// Browser tests (tests/browser) in Debian's Chromium against `next start`, which `npm test`
// starts on WHORLWIND_BASE_URL together with the services the tests read (the mail sink,
// PostgreSQL). Run them through `npm test` or `npm test -- browser`.
import { defineConfig } from '@playwright/test';

export default defineConfig({
  testDir: 'tests/browser',
  outputDir: '.data/test-reports/playwright-results',
  workers: 1,
  fullyParallel: false,
  retries: 0,
  forbidOnly: Boolean(process.env.CI),
  timeout: 60_000,
  expect: { timeout: 15_000 },
  use: {
    baseURL: process.env.WHORLWIND_BASE_URL ?? 'http://127.0.0.1:3100',
    browserName: 'chromium',
    trace: 'retain-on-failure',
    launchOptions: {
      executablePath: '/usr/bin/chromium',
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
        // Nothing but the app on loopback may be reached.
        '--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1',
      ],
    },
  },
});
