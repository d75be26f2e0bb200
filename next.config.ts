import type { NextConfig } from 'next';

/**
 * Where the browser fetches stored files from: presigned URLs point at the object store itself
 * (pictures, thumbnails, the surfaces the studio opens, the .glb of the guide preview, and the
 * presigned PUT of an upload). Read from the same variables as lib/platform/storage.ts, when the
 * app is built: Next.js writes these headers into the build.
 */
export function objectStoreOrigins(source: Record<string, string | undefined>): string[] {
  if (source.S3_ENDPOINT) return [new URL(source.S3_ENDPOINT).origin];
  const region = source.S3_REGION || 'us-east-1';
  // The AWS SDK's own endpoints: path-style, or the bucket as a sub-domain.
  const origins = [`https://s3.${region}.amazonaws.com`];
  if (source.S3_BUCKET) origins.push(`https://${source.S3_BUCKET}.s3.${region}.amazonaws.com`);
  return origins;
}

/**
 * The Content-Security-Policy (CSP Level 3, https://www.w3.org/TR/CSP3/). What each source is for:
 * - script-src 'unsafe-inline': Next.js streams the page's data in inline <script> tags; a static
 *   header cannot carry a per-request nonce (that needs rendering every page per request). No
 *   'unsafe-eval' (three.js and the field worker need none) except under `next dev`, whose
 *   hot reload evaluates code.
 * - style-src 'unsafe-inline': React's style attributes and Next's inline styles.
 * - worker-src 'self' blob:: the studio's field Web Worker.
 * - img-src / connect-src with the object store: pictures and thumbnails, the surfaces and the
 *   guide preview's .glb fetched by the browser, uploads by presigned PUT; blob: and data: for
 *   what three.js's loaders make of a file's embedded parts.
 * - frame-ancestors 'none' (and X-Frame-Options for browsers without CSP 3): no page in a frame.
 */
export function contentSecurityPolicy(source: Record<string, string | undefined>, development: boolean): string {
  const store = objectStoreOrigins(source).join(' ');
  const directives: Record<string, string> = {
    'default-src': "'self'",
    'script-src': `'self' 'unsafe-inline'${development ? " 'unsafe-eval'" : ''}`,
    'style-src': "'self' 'unsafe-inline'",
    'img-src': `'self' data: blob: ${store}`,
    'font-src': "'self'",
    'connect-src': `'self' blob: data: ${store}${development ? ' ws: wss:' : ''}`,
    'worker-src': "'self' blob:",
    'object-src': "'none'",
    'base-uri': "'self'",
    'form-action': "'self'",
    'frame-ancestors': "'none'",
  };
  return Object.entries(directives)
    .map(([name, value]) => `${name} ${value}`)
    .join('; ');
}

/** Sent with every answer of the app (pages, route handlers, static files). */
export function securityHeaders(source: Record<string, string | undefined>, development: boolean): { key: string; value: string }[] {
  return [
    { key: 'Content-Security-Policy', value: contentSecurityPolicy(source, development) },
    { key: 'X-Frame-Options', value: 'DENY' },
    // Other sites see only the origin: paths such as /reset-password?token=… stay here.
    { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
    { key: 'X-Content-Type-Options', value: 'nosniff' },
    // Nothing in Whorlwind uses these; a script that got in could not either.
    { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=(), usb=()' },
  ];
}

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
  async headers() {
    return [{ source: '/:path*', headers: securityHeaders(process.env, process.env.NODE_ENV === 'development') }];
  },
};

export default config;
