// The one Knex instance of a server process, connected to PostgreSQL through DATABASE_URL.
import knex, { type Knex } from 'knex';
import { env } from './env';

export function knexConfig(connectionString: string): Knex.Config {
  return {
    client: 'pg',
    connection: { connectionString },
    pool: { min: 0, max: 10 },
  };
}

// Kept on globalThis so that `next dev` reloading modules does not open a new pool each time.
const holder = globalThis as typeof globalThis & { whorlwindDb?: Knex };

export function db(): Knex {
  holder.whorlwindDb ??= knex(knexConfig(env().DATABASE_URL));
  return holder.whorlwindDb;
}

/** Closes the pool; for scripts and tests that end their process. */
export async function closeDb() {
  const instance = holder.whorlwindDb;
  holder.whorlwindDb = undefined;
  await instance?.destroy();
}

/** PostgreSQL's error code for a unique constraint violation. */
export const UNIQUE_VIOLATION = '23505';

export function isUniqueViolation(error: unknown, constraint?: string): boolean {
  const pgError = error as { code?: string; constraint?: string };
  return pgError?.code === UNIQUE_VIOLATION && (constraint === undefined || pgError.constraint === constraint);
}

/**
 * Holds PostgreSQL's transaction-level advisory lock named by `key` until `trx` ends, so work on
 * one key (an address's mail, a seller's payout…) runs one transaction at a time in every process.
 */
export async function lockUntilCommit(trx: Knex.Transaction, key: string): Promise<void> {
  await trx.raw('SELECT pg_advisory_xact_lock(hashtext(?))', [key]);
}

/** How many rows of `table` matching `where` have `column` within the last `minutes` (by the database's clock). */
export async function countWithinMinutes(trx: Knex.Transaction, table: string, where: Record<string, unknown>, column: string, minutes: number): Promise<number> {
  const [{ count }] = await trx(table)
    .where(where)
    .where(column, '>', trx.raw('now() - make_interval(mins => ?)', [minutes]))
    .count<{ count: string }[]>('* as count');
  return Number(count);
}
