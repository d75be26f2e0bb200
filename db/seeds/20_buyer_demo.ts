// The demo buyer's own character in the studio: a fox head of their game's cast, modelled apart
// from the seller's (another resolution, a little larger), so that "Try it on your character" on a
// listing and "Fit to my character" after buying work on the demo with no extra step — the transfer
// goes by alignment, as it would for a real buyer's character. Runs after the studio's seed (which
// it borrows the upload from) and before the market's. Idempotent: a surface of that name the buyer
// already has is left as it is.
import type { Knex } from 'knex';
import { DEMO_ACCOUNTS, DEMO_STUDIOS } from '../demo-scenario';
import { closeDb } from '../../lib/platform/db';
import { stopJobs } from '../../lib/platform/jobs';
import { surfaceToObj } from '../../lib/groom/demo';
import { foxHead } from '../../lib/groom/demo/surfaces';
import { seededSurface } from './10_studio_demo';

/** The buyer's surface, by name (the browser tests and the README find it so). */
export const DEMO_BUYER_SURFACE = 'Pell — a fox of our cast';
/** How much larger than the seller's fox the buyer's is: another character, not the same file. */
const SCALE = 1.15;

export async function seed(knex: Knex) {
  const account = DEMO_ACCOUNTS.find((candidate) => candidate.roles.includes('buyer') && !candidate.roles.includes('groomer'));
  const user = account && (await knex('users').where({ email: account.email }).first('id'));
  if (!user) throw new Error('the demo buyer is missing: the accounts seed must run first');
  const studio = DEMO_STUDIOS.find((candidate) => candidate.slug === account!.studio)?.name ?? 'the buyer’s studio';
  const mesh = foxHead(4);
  const scaled = { ...mesh, positions: Float64Array.from(mesh.positions, (x) => x * SCALE) };
  try {
    const existed = await knex('growth_surfaces').where({ owner_id: user.id, name: DEMO_BUYER_SURFACE }).first('id');
    await seededSurface(knex, { userId: user.id }, { name: DEMO_BUYER_SURFACE, fileName: 'pell-fox-head.obj', obj: surfaceToObj(scaled, `Pell, a fox head of ${studio}`), units: 'cm' });
    console.log(`[buyer seed] ${existed ? 'the buyer’s surface was already there' : `surface “${DEMO_BUYER_SURFACE}” made`} for ${account!.email}.`);
  } finally {
    await stopJobs();
    await closeDb();
  }
}
