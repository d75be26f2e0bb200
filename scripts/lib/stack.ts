// Starts what the app needs on this machine, on loopback: PostgreSQL, the S3 stand-in, the
// SMTP sink and the payments fake. The demo and the test run use separate ports and data
// directories (.data/demo, .data/test), so both can run at once.
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import { rm } from 'node:fs/promises';
import knex from 'knex';
import {
  DEMO_PORTS,
  LOCAL_DATABASE,
  LOCAL_S3,
  LOCAL_STRIPE_SECRET_KEY,
  LOCAL_STRIPE_WEBHOOK_SECRET,
  TEST_PORTS,
  localServiceEnv,
  localWebhookUrl,
  type LocalPorts,
} from '../../lib/platform/local-services';
import { startS3StandIn } from '../../services/s3';
import { startSmtpSink } from '../../services/smtp-sink';
import { startPaymentsFake } from '../../services/payments-fake/index';
import { migrationConfig } from '../../db/migration-config';
import { CommandFailed, log, onShutdown, runCommand } from './processes';
import { preparePostgres } from './postgres';

export const projectRoot = join(import.meta.dirname, '..', '..');

export type StackProfile = {
  name: 'demo' | 'test';
  ports: LocalPorts;
  databaseName: string;
  dataDir: string;
  /** Throw the data away before starting (and after stopping). */
  throwaway: boolean;
};

const PORT_VARIABLES: Record<keyof LocalPorts, string> = {
  app: 'APP_PORT',
  postgres: 'PG_PORT',
  s3: 'S3_PORT',
  smtp: 'SMTP_SINK_PORT',
  mailSink: 'MAIL_SINK_PORT',
  payments: 'PAYMENTS_PORT',
};

/** Ports come from APP_PORT, PG_PORT, … for the demo and TEST_APP_PORT, TEST_PG_PORT, … for tests. */
function portsFromEnvironment(defaults: LocalPorts, prefix: string): LocalPorts {
  const ports = { ...defaults };
  for (const [key, variable] of Object.entries(PORT_VARIABLES) as [keyof LocalPorts, string][]) {
    const raw = process.env[prefix + variable];
    if (raw === undefined || raw === '') continue;
    const port = Number(raw);
    if (!Number.isInteger(port) || port < 1 || port > 65535) {
      throw new CommandFailed(`${prefix + variable}=${raw} is not a port number (1–65535).`);
    }
    ports[key] = port;
  }
  return ports;
}

export function demoProfile(): StackProfile {
  return {
    name: 'demo',
    ports: portsFromEnvironment(DEMO_PORTS, ''),
    databaseName: LOCAL_DATABASE.demoName,
    dataDir: join(projectRoot, '.data', 'demo'),
    throwaway: false,
  };
}

export function testProfile(): StackProfile {
  return {
    name: 'test',
    ports: portsFromEnvironment(TEST_PORTS, 'TEST_'),
    databaseName: LOCAL_DATABASE.testName,
    // TEST_DATA_DIR (with other TEST_* ports) lets two test stacks run side by side.
    dataDir: process.env.TEST_DATA_DIR ? resolve(process.env.TEST_DATA_DIR) : join(projectRoot, '.data', 'test'),
    throwaway: true,
  };
}

function portIsFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = createServer();
    probe.once('error', () => resolve(false));
    probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)));
  });
}

async function checkPortsFree(profile: StackProfile) {
  const prefix = profile.name === 'test' ? 'TEST_' : '';
  const busy: string[] = [];
  for (const [key, variable] of Object.entries(PORT_VARIABLES) as [keyof LocalPorts, string][]) {
    if (!(await portIsFree(profile.ports[key]))) busy.push(`${profile.ports[key]} (${prefix + variable})`);
  }
  if (busy.length > 0) {
    throw new CommandFailed(
      `These ports on 127.0.0.1 are already in use: ${busy.join(', ')}. ` +
        `Stop what holds them (another ${profile.name} run?) or choose other ports with those variables.`,
    );
  }
}

/** Environment for everything that talks to this stack: the app, migrations, tests. */
export function stackEnvironment(profile: StackProfile): NodeJS.ProcessEnv {
  return {
    ...process.env,
    ...localServiceEnv(profile.ports, profile.databaseName),
    NEXT_TELEMETRY_DISABLED: '1',
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
  };
}

/** Starts every service of the profile; each one is stopped by shutdown(). */
export async function startStack(profile: StackProfile) {
  await checkPortsFree(profile);
  const { ports } = profile;

  log(`starting PostgreSQL on 127.0.0.1:${ports.postgres}`);
  const postgres = await preparePostgres({
    dataDir: join(profile.dataDir, 'postgres'),
    port: ports.postgres,
    user: LOCAL_DATABASE.user,
    password: LOCAL_DATABASE.password,
    database: profile.databaseName,
  });
  // Registered before starting, so an interruption during start-up still stops the server.
  onShutdown('PostgreSQL', async () => {
    await postgres.stop();
    if (profile.throwaway) await rm(postgres.dataDir, { recursive: true, force: true });
  });
  await postgres.start({ fresh: profile.throwaway });

  const s3Directory = join(profile.dataDir, 's3');
  if (profile.throwaway) await rm(s3Directory, { recursive: true, force: true });
  const s3 = await startS3StandIn({ port: ports.s3, directory: s3Directory, bucket: LOCAL_S3.bucket });
  onShutdown('the S3 stand-in', async () => {
    await s3.close();
    if (profile.throwaway) await rm(s3Directory, { recursive: true, force: true });
  });

  const sink = await startSmtpSink({ smtpPort: ports.smtp, httpPort: ports.mailSink });
  onShutdown('the SMTP sink', sink.close);

  const paymentsDirectory = join(profile.dataDir, 'payments');
  if (profile.throwaway) await rm(paymentsDirectory, { recursive: true, force: true });
  const paymentsFake = await startPaymentsFake({
    port: ports.payments,
    secretKey: LOCAL_STRIPE_SECRET_KEY,
    webhookUrl: localWebhookUrl(ports),
    webhookSecret: LOCAL_STRIPE_WEBHOOK_SECRET,
    // Kept across restarts (the demo's payouts need the balance of its earlier sales).
    dataDir: paymentsDirectory,
  });
  onShutdown('the payments fake', async () => {
    await paymentsFake.close();
    if (profile.throwaway) await rm(paymentsDirectory, { recursive: true, force: true });
  });

  log(
    `services up: S3 ${s3.endpoint} (bucket ${LOCAL_S3.bucket}), SMTP 127.0.0.1:${ports.smtp} ` +
      `(caught mail: ${sink.url}/messages), payments ${paymentsFake.url}`,
  );
}

/** Brings the schema up to date and loads the demo scenario (the seeds are idempotent). */
export async function migrateAndSeed(profile: StackProfile) {
  const environment = stackEnvironment(profile);
  const connection = knex(migrationConfig(environment.DATABASE_URL!));
  try {
    const [, applied] = await connection.migrate.latest();
    log(applied.length > 0 ? `applied migrations: ${applied.join(', ')}` : 'database schema is up to date');
  } finally {
    await connection.destroy();
  }
  // Seeds run in a process of their own with this stack's environment: the studio's seed uploads
  // the demo surfaces through lib/platform/storage, whose configuration (lib/platform/env.ts) this process has
  // already read with the demo's defaults.
  const knexCli = join(projectRoot, 'node_modules', 'knex', 'bin', 'cli.js');
  await runCommand(process.execPath, ['--import', 'tsx', knexCli, 'seed:run'], { cwd: projectRoot, env: environment });
  log('demo scenario seeded');
}
