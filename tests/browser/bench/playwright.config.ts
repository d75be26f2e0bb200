// The studio's browser benchmark (tests/browser/bench/studio-bench.ts) on its own: `npm test` runs
// tests/browser/*.spec.ts only. Run it against the test stack with
//   npm test -- browser --config tests/browser/bench/playwright.config.ts
import { defineConfig } from '@playwright/test';
import base from '../../../playwright.config';

export default defineConfig({
  ...base,
  testDir: '.',
  testMatch: 'studio-bench.ts',
  timeout: 600_000,
  outputDir: '../../../.data/test-reports/studio-bench-results',
});
