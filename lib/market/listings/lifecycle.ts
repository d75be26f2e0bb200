// Lifecycle commands of listings: a seller turns a saved groom version into a preset for sale,
// edits, submits and unlists it; an admin approves or rejects it. Which command may move a
// listing from which state is states.ts's table; every command asks it.
// A listing freezes the version it sells: the resolved spec and a copy of the growth surface file
// are stored with it, so later edits or deletion of the groom change nothing it sells. A listing
// on the market is improved by a new version of it instead (versions.ts).
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from '../../platform/db';
import { MailNotSent, sendMail } from '../../platform/mail';
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { notFound } from '../errors';
import { sellersGroomVersion } from '../groom-source';
import { enqueueListingAssets } from '../jobs';
import { listingApprovedMail, listingRejectedMail } from '../mail';
import { copyObject } from '../../platform/storage';
import { deleteMarketObjects, listingPrefix } from '../storage';
import type { ListingSummary } from '../types';
import type { ListingDraftInput, ListingPatchInput } from '../validation';
import { nextState } from './states';
import { confirmRightsAgain, frozenVersionColumns, rightsConfirmation, sellableSpec, surfaceRuleOf } from './version-rows';
import { summaryById, type ListingRow } from './views';

async function licenceBySlug(trx: Knex | Knex.Transaction, slug: string) {
  const licence = await trx('licences').where({ slug }).first('id', 'slug', 'title');
  if (!licence) {
    throw new HttpError(400, 'invalid-input', 'Some fields need another look.', {
      fields: { licenceSlug: 'Choose one of the market’s licences.' },
    });
  }
  return licence as { id: string; slug: string; title: string };
}

/** A draft from one of the seller's saved groom versions; its pictures and package are queued. */
export async function createListing(actor: Actor, input: ListingDraftInput): Promise<ListingSummary> {
  const version = await sellersGroomVersion(actor.userId, input.groomId, input.versionId);
  const spec = sellableSpec(version);
  const licence = await licenceBySlug(db(), input.licenceSlug);
  const id = randomUUID();
  const extension = version.surface.fileName.includes('.') ? version.surface.fileName.slice(version.surface.fileName.lastIndexOf('.')) : '';
  const surfaceKey = `${listingPrefix(id)}/surface${extension.toLowerCase()}`;
  await copyObject(version.surface.objectKey, surfaceKey);
  try {
    await db().transaction(async (trx) => {
      await trx('listings').insert({
        id,
        seller_id: actor.userId,
        ...frozenVersionColumns(version, spec, surfaceKey),
        title: input.title,
        description: input.description,
        animal: input.tags.animal,
        coat_length: input.tags.coatLength,
        style: input.tags.style,
        body_region: input.tags.bodyRegion,
        price_cents: input.priceCents,
        currency: input.currency,
        licence_id: licence.id,
        formats: input.formats,
        ships_surface: input.shipsSurface,
      });
      // Version 1 keeps the seller's confirmation of their rights (lib/market/rights.ts).
      await trx('listing_versions').insert({
        listing_id: id,
        number: 1,
        review: 'listing',
        ...frozenVersionColumns(version, spec, surfaceKey),
        description: input.description,
        formats: input.formats,
        ships_surface: input.shipsSurface,
        ...rightsConfirmation(actor),
      });
    });
  } catch (error) {
    await deleteMarketObjects([surfaceKey]);
    throw error;
  }
  await queueAssets(id);
  return summaryById(db(), id);
}

async function queueAssets(listingId: string) {
  try {
    await enqueueListingAssets(listingId);
  } catch (error) {
    // The listing stays `pending`; submitting or the admin's decision queues it again.
    console.error(`[market] could not queue the pictures of listing ${listingId}: ${(error as Error).message}`);
  }
}

/** The seller's own listing, locked for the change (404 for anyone else's). */
async function ownListingForUpdate(trx: Knex.Transaction, actor: Actor, id: string): Promise<ListingRow> {
  const row = await trx('listings').where({ id, seller_id: actor.userId }).forUpdate().first();
  if (!row) throw notFound('listing');
  return row;
}

/** Changes a draft (or a rejected or unlisted listing, which becomes a draft again). */
export async function updateListing(actor: Actor, id: string, patch: ListingPatchInput): Promise<ListingSummary> {
  const reassets = await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    const changes: Record<string, unknown> = { state: nextState(row.state, 'edit'), rejection_reason: null, updated_at: trx.fn.now() };
    if (patch.title !== undefined) changes.title = patch.title;
    if (patch.description !== undefined) changes.description = patch.description;
    if (patch.tags) {
      changes.animal = patch.tags.animal;
      changes.coat_length = patch.tags.coatLength;
      changes.style = patch.tags.style;
      changes.body_region = patch.tags.bodyRegion;
    }
    if (patch.priceCents !== undefined) changes.price_cents = patch.priceCents;
    if (patch.currency !== undefined) changes.currency = patch.currency;
    if (patch.formats !== undefined) changes.formats = patch.formats;
    if (patch.licenceSlug !== undefined) changes.licence_id = (await licenceBySlug(trx, patch.licenceSlug)).id;
    if (patch.shipsSurface !== undefined && patch.shipsSurface !== row.ships_surface) changes.ships_surface = patch.shipsSurface;
    // Checked when either side changes: a listing made before the tick keeps the files it was listed with until then.
    if (patch.formats !== undefined || patch.shipsSurface !== undefined) {
      surfaceRuleOf({ formats: patch.formats ?? row.formats, shipsSurface: patch.shipsSurface ?? row.ships_surface });
    }
    if (patch.rightsConfirmed) await confirmRightsAgain(trx, actor, row, patch);
    // The package carries the title, description, price, licence and formats: a changed
    // draft gets a new one. Once published a listing cannot change, so its package is final.
    const packageChanges = ['title', 'description', 'price_cents', 'currency', 'formats', 'licence_id', 'ships_surface'].some((key) => key in changes);
    if (packageChanges) {
      const hadSales = await trx('purchases').where({ listing_id: id }).first('id');
      if (hadSales) {
        throw new HttpError(409, 'wrong-state', 'This preset has buyers: its price and licence stay as sold. To improve its files or description, put it back on the market and publish a new version of it: its owners get that free.');
      }
      await trx('listing_packages').where({ listing_id: id, listing_version: row.current_version }).delete();
      changes.assets_status = 'pending';
      // A build running now sees the revision move on and builds again (lib/market/assets.ts).
      changes.revision = trx.raw('revision + 1');
    }
    await trx('listings').where({ id }).update(changes);
    return packageChanges;
  });
  if (reassets) await queueAssets(id);
  return summaryById(db(), id);
}

/** Sends the seller's listing to the admins' queue; its pictures and package are queued again if not made yet. */
export async function submitListing(actor: Actor, id: string): Promise<ListingSummary> {
  const pending = await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    await trx('listings').where({ id }).update({ state: nextState(row.state, 'submit'), rejection_reason: null, submitted_at: trx.fn.now(), updated_at: trx.fn.now() });
    return row.assets_status !== 'ready';
  });
  if (pending) await queueAssets(id);
  return summaryById(db(), id);
}

/** Takes the seller's submitted or published listing off the market. */
export async function unlistListing(actor: Actor, id: string): Promise<ListingSummary> {
  await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    await trx('listings').where({ id }).update({ state: nextState(row.state, 'unlist'), unlisted_at: trx.fn.now(), updated_at: trx.fn.now() });
  });
  return summaryById(db(), id);
}

/** The admin's approval or rejection of a submitted listing; the seller is told by e-mail. */
export async function decideListing(actor: Actor, id: string, decision: { approve: boolean; reason?: string }): Promise<ListingSummary> {
  const reason = decision.reason?.trim() ?? '';
  if (!decision.approve && reason === '') {
    throw new HttpError(400, 'invalid-input', 'Some fields need another look.', { fields: { reason: 'Tell the seller why.' } });
  }
  let requeue = false;
  try {
    await db().transaction(async (trx) => {
      const row: ListingRow | undefined = await trx('listings').where({ id }).forUpdate().first();
      if (!row) throw notFound('listing');
      const state = nextState(row.state, decision.approve ? 'approve' : 'reject');
      // Four eyes: nobody puts their own preset on sale (or turns it down) by themselves.
      if (row.seller_id === actor.userId) {
        throw new HttpError(403, 'own-listing', 'This is your own listing: another admin must approve or reject it.');
      }
      if (decision.approve && row.assets_status !== 'ready') {
        requeue = row.assets_status === 'pending';
        throw new HttpError(
          409,
          'assets-pending',
          row.assets_status === 'failed'
            ? `The pictures and files of this listing could not be made (${row.assets_error}); reject it with that reason.`
            : 'The pictures and files of this listing are still being made; try again in a minute.',
        );
      }
      const seller = await trx('users').where({ id: row.seller_id }).first('email');
      if (decision.approve) {
        await trx('listings')
          .where({ id })
          .update({ state, rejection_reason: null, decided_at: trx.fn.now(), published_at: trx.raw('coalesce(published_at, now())'), updated_at: trx.fn.now() });
        await sendMail(listingApprovedMail(seller.email, { id, title: row.title, priceCents: row.price_cents, currency: row.currency }));
      } else {
        await trx('listings').where({ id }).update({ state, rejection_reason: reason, decided_at: trx.fn.now(), updated_at: trx.fn.now() });
        await sendMail(listingRejectedMail(seller.email, { id, title: row.title }, reason));
      }
    });
  } catch (error) {
    if (requeue) await queueAssets(id);
    if (error instanceof MailNotSent) {
      throw new HttpError(502, 'mail-failed', `Nothing was changed: the e-mail to the seller could not be sent. ${error.message}`);
    }
    throw error;
  }
  return summaryById(db(), id);
}

