// The server's configuration, read from environment variables and checked once with zod.
// Every variable has a default that reaches the local demo services (lib/platform/local-services.ts);
// production points the same variables at the hosted services. .env.example lists them.
import { z } from 'zod';
import { DEMO_PORTS, LOCAL_DATABASE, LOCAL_NEXTAUTH_SECRET, localServiceEnv } from './local-services';

const defaults = localServiceEnv(DEMO_PORTS, LOCAL_DATABASE.demoName);

const flag = z.enum(['true', 'false']).transform((value) => value === 'true');
const optionalUrl = z.union([z.literal(''), z.url()]);

const schema = z
  .object({
    DATABASE_URL: z.url().default(defaults.DATABASE_URL),
    NEXTAUTH_URL: z.url().default(defaults.NEXTAUTH_URL),
    NEXTAUTH_SECRET: z.string().min(32, 'must be at least 32 characters').default(defaults.NEXTAUTH_SECRET),
    SMTP_HOST: z.string().min(1).default(defaults.SMTP_HOST),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(Number(defaults.SMTP_PORT)),
    SMTP_SECURE: flag.default(false),
    SMTP_USER: z.string().optional(),
    SMTP_PASSWORD: z.string().optional(),
    MAIL_FROM: z.string().min(3).default(defaults.MAIL_FROM),
    /** The SMTP sink's JSON endpoint; empty where mail goes to a real SMTP service. */
    MAIL_SINK_URL: optionalUrl.default(defaults.MAIL_SINK_URL),
    /** Empty for the provider's default endpoint; set for the local stand-in. */
    S3_ENDPOINT: optionalUrl.default(defaults.S3_ENDPOINT),
    S3_REGION: z.string().min(1).default(defaults.S3_REGION),
    S3_BUCKET: z.string().min(3).default(defaults.S3_BUCKET),
    S3_ACCESS_KEY_ID: z.string().min(1).default(defaults.S3_ACCESS_KEY_ID),
    S3_SECRET_ACCESS_KEY: z.string().min(1).default(defaults.S3_SECRET_ACCESS_KEY),
    S3_FORCE_PATH_STYLE: flag.default(true),
    STRIPE_SECRET_KEY: z.string().startsWith('sk_', 'must be a secret key (sk_…)').default(defaults.STRIPE_SECRET_KEY),
    /** Empty for the real payment API; set for the local fake. */
    STRIPE_API_URL: optionalUrl.default(defaults.STRIPE_API_URL),
    /** Checks the signature of the payment provider's webhooks (whsec_…). */
    STRIPE_WEBHOOK_SECRET: z.string().startsWith('whsec_', 'must be a webhook signing secret (whsec_…)').default(defaults.STRIPE_WEBHOOK_SECRET),
    /** The market's share of each sale, in percent of the price (whole or decimal). */
    MARKET_PLATFORM_FEE_PERCENT: z.coerce.number().min(0).max(100).default(15),
    /** Largest growth surface file the studio accepts, in bytes (default 200 MB). */
    SURFACE_MAX_BYTES: z.coerce.number().int().positive().default(200_000_000),
  })
  .refine(
    (config) => config.NEXTAUTH_SECRET !== LOCAL_NEXTAUTH_SECRET || isLoopback(config.NEXTAUTH_URL),
    { path: ['NEXTAUTH_SECRET'], message: 'the local default secret is only allowed on a loopback NEXTAUTH_URL' },
  );

function isLoopback(url: string) {
  const host = new URL(url).hostname;
  return host === 'localhost' || host === '[::1]' || host.startsWith('127.');
}

export type Env = z.infer<typeof schema>;

export class InvalidEnvironment extends Error {}

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = schema.safeParse(source);
  if (!result.success) {
    const problems = result.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    throw new InvalidEnvironment(`Invalid server configuration:\n  ${problems.join('\n  ')}`);
  }
  return result.data;
}

let cached: Env | undefined;

/** The validated configuration of this process (read on first use, so builds need none of it). */
export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
