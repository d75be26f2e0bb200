// Knex's configuration for migrations and seeds (db/), for a given database. Apart from
// knexfile.ts so the scripts and tests can use it without reading the server's configuration.
import type { Knex } from 'knex';
import { fileURLToPath } from 'node:url';
import { knexConfig } from '../lib/platform/db';

const dbFolder = fileURLToPath(new URL('./', import.meta.url));

export function migrationConfig(connectionString: string): Knex.Config {
  return {
    ...knexConfig(connectionString),
    migrations: { directory: `${dbFolder}migrations`, loadExtensions: ['.ts'], extension: 'ts' },
    seeds: { directory: `${dbFolder}seeds`, loadExtensions: ['.ts'], extension: 'ts' },
  };
}
