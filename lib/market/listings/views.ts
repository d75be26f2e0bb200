// Read models of listings: the seller's and the admin's summaries, the public card and the
// detail page (what each viewer may see of a listing in which state), and its pictures' URLs.
import type { Knex } from 'knex';
import { db } from '../../platform/db';
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { notFound } from '../errors';
import { presignDownload } from '../../platform/storage';
import { PICTURE_URL_SECONDS } from '../storage';
import type { ListingCard, ListingDetail, ListingFacts, ListingSummary, Review } from '../types';
import { TAX_NOTE, type ListingState } from '../vocabulary';
import type { Picture } from '../assets';

/** A row of the `listings` table as the commands and the read models load it. */
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
  /** The reduced public preview (assets.ts); null until the asset job has written it. */
  preview_key: string | null;
  /** What the listing is (listing-facts.ts); null until the asset job has measured it. */
  facts: ListingFacts | null;
  sales_count: number;
  rating_count: number;
  rating_average: string | null;
  created_at: Date;
  submitted_at: Date | null;
  published_at: Date | null;
  // Listing versions (db/migrations/20261208300000_listing_versions.ts).
  spec: unknown;
  surface_key: string;
  surface_file_name: string;
  roots_surface_key: string | null;
  roots_surface_file_name: string | null;
  current_version: number;
  ships_surface: boolean;
};

const isAdmin = (actor: Actor | null) => Boolean(actor?.roles.includes('admin'));

/** The route of the app that redirects to a listing's picture (anyone may follow it for a published listing). */
export function pictureRoute(listingId: string, view = 'front', size = 256): string {
  return `/api/market/listings/${listingId}/pictures/${view}-${size}`;
}

/** The card's picture (the front at 256 px) once the listing's pictures are made; null before. */
export function cardPictureUrl(row: { id: string; assets_status: string }): string | null {
  return row.assets_status === 'ready' ? pictureRoute(row.id) : null;
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

/** The summary of one listing as the seller and the admin see it (after a command). */
export async function summaryById(trx: Knex | Knex.Transaction, id: string): Promise<ListingSummary> {
  const row = await trx('listings as l').join('users as u', 'u.id', 'l.seller_id').where('l.id', id).first(SUMMARY_COLUMNS);
  return summaryOf(row);
}

/** The seller's own listings in every state, newest first. */
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

/** The listing as a card: a search result, and the start of its detail page. */
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
    // Only once the assets are ready: a failed rebuild leaves no facts of an older revision showing.
    facts: row.assets_status === 'ready' ? (row.facts ?? null) : null,
    salesCount: row.sales_count,
    rating: { average: row.rating_average === null ? null : Number(row.rating_average), count: row.rating_count },
    seller: { id: row.seller_id, displayName: row.seller_name },
    licence: { slug: row.licence_slug, title: row.licence_title },
    pictureUrl: cardPictureUrl(row),
    publishedAt: row.published_at?.toISOString() ?? null,
  };
}

/** The listing's page for this viewer: what they may do with it; the pictures' error only to its seller and admins. */
export async function getListingDetail(actor: Actor | null, id: string): Promise<ListingDetail> {
  const row = await visibleListing(actor, id);
  const [reviewRows, purchase] = await Promise.all([
    db()('reviews as r')
      .join('users as u', 'u.id', 'r.buyer_id')
      .where('r.listing_id', id)
      .whereNull('r.withdrawn_at')
      .orderBy('r.updated_at', 'desc')
      .limit(50)
      .select('r.id', 'r.rating', 'r.body', 'r.created_at', 'r.updated_at', 'r.buyer_id', 'u.display_name'),
    actor ? db()('purchases').where({ listing_id: id, buyer_id: actor.userId, status: 'paid' }).first('id') : undefined,
  ]);
  const pictures: Picture[] = row.assets_status === 'ready' ? row.pictures : [];
  const gallery = await Promise.all(
    pictures.map(async (picture) => ({ view: picture.view, size: picture.size, url: await presignDownload(picture.key, PICTURE_URL_SECONDS) })),
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
    // Only the reduced preview is ever presigned; a listing not rebuilt since it has none yet.
    guidePreviewUrl: row.assets_status === 'ready' && row.preview_key ? await presignDownload(row.preview_key, PICTURE_URL_SECONDS) : null,
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
    currentVersion: row.current_version,
    shipsSurface: row.ships_surface,
  };
}

/** A short-lived URL of one picture (`front-256`, `side-1024`, …) of a listing the caller may see. */
export async function pictureUrl(actor: Actor | null, id: string, name: string): Promise<string> {
  const row = await visibleListing(actor, id);
  const picture = (row.assets_status === 'ready' ? row.pictures : []).find((p) => `${p.view}-${p.size}` === name);
  if (!picture) throw new HttpError(404, 'not-found', 'There is no such picture of this listing.');
  return presignDownload(picture.key, PICTURE_URL_SECONDS);
}
