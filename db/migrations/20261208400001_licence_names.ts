// The licence levels take Whorlwind's own names (tuft, pelt, herd) instead of the three-tier names
// common to asset stores. The rows keep their ids, so every listing and purchase still points at the
// licence it had; only the slug, the title and the titles quoted in the texts change. Self-contained
// (no import of today's texts), so it means the same whenever it runs; the market seed then
// upserts the current texts by the new slugs.
import type { Knex } from 'knex';

const NAMES: readonly (readonly [oldSlug: string, oldTitle: string, newSlug: string, newTitle: string])[] = [
  ['personal', 'Personal licence', 'tuft', 'Tuft licence'],
  ['studio', 'Studio licence', 'pelt', 'Pelt licence'],
  ['unlimited', 'Unlimited licence', 'herd', 'Herd licence'],
];

async function rename(knex: Knex, pairs: readonly (readonly [string, string, string, string])[]) {
  // The texts name the other levels too ("a Studio or Unlimited licence"), so every title is
  // replaced in every row, longest first so no title is replaced inside another.
  const titles = pairs.map(([, from, , to]) => [from, to] as const);
  titles.push([titles[1][0].replace(' licence', '') + ' or ' + titles[2][0], titles[1][1].replace(' licence', '') + ' or ' + titles[2][1]]);
  titles.sort((a, b) => b[0].length - a[0].length);
  await knex.transaction(async (trx) => {
    for (const [fromSlug, fromTitle, toSlug, toTitle] of pairs) {
      await trx('licences').where({ slug: fromSlug }).update({ slug: toSlug, title: trx.raw('replace(title, ?, ?)', [fromTitle, toTitle]) });
    }
    for (const [from, to] of titles) {
      await trx('licences').update({ body: trx.raw('replace(body, ?, ?)', [from, to]), summary: trx.raw('replace(summary, ?, ?)', [from, to]) });
    }
  });
}

export async function up(knex: Knex) {
  await rename(knex, NAMES);
}

export async function down(knex: Knex) {
  await rename(knex, NAMES.map(([a, b, c, d]) => [c, d, a, b] as const));
}
