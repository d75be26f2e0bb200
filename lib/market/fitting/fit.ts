// "Fit to my character": a buyer opens a preset they bought on one of their own growth surfaces.
// The listing's frozen spec is carried over by a job (transfers.ts) whose report the buyer reads
// first (what landed where, what did not carry over, the index budget); accepting it makes a groom
// of theirs in the studio, marked with the purchase (grooms.from_purchase_id), so that it and its
// copies are never offered for sale (lib/market/listings/lifecycle.ts refuses them). A purchase
// refunded, or being refunded, can no longer be fitted: its licence is gone.
import type { Knex } from 'knex';
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { db } from '../../platform/db';
import { enqueueThumbnail } from '../../studio/jobs';
import { getGroom, GROOM_NAME_MAX } from '../../studio/grooms';
import { ownSurfaceRow, type SurfaceRow } from '../../studio/surfaces';
import type { GroomDetail } from '../../studio/types';
import { notFound } from '../errors';
import type { PresetTransferView } from '../types';
import { queuedTransfer, transferView, type TransferRow } from './transfers';

/** One of the caller's own surfaces that has passed its check; someone else's is a 404. */
export async function readySurfaceOf(actor: Actor, surfaceId: string): Promise<SurfaceRow> {
  const row = await ownSurfaceRow(actor, surfaceId);
  if (row.state !== 'ready') {
    throw new HttpError(409, 'surface-not-ready', row.state === 'checking' ? `${row.name} is still being checked; try the preset on it once it is ready.` : `${row.name} was refused by its check and cannot carry a groom.`);
  }
  return row;
}

type PurchaseRow = { id: string; listing_id: string; status: string; refund_id: string | null };

/** The caller's own purchase that may still be used: 404 for anyone else's, 403 once refunded or while a refund is under way. */
async function usablePurchase(connection: Knex | Knex.Transaction, actor: Actor, purchaseId: string, lock = false): Promise<PurchaseRow> {
  const query = connection('purchases').where({ id: purchaseId, buyer_id: actor.userId });
  const row: PurchaseRow | undefined = await (lock ? query.forShare() : query).first('id', 'listing_id', 'status', 'refund_id');
  if (!row) throw notFound('purchase');
  if (row.status === 'refunded') throw new HttpError(403, 'refunded', 'This purchase was refunded: its licence has ended, so the preset can no longer be fitted to your surfaces.');
  if (row.refund_id) throw new HttpError(403, 'refunded', 'This purchase is being refunded: the preset can no longer be fitted to your surfaces.');
  return row;
}

/** Starts carrying the bought preset onto one of the buyer's ready surfaces; the job's row is read with getFit. */
export async function startFit(actor: Actor, purchaseId: string, surfaceId: string): Promise<PresetTransferView> {
  const purchase = await usablePurchase(db(), actor, purchaseId);
  const surface = await readySurfaceOf(actor, surfaceId);
  const [{ id }] = await db()('preset_transfers')
    .insert({ kind: 'fit', buyer_id: actor.userId, listing_id: purchase.listing_id, purchase_id: purchase.id, target_surface_id: surface.id })
    .returning('id');
  return queuedTransfer(actor, id, 'fit');
}

/** The buyer's fit as it stands: its stage, and once done the transfer report. */
export function getFit(actor: Actor, fitId: string): Promise<PresetTransferView> {
  return transferView(actor, fitId, 'fit');
}

/**
 * Accepts a finished fit: a groom of the buyer's on the fit's surface with the carried spec, marked
 * with the purchase. Accepting the same fit again answers the groom it made. Refused (403) when the
 * purchase was refunded meanwhile, 409 when the fit is not done.
 */
export async function acceptFit(actor: Actor, fitId: string, name?: string): Promise<GroomDetail> {
  const groomId = await db().transaction(async (trx) => {
    const fit: TransferRow | undefined = await trx('preset_transfers').where({ id: fitId, buyer_id: actor.userId, kind: 'fit' }).forUpdate().first();
    if (!fit) throw notFound('fit');
    if (fit.groom_id) return fit.groom_id;
    if (fit.status === 'failed') throw new HttpError(409, 'transfer-refused', fit.error ?? 'The preset could not be fitted to that surface.');
    if (fit.status !== 'done') throw new HttpError(409, 'wrong-state', 'The preset is still being fitted; accept it once the transfer report is there.');
    await usablePurchase(trx, actor, fit.purchase_id!, true);
    const surface = await trx('growth_surfaces').where({ id: fit.target_surface_id, owner_id: actor.userId }).first('name');
    if (!surface) throw notFound('surface');
    const listing = await trx('listings').where({ id: fit.listing_id }).first('title');
    const groomName = name ?? `${String(listing.title).slice(0, GROOM_NAME_MAX - surface.name.length - 4)} on ${surface.name}`.slice(0, GROOM_NAME_MAX);
    const [{ id }] = await trx('grooms')
      .insert({ owner_id: actor.userId, surface_id: fit.target_surface_id, from_purchase_id: fit.purchase_id, name: groomName, spec: JSON.stringify(fit.spec) })
      .returning('id');
    await trx('preset_transfers').where({ id: fit.id }).update({ groom_id: id, updated_at: trx.fn.now() });
    return id as string;
  });
  await enqueueThumbnail({ groomId });
  return getGroom(actor, groomId);
}
