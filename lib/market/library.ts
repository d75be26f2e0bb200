// A buyer's library: their purchases with the files, and downloads. Each download is logged and
// answered with a presigned URL of the listing's package that lives 5 minutes; a refunded
// purchase (or one whose refund is under way) downloads nothing.
import { db } from '../platform/db';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import type { Actor } from '../accounts/actor';
import { enqueueListingAssets } from './jobs';
import { cardPictureUrl } from './listings';
import { presignDownload } from '../platform/storage';
import { DOWNLOAD_URL_SECONDS } from './storage';
import type { DownloadLink, LibraryItem } from './types';
import { latestRefundRequests } from './payments/refund-requests';

export async function listLibrary(actor: Actor): Promise<LibraryItem[]> {
  const counts = db()('downloads').select('purchase_id').count('* as downloads').groupBy('purchase_id').as('d');
  const rows = await db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .join('users as s', 's.id', 'p.seller_id')
    .join('licences as c', 'c.id', 'l.licence_id')
    .leftJoin('listing_packages as k', 'k.listing_id', 'p.listing_id')
    .leftJoin(counts, 'd.purchase_id', 'p.id')
    .where('p.buyer_id', actor.userId)
    .orderBy('p.created_at', 'desc')
    .select(
      'p.id',
      'p.listing_id',
      'p.amount_cents',
      'p.currency',
      'p.status',
      'p.refund_id',
      'p.created_at',
      'p.refunded_at',
      'p.cancellation_waived_at',
      'l.title',
      'l.formats',
      'l.assets_status',
      's.display_name as seller_name',
      'c.slug as licence_slug',
      'c.title as licence_title',
      'k.object_key',
      'd.downloads',
    );
  const requests = await latestRefundRequests(rows.map((row) => row.id));
  return rows.map((row) => ({
    purchaseId: row.id,
    listing: {
      id: row.listing_id,
      title: row.title,
      pictureUrl: cardPictureUrl({ id: row.listing_id, assets_status: row.assets_status }),
      formats: row.formats,
      seller: { displayName: row.seller_name },
    },
    licence: { slug: row.licence_slug, title: row.licence_title },
    amountCents: row.amount_cents,
    currency: row.currency,
    status: row.status,
    refundPending: row.status === 'paid' && row.refund_id !== null,
    packageReady: Boolean(row.object_key),
    downloads: Number(row.downloads ?? 0),
    purchasedAt: row.created_at.toISOString(),
    refundedAt: row.refunded_at?.toISOString() ?? null,
    refundRequest: requests.get(row.id) ?? null,
    cancellationWaived: row.cancellation_waived_at !== null,
  }));
}

export async function requestDownload(actor: Actor, purchaseId: string): Promise<DownloadLink> {
  const purchase = await db()('purchases as p')
    .leftJoin('listing_packages as k', 'k.listing_id', 'p.listing_id')
    .where({ 'p.id': purchaseId, 'p.buyer_id': actor.userId })
    .first('p.id', 'p.listing_id', 'p.status', 'p.refund_id', 'k.object_key', 'k.file_name');
  if (!purchase) throw notFound('purchase');
  if (purchase.status === 'refunded') throw new HttpError(403, 'refunded', 'This purchase was refunded: its files are no longer yours to download.');
  if (purchase.refund_id) throw new HttpError(403, 'refunded', 'This purchase is being refunded: its files are no longer yours to download.');
  if (!purchase.object_key) {
    await enqueueListingAssets(purchase.listing_id).catch(() => undefined);
    throw new HttpError(409, 'package-pending', 'The files of this preset are still being packed; try again in a minute.');
  }
  // Logged only while the purchase is still paid (a refund landing meanwhile wins).
  const logged = await db().transaction(async (trx) => {
    const still = await trx('purchases').where({ id: purchase.id, status: 'paid' }).whereNull('refund_id').forShare().first('id');
    if (!still) return false;
    await trx('downloads').insert({ purchase_id: purchase.id, listing_id: purchase.listing_id });
    return true;
  });
  if (!logged) throw new HttpError(403, 'refunded', 'This purchase was refunded: its files are no longer yours to download.');
  return {
    url: await presignDownload(purchase.object_key, DOWNLOAD_URL_SECONDS, purchase.file_name),
    fileName: purchase.file_name,
    expiresInSeconds: DOWNLOAD_URL_SECONDS,
  };
}
