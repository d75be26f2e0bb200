// The market search's generation: a number that grows whenever anything a search result shows may
// have changed (a listing, a seller's display name, a licence). The search keeps results under the
// generation they were read at, so a cached page is never served after such a change.
//
// The number is bumped by deferred constraint triggers, that is at commit: the bump is part of the
// writer's transaction (a reader who sees the new number also sees the change), and the one row is
// locked only for the commit itself, after every other lock the transaction takes (no deadlocks, no
// queue of writers behind a long transaction).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.raw(`
    CREATE TABLE market_search_generation (
      one boolean PRIMARY KEY DEFAULT true CHECK (one),
      value bigint NOT NULL
    )`);
  await knex.raw(`INSERT INTO market_search_generation (one, value) VALUES (true, 1)`);
  await knex.raw(`
    CREATE FUNCTION bump_market_search_generation() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE market_search_generation SET value = value + 1;
      RETURN NULL;
    END
    $$`);
  await knex.raw(`
    CREATE CONSTRAINT TRIGGER listings_search_generation AFTER INSERT OR UPDATE OR DELETE ON listings
    DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_market_search_generation()`);
  // Constraint triggers are per row; emptying the table is caught by a plain statement trigger.
  await knex.raw(`
    CREATE TRIGGER listings_truncate_search_generation AFTER TRUNCATE ON listings
    FOR EACH STATEMENT EXECUTE FUNCTION bump_market_search_generation()`);
  await knex.raw(`
    CREATE CONSTRAINT TRIGGER users_search_generation AFTER UPDATE OF display_name ON users
    DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_market_search_generation()`);
  await knex.raw(`
    CREATE CONSTRAINT TRIGGER licences_search_generation AFTER UPDATE OR DELETE ON licences
    DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_market_search_generation()`);
  // Prices in one currency, cheapest or dearest first, and their count: from one index.
  await knex.raw(`CREATE INDEX listings_published_currency_price ON listings (currency, price_cents, id) WHERE state = 'published'`);
}

export async function down(knex: Knex) {
  await knex.raw(`DROP INDEX listings_published_currency_price`);
  await knex.raw(`DROP TRIGGER licences_search_generation ON licences`);
  await knex.raw(`DROP TRIGGER users_search_generation ON users`);
  await knex.raw(`DROP TRIGGER listings_truncate_search_generation ON listings`);
  await knex.raw(`DROP TRIGGER listings_search_generation ON listings`);
  await knex.raw(`DROP FUNCTION bump_market_search_generation()`);
  await knex.raw(`DROP TABLE market_search_generation`);
}
