// Listings: a seller turns a saved groom version into a preset for sale. States:
//   draft → submitted → published | rejected (with a reason);  published → unlisted;
//   rejected or unlisted → edited / submitted again.
// A listing freezes the version it sells: the resolved spec and a copy of the growth surface file
// are stored with it, so later edits or deletion of the groom change nothing it sells.
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from '../platform/db';
import { MailNotSent, sendMail } from '../platform/mail';
import { parseGroomSpec } from '../groom';
import type { Actor } from '../accounts/actor';
import { HttpError as MarketError } from '../http/errors';
import { notFound } from './errors';
import { sellersGroomVersion } from './groom-source';
import { enqueueListingAssets } from './jobs';
import { listingApprovedMail, listingRejectedMail } from './mail';
import { presignDownload as presignMarketObject } from '../platform/storage';
import { PICTURE_URL_SECONDS, copyObject, deleteMarketObjects, listingPrefix } from './storage';
import type { ListingCard, ListingDetail, ListingSummary, Review } from './types';
import type { ListingDraftInput, ListingPatchInput } from './validation';
import { TAX_NOTE, type ListingState } from './vocabulary';
import type { Picture } from './assets';

export type ListingRow = {
  id: string;
  seller_id: string;
  groom_id: string;
  groom_version_id: string;
  groom_name: string;
  version_number: number | null;
  version_name: string | null;
  title: string;
  description: string;
  animal: string;
  coat_length: string;
  style: string;
  body_region: string;
  price_cents: number;
  currency: string;
  licence_id: string;
  formats: string[];
  state: ListingState;
  rejection_reason: string | null;
  assets_status: 'pending' | 'ready' | 'failed';
  assets_error: string | null;
  guide_count: number | null;
  pictures: Picture[];
  sales_count: number;
  rating_count: number;
  rating_average: string | null;
  created_at: Date;
  submitted_at: Date | null;
  published_at: Date | null;
};

const isAdmin = (actor: Actor | null) => Boolean(actor?.roles.includes('admin'));

/** The route of the app that redirects to a listing's picture (anyone may follow it for a published listing). */
export function pictureRoute(listingId: string, view = 'front', size = 256): string {
  return `/api/market/listings/${listingId}/pictures/${view}-${size}`;
}

export function cardPictureUrl(row: { id: string; assets_status: string }): string | null {
  return row.assets_status === 'ready' ? pictureRoute(row.id) : null;
}

async function licenceBySlug(trx: Knex | Knex.Transaction, slug: string) {
  const licence = await trx('licences').where({ slug }).first('id', 'slug', 'title');
  if (!licence) {
    throw new MarketError(400, 'invalid-input', 'Some fields need another look.', {
      fields: { licenceSlug: 'Choose one of the market’s licences.' },
    });
  }
  return licence as { id: string; slug: string; title: string };
}

const SUMMARY_COLUMNS = [
  'l.id',
  'l.title',
  'l.state',
  'l.rejection_reason',
  'l.price_cents',
  'l.currency',
  'l.groom_name',
  'l.version_number',
  'l.assets_status',
  'l.assets_error',
  'l.created_at',
  'l.submitted_at',
  'l.published_at',
  'l.seller_id',
  'u.display_name as seller_name',
  'u.email as seller_email',
];

type SummaryRow = ListingRow & { seller_name: string; seller_email: string };

function summaryOf(row: SummaryRow): ListingSummary {
  return {
    id: row.id,
    title: row.title,
    state: row.state,
    rejectionReason: row.rejection_reason,
    priceCents: row.price_cents,
    currency: row.currency as ListingSummary['currency'],
    groomName: row.groom_name,
    versionNumber: row.version_number,
    seller: { id: row.seller_id, displayName: row.seller_name, email: row.seller_email },
    assets: { status: row.assets_status, error: row.assets_error },
    pictureUrl: cardPictureUrl(row),
    createdAt: row.created_at.toISOString(),
    submittedAt: row.submitted_at?.toISOString() ?? null,
    publishedAt: row.published_at?.toISOString() ?? null,
  };
}

async function summaryById(trx: Knex | Knex.Transaction, id: string): Promise<ListingSummary> {
  const row = await trx('listings as l').join('users as u', 'u.id', 'l.seller_id').where('l.id', id).first(SUMMARY_COLUMNS);
  return summaryOf(row);
}

/** A draft from one of the seller's saved groom versions; its pictures and package are queued. */
export async function createListing(actor: Actor, input: ListingDraftInput): Promise<ListingSummary> {
  const version = await sellersGroomVersion(actor.userId, input.groomId, input.versionId);
  let spec;
  try {
    spec = parseGroomSpec(version.spec);
  } catch (error) {
    throw new MarketError(422, 'invalid-input', `That version's groom spec cannot be sold as it is: ${(error as Error).message}`);
  }
  const licence = await licenceBySlug(db(), input.licenceSlug);
  const id = randomUUID();
  const extension = version.surface.fileName.includes('.') ? version.surface.fileName.slice(version.surface.fileName.lastIndexOf('.')) : '';
  const surfaceKey = `${listingPrefix(id)}/surface${extension.toLowerCase()}`;
  await copyObject(version.surface.objectKey, surfaceKey);
  try {
    await db()('listings').insert({
      id,
      seller_id: actor.userId,
      groom_id: version.groomId,
      groom_version_id: version.versionId,
      groom_name: version.groomName,
      version_number: version.versionNumber,
      version_name: version.versionName,
      spec: JSON.stringify(spec),
      surface_key: surfaceKey,
      surface_file_name: version.surface.fileName,
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

function wrongState(row: ListingRow, doing: string): MarketError {
  return new MarketError(409, 'wrong-state', `A ${row.state} listing cannot be ${doing}.`, { details: { state: row.state } });
}

/** Changes a draft (or a rejected or unlisted listing, which becomes a draft again). */
export async function updateListing(actor: Actor, id: string, patch: ListingPatchInput): Promise<ListingSummary> {
  const reassets = await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    if (!['draft', 'rejected', 'unlisted'].includes(row.state)) throw wrongState(row, 'edited; unlist it first');
    const changes: Record<string, unknown> = { state: 'draft', rejection_reason: null, updated_at: trx.fn.now() };
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
    // The package carries the title, description, price, licence and formats: a changed
    // draft gets a new one. Once published a listing cannot change, so its package is final.
    const packageChanges = ['title', 'description', 'price_cents', 'currency', 'formats', 'licence_id'].some((key) => key in changes);
    if (packageChanges) {
      const hadSales = await trx('purchases').where({ listing_id: id }).first('id');
      if (hadSales) {
        throw new MarketError(409, 'wrong-state', 'This preset has buyers: its files, price and licence stay as sold. Make a new listing for a changed offer.');
      }
      await trx('listing_packages').where({ listing_id: id }).delete();
      changes.assets_status = 'pending';
    }
    await trx('listings').where({ id }).update(changes);
    return packageChanges;
  });
  if (reassets) await queueAssets(id);
  return summaryById(db(), id);
}

export async function submitListing(actor: Actor, id: string): Promise<ListingSummary> {
  const pending = await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    if (!['draft', 'rejected', 'unlisted'].includes(row.state)) throw wrongState(row, 'submitted');
    await trx('listings').where({ id }).update({ state: 'submitted', rejection_reason: null, submitted_at: trx.fn.now(), updated_at: trx.fn.now() });
    return row.assets_status !== 'ready';
  });
  if (pending) await queueAssets(id);
  return summaryById(db(), id);
}

export async function unlistListing(actor: Actor, id: string): Promise<ListingSummary> {
  await db().transaction(async (trx) => {
    const row = await ownListingForUpdate(trx, actor, id);
    if (!['published', 'submitted'].includes(row.state)) throw wrongState(row, 'unlisted');
    await trx('listings').where({ id }).update({ state: 'unlisted', unlisted_at: trx.fn.now(), updated_at: trx.fn.now() });
  });
  return summaryById(db(), id);
}

/** The admin's approval or rejection of a submitted listing; the seller is told by e-mail. */
export async function decideListing(actor: Actor, id: string, decision: { approve: boolean; reason?: string }): Promise<ListingSummary> {
  const reason = decision.reason?.trim() ?? '';
  if (!decision.approve && reason === '') {
    throw new MarketError(400, 'invalid-input', 'Some fields need another look.', { fields: { reason: 'Tell the seller why.' } });
  }
  let requeue = false;
  try {
    await db().transaction(async (trx) => {
      const row: ListingRow | undefined = await trx('listings').where({ id }).forUpdate().first();
      if (!row) throw notFound('listing');
      if (row.state !== 'submitted') throw wrongState(row, 'decided on; only submitted ones are');
      if (decision.approve && row.assets_status !== 'ready') {
        requeue = row.assets_status === 'pending';
        throw new MarketError(
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
          .update({ state: 'published', rejection_reason: null, decided_at: trx.fn.now(), published_at: trx.raw('coalesce(published_at, now())'), updated_at: trx.fn.now() });
        await sendMail(listingApprovedMail(seller.email, { id, title: row.title, priceCents: row.price_cents, currency: row.currency }));
      } else {
        await trx('listings').where({ id }).update({ state: 'rejected', rejection_reason: reason, decided_at: trx.fn.now(), updated_at: trx.fn.now() });
        await sendMail(listingRejectedMail(seller.email, { id, title: row.title }, reason));
      }
    });
  } catch (error) {
    if (requeue) await queueAssets(id);
    if (error instanceof MailNotSent) {
      throw new MarketError(502, 'mail-failed', `Nothing was changed: the e-mail to the seller could not be sent. ${error.message}`);
    }
    throw error;
  }
  return summaryById(db(), id);
}

export async function listOwnListings(actor: Actor): Promise<ListingSummary[]> {
  const rows = await db()('listings as l')
    .join('users as u', 'u.id', 'l.seller_id')
    .where('l.seller_id', actor.userId)
    .orderBy('l.created_at', 'desc')
    .select(SUMMARY_COLUMNS);
  return rows.map(summaryOf);
}

/** The admin's queue: listings in one state, oldest submission first. */
export async function listListingsForAdmin(state: ListingState): Promise<ListingSummary[]> {
  const rows = await db()('listings as l')
    .join('users as u', 'u.id', 'l.seller_id')
    .where('l.state', state)
    .orderByRaw('l.submitted_at ASC NULLS LAST, l.created_at ASC')
    .limit(500)
    .select(SUMMARY_COLUMNS);
  return rows.map(summaryOf);
}

/** Published listings to anyone; any state to the seller and admins; 404 otherwise. */
async function visibleListing(actor: Actor | null, id: string) {
  const row = await db()('listings as l')
    .join('users as u', 'u.id', 'l.seller_id')
    .join('licences as c', 'c.id', 'l.licence_id')
    .where('l.id', id)
    .first(
      'l.*',
      'u.display_name as seller_name',
      'c.slug as licence_slug',
      'c.title as licence_title',
      'c.summary as licence_summary',
      'c.body as licence_body',
    );
  if (!row) throw notFound('listing');
  if (row.state !== 'published' && row.seller_id !== actor?.userId && !isAdmin(actor)) throw notFound('listing');
  return row as ListingRow & { seller_name: string; licence_slug: string; licence_title: string; licence_summary: string; licence_body: string };
}

export function cardOf(
  row: ListingRow & { seller_name: string; licence_slug: string; licence_title: string },
): ListingCard {
  return {
    id: row.id,
    title: row.title,
    priceCents: row.price_cents,
    currency: row.currency as ListingCard['currency'],
    tags: {
      animal: row.animal as ListingCard['tags']['animal'],
      coatLength: row.coat_length as ListingCard['tags']['coatLength'],
      style: row.style as ListingCard['tags']['style'],
      bodyRegion: row.body_region as ListingCard['tags']['bodyRegion'],
    },
    formats: row.formats as ListingCard['formats'],
    guideCount: row.guide_count,
    salesCount: row.sales_count,
    rating: { average: row.rating_average === null ? null : Number(row.rating_average), count: row.rating_count },
    seller: { id: row.seller_id, displayName: row.seller_name },
    licence: { slug: row.licence_slug, title: row.licence_title },
    pictureUrl: cardPictureUrl(row),
    publishedAt: row.published_at?.toISOString() ?? null,
  };
}

export async function getListingDetail(actor: Actor | null, id: string): Promise<ListingDetail> {
  const row = await visibleListing(actor, id);
  const [reviewRows, purchase] = await Promise.all([
    db()('reviews as r')
      .join('users as u', 'u.id', 'r.buyer_id')
      .where('r.listing_id', id)
      .orderBy('r.updated_at', 'desc')
      .limit(50)
      .select('r.id', 'r.rating', 'r.body', 'r.created_at', 'r.updated_at', 'r.buyer_id', 'u.display_name'),
    actor ? db()('purchases').where({ listing_id: id, buyer_id: actor.userId, status: 'paid' }).first('id') : undefined,
  ]);
  const pictures: Picture[] = row.assets_status === 'ready' ? row.pictures : [];
  const gallery = await Promise.all(
    pictures.map(async (picture) => ({ view: picture.view, size: picture.size, url: await presignMarketObject(picture.key, PICTURE_URL_SECONDS) })),
  );
  const reviews: Review[] = reviewRows.map((r) => ({
    id: r.id,
    rating: r.rating,
    body: r.body,
    buyer: { displayName: r.display_name },
    createdAt: r.created_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
    mine: r.buyer_id === actor?.userId,
  }));
  const isSeller = row.seller_id === actor?.userId;
  const owns = Boolean(purchase);
  return {
    ...cardOf(row),
    description: row.description,
    state: row.state,
    rejectionReason: row.rejection_reason,
    groom: { id: row.groom_id, name: row.groom_name, versionId: row.groom_version_id, versionNumber: row.version_number, versionName: row.version_name },
    gallery,
    guidePreviewUrl: row.assets_status === 'ready' ? await presignMarketObject(`${listingPrefix(id)}/preview/guides.glb`, PICTURE_URL_SECONDS) : null,
    assets: { status: row.assets_status, error: isSeller || isAdmin(actor) ? row.assets_error : null },
    licence: { slug: row.licence_slug, title: row.licence_title, summary: row.licence_summary, body: row.licence_body },
    reviews,
    viewer: {
      isSeller,
      owns,
      purchaseId: purchase?.id ?? null,
      mayBuy: Boolean(actor) && !isSeller && !owns && row.state === 'published',
      mayReview: owns,
    },
    taxNote: TAX_NOTE,
    createdAt: row.created_at.toISOString(),
    submittedAt: row.submitted_at?.toISOString() ?? null,
  };
}

/** A short-lived URL of one picture (`front-256`, `side-1024`, …) of a listing the caller may see. */
export async function pictureUrl(actor: Actor | null, id: string, name: string): Promise<string> {
  const row = await visibleListing(actor, id);
  const picture = (row.assets_status === 'ready' ? row.pictures : []).find((p) => `${p.view}-${p.size}` === name);
  if (!picture) throw new MarketError(404, 'not-found', 'There is no such picture of this listing.');
  return presignMarketObject(picture.key, PICTURE_URL_SECONDS);
}
