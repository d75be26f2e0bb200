// "Try it on": before buying, a signed-in buyer sees a published preset carried onto one of their
// own surfaces — the transfer report, pictures and a reduced 3D preview (trial-preview.ts), all
// made by a job whose stage the page shows. Each trial reads and prepares two surfaces and grows a
// coat, so trials are limited per buyer, as account mail is (lib/accounts/mail-limits.ts): rows
// counted in a window under an advisory lock per person, so the limit holds across server
// processes, and a refused request records nothing (waiting always lifts the limit).
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { countWithinMinutes, db, lockUntilCommit } from '../../platform/db';
import { notFound } from '../errors';
import type { PresetTransferView } from '../types';
import { readySurfaceOf } from './fit';
import { queuedTransfer, transferView } from './transfers';

/** Trials one buyer may start within the window. Common practice, no source: a few surfaces times a few presets, far too few to mine the market. */
export const TRIALS_PER_BUYER = 12;
export const TRIAL_WINDOW_MINUTES = 60;

export const TOO_MANY_TRIALS = `You have tried ${TRIALS_PER_BUYER} presets on your surfaces in the last ${TRIAL_WINDOW_MINUTES} minutes, the most the market makes for one person in that time. Try again later, or look again at the trials you already made.`;

/**
 * Starts a trial of a published listing on one of the caller's ready surfaces: 404 for a listing
 * that is not on the market, 403 for the seller's own, 429 past the limit (nothing recorded then).
 */
export async function startTrial(actor: Actor, listingId: string, surfaceId: string): Promise<PresetTransferView> {
  const listing = await db()('listings').where({ id: listingId, state: 'published' }).first('id', 'seller_id');
  if (!listing) throw notFound('listing');
  if (listing.seller_id === actor.userId) throw new HttpError(403, 'own-listing', 'This is your own preset: open it in the studio instead of trying it.');
  const surface = await readySurfaceOf(actor, surfaceId);
  const id = await db().transaction(async (trx) => {
    await lockUntilCommit(trx, `market-trials:${actor.userId}`);
    if ((await countWithinMinutes(trx, 'preset_transfers', { buyer_id: actor.userId, kind: 'trial' }, 'created_at', TRIAL_WINDOW_MINUTES)) >= TRIALS_PER_BUYER) throw new HttpError(429, 'too-many-requests', TOO_MANY_TRIALS);
    const [row] = await trx('preset_transfers').insert({ kind: 'trial', buyer_id: actor.userId, listing_id: listing.id, target_surface_id: surface.id }).returning('id');
    return row.id as string;
  });
  return queuedTransfer(actor, id, 'trial');
}

/** The buyer's trial as it stands: its stage, and once done the report, pictures and reduced preview. */
export function getTrial(actor: Actor, trialId: string): Promise<PresetTransferView> {
  return transferView(actor, trialId, 'trial');
}
