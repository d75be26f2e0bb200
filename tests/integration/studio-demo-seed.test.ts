// The studio's demo seed, which `npm test` ran against this stack before the tests (as
// `npm run demo` does): Wren's three surfaces in object storage and a groom on each.
import './studio-helpers';
import knex from 'knex';
import { afterAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '@/db/demo-scenario';
import { seed } from '@/db/seeds/10_studio_demo';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { parseGroomSpec } from '@/lib/groom';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import { storedObjectSize } from '@/lib/studio/storage';
import { migrationConfig } from '@/db/migration-config';

afterAll(closeDb);

const wren = DEMO_ACCOUNTS.find((account) => account.email === 'wren@quillmoor.example')!;

async function wrensStudio() {
  const user = await db()('users').where({ email: wren.email }).first('id');
  const surfaces = await db()('growth_surfaces').where({ owner_id: user.id }).orderBy('name');
  const grooms = await db()('grooms').where({ owner_id: user.id }).orderBy('name');
  const versions = await db()('groom_versions').whereIn('groom_id', grooms.map((g) => g.id));
  return { surfaces, grooms, versions };
}

describe('the studio demo seed', () => {
  it('gave Wren the three demo surfaces, measured and stored', async () => {
    const { surfaces } = await wrensStudio();
    expect(surfaces.map((s) => [s.name, s.file_name, s.units, s.euler_characteristic, s.genus])).toEqual([
      ['Bramble — fox head', 'bramble-fox-head.obj', 'cm', 2, 0],
      ['Brisquette — long cat', 'brisquette-long-cat.obj', 'cm', 2, 0],
      ['Loop — plush ring', 'loop-plush-ring.obj', 'mm', 0, 1],
    ]);
    for (const surface of surfaces) {
      expect(await storedObjectSize(surface.object_key)).toBe(Number(surface.byte_size));
      expect(await storedObjectSize(surface.thumbnail_key)).toBeGreaterThan(0);
    }
  });

  it('gave each a groom with the demo spec and a first version', async () => {
    const { surfaces, grooms, versions } = await wrensStudio();
    expect(grooms.map((g) => g.name)).toEqual(['Bramble — autumn coat', 'Brisquette — short velvet', 'Loop — shaggy pile']);
    for (const demo of DEMO_GROOMS) {
      const groom = grooms.find((g) => g.name === demo.spec.name)!;
      expect(groom.surface_id).toBe(surfaces.find((s) => s.name.startsWith(demo.character))!.id);
      expect(groom).toMatchObject({ revision: 2, spec: parseGroomSpec(demo.spec) });
      expect(versions.filter((v) => v.groom_id === groom.id)).toEqual([expect.objectContaining({ number: 1, name: 'First pass', source_revision: 2 })]);
    }
  });

  it('changes nothing when it runs again', async () => {
    const before = await wrensStudio();
    const connection = knex(migrationConfig(env().DATABASE_URL));
    try {
      await seed(connection);
    } finally {
      await connection.destroy();
    }
    const after = await wrensStudio();
    expect(after.surfaces.map((s) => s.id)).toEqual(before.surfaces.map((s) => s.id));
    expect(after.grooms.map((g) => [g.id, g.revision])).toEqual(before.grooms.map((g) => [g.id, g.revision]));
    expect(after.versions).toHaveLength(before.versions.length);
  });
});
