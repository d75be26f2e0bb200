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

export async function listLibrary(actor: Actor): Promise<LibraryItem[]> {
  const counts = db()('downloads').select('purchase_id').count('* as downloads').groupBy('purchase_id').as('d');
  const rows = await db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .join('users as s', 's.id', 'p.seller_id')
    .join('licences as c', 'c.id', 'l.licence_id')
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
      'l.title',
      'l.formats',
      'l.assets_status',
      's.display_name as seller_name',
      'c.slug as licence_slug',
      'c.title as licence_title',
      'p.listing_version',
      'p.update_seen_version',
      'l.current_version',
      'd.downloads',
    );
  const packages = await packagesOf(rows.map((row) => row.listing_id));
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
    packageReady: packages.has(`${row.listing_id}:${row.current_version}`),
    downloads: Number(row.downloads ?? 0),
    purchasedAt: row.created_at.toISOString(),
    refundedAt: row.refunded_at?.toISOString() ?? null,
    ...versionsOf(row, packages),
  }));
}

/** The listings' packages, as `listing id:version`. */
async function packagesOf(listingIds: string[]): Promise<Set<string>> {
  if (listingIds.length === 0) return new Set();
  const rows = await db()('listing_packages').whereIn('listing_id', [...new Set(listingIds)]).select('listing_id', 'listing_version');
  return new Set(rows.map((row) => `${row.listing_id}:${row.listing_version}`));
}

type VersionFacts = { listing_id: string; status: string; refund_id: string | null; listing_version: number; update_seen_version: number | null; current_version: number };

/** Whether the purchase still stands: paid, and no refund asked. Only then are any versions the owner's. */
const stands = (row: { status: string; refund_id: string | null }) => row.status === 'paid' && row.refund_id === null;

/** The versions an owner may download: the one bought and every later one the market approved. */
function versionsOf(row: VersionFacts, packages: Set<string>): Pick<LibraryItem, 'boughtVersion' | 'currentVersion' | 'versions' | 'updateNotice'> {
  const versions: LibraryItem['versions'] = [];
  if (stands(row)) {
    for (let number = row.current_version; number >= row.listing_version; number--) {
      versions.push({ number, packageReady: packages.has(`${row.listing_id}:${number}`) });
    }
  }
  const seen = row.update_seen_version ?? row.listing_version;
  return {
    boughtVersion: row.listing_version,
    currentVersion: row.current_version,
    versions,
    updateNotice: stands(row) && row.current_version > seen ? { number: row.current_version } : null,
  };
}

/**
 * A download of one version of the purchase's preset: by default the newest the owner may have,
 * otherwise `version`, which must be the one bought or a later approved one (404 otherwise).
 */
export async function requestDownload(actor: Actor, purchaseId: string, version?: number): Promise<DownloadLink> {
  const found = await db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .where({ 'p.id': purchaseId, 'p.buyer_id': actor.userId })
    .first('p.id', 'p.listing_id', 'p.status', 'p.refund_id', 'p.listing_version', 'l.current_version');
  if (!found) throw notFound('purchase');
  const wanted = version ?? found.current_version;
  if (wanted < found.listing_version || wanted > found.current_version) {
    throw new HttpError(404, 'not-found', `There is no version ${wanted} of this preset for you: you may download versions ${found.listing_version} to ${found.current_version}.`);
  }
  const pack = await db()('listing_packages').where({ listing_id: found.listing_id, listing_version: wanted }).first('object_key', 'file_name');
  const purchase = { ...found, object_key: pack?.object_key as string | undefined, file_name: pack?.file_name as string | undefined };
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
    // The newest version downloaded ends its notice in the library.
    await trx('purchases').where({ id: purchase.id }).update({ update_seen_version: trx.raw('greatest(coalesce(update_seen_version, listing_version), ?)', [wanted]) });
    return true;
  });
  if (!logged) throw new HttpError(403, 'refunded', 'This purchase was refunded: its files are no longer yours to download.');
  return {
    url: await presignDownload(purchase.object_key, DOWNLOAD_URL_SECONDS, purchase.file_name),
    fileName: purchase.file_name!,
    expiresInSeconds: DOWNLOAD_URL_SECONDS,
  };
}
