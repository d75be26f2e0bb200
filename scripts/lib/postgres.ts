// A PostgreSQL server from Debian's packages, in a data directory of this project.
// PostgreSQL refuses to run as root: as root, the data directory belongs to the `postgres`
// system user (mode 700) and every server command runs through `runuser -u postgres`;
// as an ordinary user the same commands run directly.
import { chmod, chown, mkdir, readdir, rm, writeFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import pg from 'pg';
import { CommandFailed, log, runCommand } from './processes';

export type PostgresSettings = {
  dataDir: string;
  port: number;
  user: string;
  password: string;
  database: string;
};

const debianRoot = '/usr/lib/postgresql';
const isRoot = process.getuid?.() === 0;

async function findBinDir(): Promise<string | null> {
  if (!existsSync(debianRoot)) return null;
  const versions = (await readdir(debianRoot))
    .filter((name) => existsSync(join(debianRoot, name, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length > 0 ? join(debianRoot, versions[0], 'bin') : null;
}

/** Finds Debian's PostgreSQL binaries, installing the package first when they are missing. */
export async function ensurePostgresInstalled(): Promise<string> {
  const found = await findBinDir();
  if (found) return found;
  if (!isRoot) {
    throw new CommandFailed(
      'PostgreSQL is not installed. Install it once with: sudo apt-get install -y postgresql',
    );
  }
  log('PostgreSQL is missing: apt-get install -y postgresql…');
  await aptInstall('postgresql');
  const installed = await findBinDir();
  if (!installed) throw new CommandFailed(`apt-get installed postgresql but no initdb is under ${debianRoot}`);
  return installed;
}

/** apt-get install as root; refreshes the package lists once if the first attempt fails. */
export async function aptInstall(pkg: string) {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  try {
    await runCommand('apt-get', ['install', '-y', pkg], { env });
  } catch {
    await runCommand('apt-get', ['update'], { env });
    await runCommand('apt-get', ['install', '-y', pkg], { env });
  }
}

function asServerUser(command: string, args: string[]): [string, string[]] {
  return isRoot ? ['runuser', ['-u', 'postgres', '--', command, ...args]] : [command, args];
}

async function postgresCanEnter(dir: string): Promise<boolean> {
  if (!isRoot) return true;
  try {
    await runCommand('runuser', ['-u', 'postgres', '--', 'test', '-x', dir], { quiet: true });
    return true;
  } catch {
    return false;
  }
}

/**
 * The directory that will hold the cluster. It is `requested` unless the `postgres` user cannot
 * reach it (a checkout under a private home directory, when run as root): then a directory in
 * the system's temporary folder, named after the requested path, takes its place.
 */
async function usableDataDir(requested: string): Promise<string> {
  const parent = resolve(requested, '..');
  await mkdir(parent, { recursive: true });
  if (await postgresCanEnter(parent)) return requested;
  const key = createHash('sha256').update(resolve(requested)).digest('hex').slice(0, 12);
  const fallbackParent = join(tmpdir(), `whorlwind-pg-${key}`);
  await mkdir(fallbackParent, { recursive: true });
  await chmod(fallbackParent, 0o755);
  log(`the postgres user cannot enter ${parent}; keeping the database in ${fallbackParent} instead`);
  return join(fallbackParent, 'pg');
}

async function initCluster(bin: string, dataDir: string, settings: PostgresSettings) {
  await mkdir(dataDir, { recursive: true, mode: 0o700 });
  await chmod(dataDir, 0o700);
  const passwordFile = join(tmpdir(), `whorlwind-pgpass-${process.pid}`);
  await writeFile(passwordFile, `${settings.password}\n`, { mode: 0o600 });
  try {
    if (isRoot) {
      const [uid, gid] = await postgresIds();
      await chown(dataDir, uid, gid);
      await chown(passwordFile, uid, gid);
    }
    const [command, args] = asServerUser(join(bin, 'initdb'), [
      '-D', dataDir,
      '-U', settings.user,
      '--auth-local=trust',
      '--auth-host=scram-sha-256',
      `--pwfile=${passwordFile}`,
      '--encoding=UTF8',
      '--locale=C.UTF-8',
    ]);
    await runCommand(command, args, { quiet: true });
  } finally {
    await rm(passwordFile, { force: true });
  }
}

async function postgresIds(): Promise<[number, number]> {
  const uid = Number((await runCommand('id', ['-u', 'postgres'], { quiet: true })).trim());
  const gid = Number((await runCommand('id', ['-g', 'postgres'], { quiet: true })).trim());
  return [uid, gid];
}

async function pgCtl(bin: string, args: string[]) {
  const [command, fullArgs] = asServerUser(join(bin, 'pg_ctl'), args);
  // Stopping the server is a teardown step, so pg_ctl may run while shutting down.
  return runCommand(command, fullArgs, { quiet: true, duringShutdown: true });
}

async function isRunning(bin: string, dataDir: string) {
  if (!existsSync(join(dataDir, 'postmaster.pid'))) return false;
  try {
    await pgCtl(bin, ['-D', dataDir, 'status']);
    return true;
  } catch {
    return false;
  }
}

export type PostgresServer = {
  dataDir: string;
  start: (options: { fresh: boolean }) => Promise<void>;
  stop: () => Promise<void>;
};

/** Installs PostgreSQL if needed and settles where its data lives; starts nothing yet. */
export async function preparePostgres(settings: PostgresSettings): Promise<PostgresServer> {
  const bin = await ensurePostgresInstalled();
  const dataDir = await usableDataDir(settings.dataDir);
  const stop = async () => {
    if (await isRunning(bin, dataDir)) await pgCtl(bin, ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
  };
  return { dataDir, stop, start: (options) => startServer(bin, dataDir, settings, options.fresh, stop) };
}

/**
 * Starts the server on 127.0.0.1:port (creating the cluster when needed, or afresh when `fresh`)
 * and makes sure the database exists. Unix sockets are off: everything connects over TCP, and
 * long checkout paths would overflow the socket path limit.
 */
async function startServer(bin: string, dataDir: string, settings: PostgresSettings, fresh: boolean, stop: () => Promise<void>) {
  // A server left behind by an interrupted run would hold the port and the files.
  await stop();
  if (fresh) await rm(dataDir, { recursive: true, force: true });
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    log(`creating a PostgreSQL cluster in ${dataDir}`);
    await initCluster(bin, dataDir, settings);
  }
  const serverOptions = `-c listen_addresses=127.0.0.1 -p ${settings.port} -c unix_socket_directories=''`;
  try {
    await pgCtl(bin, ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-o', serverOptions, '-w', '-t', '60', 'start']);
  } catch (error) {
    throw new CommandFailed(
      `PostgreSQL did not start on 127.0.0.1:${settings.port} (see ${join(dataDir, 'server.log')}).\n${(error as Error).message}`,
    );
  }
  await createDatabaseIfMissing(settings);
}

async function createDatabaseIfMissing(settings: PostgresSettings) {
  const client = new pg.Client({
    host: '127.0.0.1',
    port: settings.port,
    user: settings.user,
    password: settings.password,
    database: 'postgres',
  });
  await client.connect();
  try {
    const existing = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [settings.database]);
    if (existing.rowCount === 0) {
      // Identifiers cannot be bound as parameters; the name comes from our own settings.
      await client.query(`CREATE DATABASE "${settings.database.replaceAll('"', '""')}"`);
    }
  } finally {
    await client.end();
  }
}
