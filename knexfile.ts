// Knex's CLI configuration: migrations and seeds (db/) against DATABASE_URL. A TypeScript knexfile
// needs tsx:   node --import tsx node_modules/knex/bin/cli.js migrate:latest   (npm run db:migrate)
import { migrationConfig } from './db/migration-config';
import { env } from './lib/platform/env';

export default migrationConfig(env().DATABASE_URL);
