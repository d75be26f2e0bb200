// Knex's configuration for migrations and seeds (db/). A TypeScript knexfile needs tsx:
//   node --import tsx node_modules/knex/bin/cli.js migrate:latest   (npm run db:migrate)
import type { Knex } from 'knex';
import { fileURLToPath } from 'node:url';
import { env } from './lib/platform/env';
import { knexConfig } from './lib/platform/db';

const dbFolder = fileURLToPath(new URL('./db/', import.meta.url));

export function migrationConfig(connectionString: string): Knex.Config {
  return {
    ...knexConfig(connectionString),
    migrations: { directory: `${dbFolder}migrations`, loadExtensions: ['.ts'], extension: 'ts' },
    seeds: { directory: `${dbFolder}seeds`, loadExtensions: ['.ts'], extension: 'ts' },
  };
}

export default migrationConfig(env().DATABASE_URL);
