// The migration that gives the licence levels Whorlwind's own names renames stored rows in place:
// ids stay (so every listing and purchase keeps its licence), slugs and titles change, and the
// titles quoted in the texts follow; down() gives the old names back. Played on a copy of the
// licences table in a schema of its own, so the shared test database is left alone.
import { randomBytes } from 'node:crypto';
import knex, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { down, up } from '@/db/migrations/20261208400001_licence_names';
import { knexConfig } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { LICENCE_TEXTS } from '@/lib/market/licences';

const schema = `licence_names_${randomBytes(4).toString('hex')}`;
let connection: Knex;

// The rows as the market seeded them before the rename (titles and the sentences that quote them).
const OLD = [
  { slug: 'personal', title: 'Personal licence', summary: 'One person.', body: 'Personal licence\n\nEach of them needs their own licence, or your employer needs a Studio or Unlimited licence.', position: 1 },
  { slug: 'studio', title: 'Studio licence', summary: 'One company.', body: 'Studio licence\n\nUse it with more than 20 people at a time: for more, buy the Unlimited licence.', position: 2 },
  { slug: 'unlimited', title: 'Unlimited licence', summary: 'All its people.', body: 'Unlimited licence\n\n- Everything the Studio licence allows, with no limit on people or sites.', position: 3 },
];

beforeAll(async () => {
  connection = knex({ ...knexConfig(env().DATABASE_URL), searchPath: [schema, 'public'] });
  await connection.raw(`CREATE SCHEMA ${schema}`);
  await connection.raw(`CREATE TABLE ${schema}.licences (LIKE public.licences INCLUDING ALL)`);
  await connection(`${schema}.licences`).insert(OLD);
});

afterAll(async () => {
  await connection.raw(`DROP SCHEMA ${schema} CASCADE`);
  await connection.destroy();
});

const rows = () => connection(`${schema}.licences`).orderBy('position').select('id', 'slug', 'title', 'body');

describe('the licence names migration', () => {
  it('renames slugs, titles and the titles in the texts, keeping the ids; down() undoes it', async () => {
    const before = await rows();
    await up(connection);
    const after = await rows();
    expect(after.map((row) => row.id)).toEqual(before.map((row) => row.id));
    // The names the market's seed upserts today (lib/market/licences.ts), matched by slug.
    expect(after.map((row) => [row.slug, row.title])).toEqual(LICENCE_TEXTS.map((text) => [text.slug, text.title]));
    const text = after.map((row) => row.body).join('\n');
    expect(text).not.toMatch(/Personal|Studio|Unlimited/);
    expect(after[0].body).toContain(`needs a ${LICENCE_TEXTS[1].title.replace(' licence', '')} or ${LICENCE_TEXTS[2].title}`);
    expect(after[2].body).toContain(`Everything the ${LICENCE_TEXTS[1].title} allows`);

    await down(connection);
    expect(await rows()).toEqual(before);
  });
});
