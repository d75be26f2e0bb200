import type { NextConfig } from 'next';

const config: NextConfig = {
  // The demo serves .next while a test run builds into .next-test (scripts/lib/next-app.ts).
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  // `npm test` type-checks the whole project with tsc as a phase of its own (scripts/test.ts),
  // so the build does not do it a second time.
  typescript: { ignoreBuildErrors: true },
  // forbidden() answers 403 with app/forbidden.tsx when a role may not see a page.
  experimental: { authInterrupts: true },
  // Loaded by Node at run time rather than bundled: Knex requires its dialects dynamically.
  serverExternalPackages: ['knex', 'pg', 'bcryptjs', 'nodemailer'],
};

export default config;
