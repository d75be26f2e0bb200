import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

// Two projects: `unit` (plain code, no services: `npx vitest run --project unit`) and
// `integration` (real PostgreSQL and stand-ins, whose settings `npm test` passes in the
// environment; its global set-up refuses to run without them).
export default defineConfig({
  resolve: { alias: { '@': fileURLToPath(new URL('./', import.meta.url)) } },
  test: {
    testTimeout: 60_000,
    hookTimeout: 120_000,
    fileParallelism: false,
    projects: [
      { extends: true, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'] } },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/integration/global-setup.ts'],
        },
      },
    ],
  },
});
