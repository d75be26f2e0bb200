// The demo groomer's studio: the three characters of lib/groom's demo (Bramble, Brisquette, Loop)
// as growth surfaces — uploaded to object storage through a presigned PUT, registered exactly as
// the studio does it and checked — and a groom on each with its spec and a first named version (which the
// market's seed lists). Runs after the accounts seed and before the market's (names sort so).
// Idempotent: a surface or groom of that name that Wren already has is left as it is. Thumbnails
// of the grooms are queued; the app's job workers render them when it starts.
import type { Knex } from 'knex';
import { DEMO_ACCOUNTS } from '../demo-scenario';
import { closeDb } from '../../lib/platform/db';
import { DEMO_GROOMS, surfaceToObj, type DemoGroom } from '../../lib/groom/demo';
import type { SurfaceUnits } from '../../lib/studio/types';
import { createGroom, createVersion, saveSpec } from '../../lib/studio/grooms';
import type { Groomer } from '../../lib/accounts/actor';
import { stopJobs } from '../../lib/platform/jobs';
import { createSurfaceUpload, registerSurface } from '../../lib/studio/surfaces';
import { checkRegisteredSurface } from '../../lib/studio/surface-check';

const FIRST_VERSION = 'First pass';

function surfaceName(demo: DemoGroom): string {
  return `${demo.character} — ${demo.id.split('-').slice(1).join(' ')}`;
}

/**
 * The id of the owner's surface of that name, uploading it through a presigned PUT, registering and
 * checking it first when they do not have it yet (also the buyer's surface, 20_buyer_demo.ts).
 */
export async function seededSurface(knex: Knex, owner: Groomer, file: { name: string; fileName: string; obj: string; units: SurfaceUnits }): Promise<string> {
  const existing = await knex('growth_surfaces').where({ owner_id: owner.userId, name: file.name }).first('id');
  if (existing) return existing.id;
  const bytes = new TextEncoder().encode(file.obj);
  const ticket = await createSurfaceUpload(owner, { fileName: file.fileName, byteSize: bytes.byteLength });
  const upload = await fetch(ticket.url, { method: ticket.method, body: new Blob([bytes]) });
  if (!upload.ok) throw new Error(`object storage refused the demo surface ${file.fileName}: ${upload.status} ${await upload.text()}`);
  const surface = await registerSurface(owner, { uploadId: ticket.uploadId, name: file.name, units: file.units });
  // The seed needs the surface ready now, so it runs the check itself; the queued job then finds
  // it checked and leaves it.
  await checkRegisteredSurface({ surfaceId: surface.id });
  return surface.id;
}

/** The demo surface's id, uploading and registering it first when Wren does not have it yet. */
function demoSurface(knex: Knex, groomer: Groomer, demo: DemoGroom): Promise<string> {
  return seededSurface(knex, groomer, {
    name: surfaceName(demo),
    fileName: `${demo.id}.obj`,
    obj: surfaceToObj(demo.surface(), `${demo.character}, ${demo.description}`),
    units: demo.spec.units as SurfaceUnits,
  });
}

export async function seed(knex: Knex) {
  const account = DEMO_ACCOUNTS.find((candidate) => candidate.roles.includes('groomer'));
  const user = account && (await knex('users').where({ email: account.email }).first('id'));
  if (!user) throw new Error('the demo groomer is missing: the accounts seed must run first');
  const groomer: Groomer = { userId: user.id };
  try {
    let created = 0;
    for (const demo of DEMO_GROOMS) {
      const surfaceId = await demoSurface(knex, groomer, demo);
      const groomName = demo.spec.name ?? demo.character;
      if (await knex('grooms').where({ owner_id: groomer.userId, name: groomName }).first('id')) continue;
      const groom = await createGroom(groomer, { surfaceId, name: groomName });
      await saveSpec(groomer, groom.id, { spec: demo.spec, baseRevision: groom.revision });
      await createVersion(groomer, groom.id, FIRST_VERSION);
      created++;
    }
    console.log(`[studio seed] ${created} demo groom(s) created for ${account!.email} (${DEMO_GROOMS.length - created} already there).`);
  } finally {
    // The studio's modules hold a pool and the job queue; the seed's process must end.
    await stopJobs();
    await closeDb();
  }
}
