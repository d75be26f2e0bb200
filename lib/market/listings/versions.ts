// Updates to owners: the seller of a published listing publishes a new version of it (a newer
// groom version, a new description or files), which waits in the admins' queue while the version
// on sale stays on sale. On approval the update's content, pictures and package become the
// listing's, its package joins the listing's packages (one per version), and every owner — a
// paid purchase not refunded nor being refunded — gets it free: a notice in their library and an
// e-mail. A purchase remembers the version it bought, so an owner can still download that one.
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from '../../platform/db';
import { MailNotSent, sendMail } from '../../platform/mail';
import { presignDownload } from '../../platform/storage';
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { notFound } from '../errors';
import { freezeSurfaces, frozenKeys, sellersGroomVersion } from '../groom-source';
import { enqueueListingVersionAssets } from '../jobs';
import { listingVersionApprovedMail, listingVersionRejectedMail, ownerUpdateMail, sendMailLogged } from '../mail';
import { deleteMarketObjects, PICTURE_URL_SECONDS } from '../storage';
import type { ListingVersionSummary } from '../types';
import type { ListingVersionInput } from '../validation';
import { versionPrefix } from '../version-assets';
import type { Picture } from '../assets';
import { frozenVersionColumns, rightsConfirmation, sellableSpec } from './version-rows';

const isAdmin = (actor: Actor) => actor.roles.includes('admin');

const VERSION_COLUMNS = [
  'v.*',
  'l.title as listing_title',
  'l.current_version',
  'l.seller_id',
  'u.display_name as seller_name',
  'u.email as seller_email',
];

type VersionRow = {
  id: string;
  listing_id: string;
  listing_title: string;
  number: number;
  current_version: number;
  review: ListingVersionSummary['review'];
  rejection_reason: string | null;
  groom_id: string;
  groom_name: string;
  version_number: number | null;
  version_name: string | null;
  description: string;
  formats: ListingVersionSummary['formats'];
  notes: string;
  ships_surface: boolean;
  rights_confirmed_at: Date | null;
  rights_wording_version: string | null;
  assets_status: 'pending' | 'ready' | 'failed';
  assets_error: string | null;
  pictures: Picture[];
  seller_id: string;
  seller_name: string;
  seller_email: string;
  created_at: Date;
  submitted_at: Date | null;
  decided_at: Date | null;
};

const versionRows = (trx: Knex | Knex.Transaction) =>
  trx('listing_versions as v').join('listings as l', 'l.id', 'v.listing_id').join('users as u', 'u.id', 'l.seller_id');

async function summaryOf(row: VersionRow): Promise<ListingVersionSummary> {
  const front = row.assets_status === 'ready' ? row.pictures.find((p) => p.view === 'front' && p.size === 256) : undefined;
  return {
    id: row.id,
    listingId: row.listing_id,
    listingTitle: row.listing_title,
    number: row.number,
    review: row.review,
    rejectionReason: row.rejection_reason,
    onSale: row.number === row.current_version && row.review !== 'rejected' && row.review !== 'submitted',
    groom: { id: row.groom_id, name: row.groom_name, versionNumber: row.version_number, versionName: row.version_name },
    description: row.description,
    formats: row.formats,
    notes: row.notes,
    shipsSurface: row.ships_surface,
    rights: row.rights_confirmed_at ? { confirmedAt: row.rights_confirmed_at.toISOString(), wordingVersion: row.rights_wording_version! } : null,
    assets: { status: row.assets_status, error: row.assets_error },
    pictureUrl: front ? await presignDownload(front.key, PICTURE_URL_SECONDS) : null,
    seller: { id: row.seller_id, displayName: row.seller_name, email: row.seller_email },
    createdAt: row.created_at.toISOString(),
    submittedAt: row.submitted_at?.toISOString() ?? null,
    decidedAt: row.decided_at?.toISOString() ?? null,
  };
}

async function versionById(trx: Knex | Knex.Transaction, id: string): Promise<ListingVersionSummary> {
  return summaryOf(await versionRows(trx).where('v.id', id).first(VERSION_COLUMNS));
}

/**
 * A new version of the seller's published listing, sent to the admins' queue at once; its files
 * are queued. 409 when the listing is not on the market or an update already waits.
 */
export async function createListingVersion(actor: Actor, listingId: string, input: ListingVersionInput): Promise<ListingVersionSummary> {
  const listing = await db()('listings').where({ id: listingId, seller_id: actor.userId }).first('id', 'state');
  if (!listing) throw notFound('listing');
  if (listing.state !== 'published') {
    throw new HttpError(409, 'wrong-state', `A ${listing.state} listing takes no new versions: only a listing on the market does. Edit it instead.`, {
      details: { state: listing.state },
    });
  }
  const source = await sellersGroomVersion(actor.userId, input.groomId, input.versionId);
  const spec = sellableSpec(source);
  const id = randomUUID();
  const frozen = await freezeSurfaces(source, versionPrefix(listingId, id));
  try {
    await db().transaction(async (trx) => {
      const locked = await trx('listings').where({ id: listingId }).forUpdate().first('state', 'current_version');
      if (locked.state !== 'published') throw new HttpError(409, 'wrong-state', `A ${locked.state} listing takes no new versions.`, { details: { state: locked.state } });
      const waiting = await trx('listing_versions').where({ listing_id: listingId, review: 'submitted' }).first('number');
      if (waiting) {
        throw new HttpError(409, 'wrong-state', `Version ${waiting.number} of this listing is still waiting for review: wait for the admins' decision first.`);
      }
      await trx('listing_versions').insert({
        id,
        listing_id: listingId,
        number: locked.current_version + 1,
        review: 'submitted',
        ...frozenVersionColumns(source, spec, frozen),
        description: input.description,
        formats: input.formats,
        notes: input.notes,
        ships_surface: input.shipsSurface,
        ...rightsConfirmation(actor),
        submitted_at: trx.fn.now(),
      });
    });
  } catch (error) {
    await deleteMarketObjects(frozenKeys(frozen));
    throw error;
  }
  try {
    await enqueueListingVersionAssets(listingId, id);
  } catch (error) {
    // Left pending: a job worker's start queues it again (lib/market/workers.ts).
    console.error(`[market] could not queue the files of listing version ${id}: ${(error as Error).message}`);
  }
  return versionById(db(), id);
}

/** Every version of a listing, newest first: to its seller and to admins (404 for anyone else). */
export async function listListingVersions(actor: Actor, listingId: string): Promise<ListingVersionSummary[]> {
  const listing = await db()('listings').where({ id: listingId }).first('seller_id');
  if (!listing || (listing.seller_id !== actor.userId && !isAdmin(actor))) throw notFound('listing');
  const rows: VersionRow[] = await versionRows(db()).where('v.listing_id', listingId).orderBy([{ column: 'v.number', order: 'desc' }, { column: 'v.created_at', order: 'desc' }]).select(VERSION_COLUMNS);
  return Promise.all(rows.map(summaryOf));
}

/** The admins' queue of updates, oldest first. */
export async function listVersionsForAdmin(): Promise<ListingVersionSummary[]> {
  const rows: VersionRow[] = await versionRows(db()).where('v.review', 'submitted').orderBy('v.submitted_at').limit(500).select(VERSION_COLUMNS);
  return Promise.all(rows.map(summaryOf));
}

type Owner = { purchase_id: string; email: string; listing_version: number };

/**
 * The admin's decision on an update. Approval makes it the listing's version on sale and mails
 * every owner after the commit (a failed owner mail is logged: the update is in their library
 * either way); the seller's mail is sent inside the transaction, so nothing changes without it.
 */
export async function decideListingVersion(actor: Actor, versionId: string, decision: { approve: boolean; reason?: string }): Promise<ListingVersionSummary> {
  const reason = decision.reason?.trim() ?? '';
  if (!decision.approve && reason === '') {
    throw new HttpError(400, 'invalid-input', 'Some fields need another look.', { fields: { reason: 'Tell the seller why.' } });
  }
  let owners: Owner[] = [];
  let announced: { title: string; number: number; notes: string } | null = null;
  try {
    await db().transaction(async (trx) => {
      const version = await trx('listing_versions').where({ id: versionId }).forUpdate().first();
      if (!version) throw notFound('listing version');
      const listing = await trx('listings').where({ id: version.listing_id }).forUpdate().first('id', 'seller_id', 'title', 'revision', 'current_version');
      if (version.review !== 'submitted') {
        throw new HttpError(409, 'wrong-state', `Version ${version.number} was already decided on; only updates waiting for review are.`, { details: { review: version.review } });
      }
      if (listing.seller_id === actor.userId) {
        throw new HttpError(403, 'own-listing', 'This is your own listing: another admin must approve or reject its update.');
      }
      const seller = await trx('users').where({ id: listing.seller_id }).first('email');
      if (!decision.approve) {
        await trx('listing_versions').where({ id: versionId }).update({ review: 'rejected', rejection_reason: reason, decided_at: trx.fn.now() });
        await sendMail(listingVersionRejectedMail(seller.email, { listingId: listing.id, title: listing.title, number: version.number }, reason));
        return;
      }
      if (version.assets_status !== 'ready') {
        throw new HttpError(
          409,
          'assets-pending',
          version.assets_status === 'failed'
            ? `The pictures and files of this version could not be made (${version.assets_error}); reject it with that reason.`
            : 'The pictures and files of this version are still being made; try again in a minute.',
        );
      }
      await trx('listings')
        .where({ id: listing.id })
        .update({
          groom_id: version.groom_id,
          groom_version_id: version.groom_version_id,
          groom_name: version.groom_name,
          version_number: version.version_number,
          version_name: version.version_name,
          spec: JSON.stringify(version.spec),
          surface_key: version.surface_key,
          surface_file_name: version.surface_file_name,
          roots_surface_key: version.roots_surface_key,
          roots_surface_file_name: version.roots_surface_file_name,
          description: version.description,
          formats: version.formats,
          ships_surface: version.ships_surface,
          guide_count: version.guide_count,
          pictures: JSON.stringify(version.pictures),
          preview_key: version.preview_key,
          facts: version.facts === null ? null : JSON.stringify(version.facts),
          guides_per_cm2: version.guides_per_cm2,
          typical_length_cm: version.typical_length_cm,
          assets_status: 'ready',
          assets_error: null,
          current_version: version.number,
          updated_at: trx.fn.now(),
        });
      await trx('listing_packages').insert({
        listing_id: listing.id,
        listing_version: version.number,
        groom_version_id: version.groom_version_id,
        listing_revision: listing.revision,
        object_key: version.package_key,
        file_name: version.package_file_name,
        byte_size: version.package_byte_size,
      });
      await trx('listing_versions').where({ id: versionId }).update({ review: 'approved', decided_at: trx.fn.now() });
      // Owners: paid, and no refund asked or done (a refunded buyer gets neither the notice nor the version).
      owners = await trx('purchases as p')
        .join('users as b', 'b.id', 'p.buyer_id')
        .where({ 'p.listing_id': listing.id, 'p.status': 'paid' })
        .whereNull('p.refund_id')
        .select('p.id as purchase_id', 'b.email', 'p.listing_version');
      announced = { title: listing.title, number: version.number, notes: version.notes };
      await sendMail(listingVersionApprovedMail(seller.email, { listingId: listing.id, title: listing.title, number: version.number, owners: owners.length }));
    });
  } catch (error) {
    if (error instanceof MailNotSent) {
      throw new HttpError(502, 'mail-failed', `Nothing was changed: the e-mail to the seller could not be sent. ${error.message}`);
    }
    throw error;
  }
  const update = announced as { title: string; number: number; notes: string } | null;
  if (update) {
    for (const owner of owners) await sendMailLogged(ownerUpdateMail(owner.email, { ...update, boughtNumber: owner.listing_version }));
  }
  return versionById(db(), versionId);
}
