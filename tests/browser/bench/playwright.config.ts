// The studio's browser benchmarks (opening-bench.ts: --grep opening; drag-bench.ts: --grep drag) on their own: `npm test` runs
// tests/browser/*.spec.ts only. Run it against the test stack with
//   npm test -- browser --config tests/browser/bench/playwright.config.ts
import { defineConfig } from '@playwright/test';
import base from '../../../playwright.config';

export default defineConfig({
  ...base,
  testDir: '.',
  testMatch: ['opening-bench.ts', 'drag-bench.ts'],
  timeout: 600_000,
  outputDir: '../../../.data/test-reports/studio-bench-results',
});
