// The server's configuration, read from environment variables and checked once with zod.
// Where WHORLWIND_LOCAL=true (set by the demo, dev and test scripts, never in production) every
// variable has a default that reaches the local demo services (lib/platform/local-services.ts).
// Anywhere else the secrets and the database must be set, and none of them may be one of the local
// values that are in this repository: a server that forgot a variable refuses to start instead
// of signing sessions with a published secret. .env.example lists the variables.
import { z } from 'zod';
import { DEMO_PORTS, LOCAL_DATABASE, LOCAL_ONLY_FLAG, localServiceEnv } from './local-services';

const localDefaults = localServiceEnv(DEMO_PORTS, LOCAL_DATABASE.demoName);

/** Variables that hold a secret (or a database password): no default outside local runs. */
const SECRETS = ['DATABASE_URL', 'NEXTAUTH_SECRET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY', 'STRIPE_SECRET_KEY', 'STRIPE_WEBHOOK_SECRET'] as const;

const flag = z.enum(['true', 'false']).transform((value) => value === 'true');
const optionalUrl = z.union([z.literal(''), z.url()]);

function schemaFor(defaults: Record<string, string>) {
  return z.object({
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
    /** Days a sale is held before it can be paid out (common marketplace practice; no single source sets it). */
    MARKET_PAYOUT_HOLD_DAYS: z.coerce.number().min(0).max(365).default(14),
    /** Largest growth surface file the studio accepts, in bytes (default 200 MB). */
    SURFACE_MAX_BYTES: z.coerce.number().int().positive().default(200_000_000),
    /**
     * Addresses of the proxies in front of the app, comma-separated. X-Forwarded-For is believed only
     * as far as these wrote it (lib/accounts/client-address.ts); empty: it is not believed at all.
     */
    TRUSTED_PROXIES: z
      .string()
      .default('')
      .transform((value) => value.split(',').map((entry) => entry.trim()).filter((entry) => entry !== '')),
  });
}

/** Whether a URL names this machine: localhost, [::1] or an IPv4 address in 127.0.0.0/8 (not a name that merely starts with "127."). */
export function isLoopbackUrl(url: string): boolean {
  const host = new URL(url).hostname;
  return host === 'localhost' || host === '[::1]' || /^127(\.(25[0-5]|2[0-4]\d|1?\d?\d)){3}$/.test(host);
}

export type Env = z.infer<ReturnType<typeof schemaFor>>;

export class InvalidEnvironment extends Error {}

/**
 * The configuration from these variables. Guarantee: outside local runs, every secret is set and
 * none equals the local value of this repository; in local runs, the local session secret is used
 * only with a loopback NEXTAUTH_URL. Every problem is named in one InvalidEnvironment.
 */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const local = source[LOCAL_ONLY_FLAG] === 'true';
  const defaults = local ? localDefaults : Object.fromEntries(Object.entries(localDefaults).filter(([key]) => !(SECRETS as readonly string[]).includes(key)));
  const problems: string[] = [];
  if (!local) {
    for (const key of SECRETS) {
      const value = source[key];
      if (value === undefined || value === '') problems.push(`${key}: must be set (local defaults need ${LOCAL_ONLY_FLAG}=true, which only the demo and the tests set)`);
      else if (value === localDefaults[key]) problems.push(`${key}: is the local value published in this repository; set your own`);
    }
  }
  const result = schemaFor(defaults).safeParse(source);
  if (!result.success) {
    for (const issue of result.error.issues) {
      const key = issue.path.join('.');
      if (!problems.some((problem) => problem.startsWith(`${key}:`))) problems.push(`${key}: ${issue.message}`);
    }
  } else if (result.data.NEXTAUTH_SECRET === localDefaults.NEXTAUTH_SECRET && !isLoopbackUrl(result.data.NEXTAUTH_URL)) {
    problems.push('NEXTAUTH_SECRET: the local default secret is only allowed on a loopback NEXTAUTH_URL');
  }
  if (problems.length > 0 || !result.success) throw new InvalidEnvironment(`Invalid server configuration:\n  ${problems.join('\n  ')}`);
  return result.data;
}

let cached: Env | undefined;

/** The validated configuration of this process (read on first use, so builds need none of it). */
export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
