// The studio's browser benchmarks (tests/browser/bench/studio-bench.ts: opening; drag-bench.ts: dragging) on their own: `npm test` runs
// tests/browser/*.spec.ts only. Run it against the test stack with
//   npm test -- browser --config tests/browser/bench/playwright.config.ts
import { defineConfig } from '@playwright/test';
import base from '../../../playwright.config';

export default defineConfig({
  ...base,
  testDir: '.',
  testMatch: ['studio-bench.ts', 'drag-bench.ts'],
  timeout: 600_000,
  outputDir: '../../../.data/test-reports/studio-bench-results',
});
