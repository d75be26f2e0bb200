// The pictures, preview and package of a listing update waiting for review, made by the same
// job as a listing's (lib/market/assets.ts's makeListingFiles) from the update's own row, under
// market/listings/<id>/versions/<version id>/, so the version on sale keeps its files until
// the update is approved. The package is kept on the update's row and joins listing_packages
// (one package per listing version) when an admin approves it.
import { db } from '../platform/db';
import { makeListingFiles, storedWithRetries, STORAGE_RETRY_DELAYS_MS, type AssetBuildOptions, type ListingFilesSource } from './assets';
import { listingPrefix } from './storage';

/** Where an update's files live (pictures, preview, package, the frozen surface). */
export const versionPrefix = (listingId: string, versionId: string) => `${listingPrefix(listingId)}/versions/${versionId}`;

/** Builds an update's files and marks its row ready, or failed with the reason; an update decided or gone meanwhile is left as it is. */
export async function buildListingVersionAssets(versionId: string, options: AssetBuildOptions = {}): Promise<void> {
  const stored = storedWithRetries(options.storageRetryDelaysMs ?? STORAGE_RETRY_DELAYS_MS);
  const version: (ListingFilesSource & { listing_id: string; review: string }) | undefined = await db()('listing_versions as v')
    .join('listings as l', 'l.id', 'v.listing_id')
    .join('users as u', 'u.id', 'l.seller_id')
    .join('licences as c', 'c.id', 'l.licence_id')
    .where('v.id', versionId)
    .first(
      'v.listing_id',
      'v.review',
      'l.title',
      'v.description',
      'v.spec',
      'v.surface_key',
      'v.surface_file_name',
      'v.formats',
      'v.groom_name',
      'v.version_number',
      'v.version_name',
      'v.ships_surface',
      'l.price_cents',
      'l.currency',
      'u.display_name as seller_name',
      'c.title as licence_title',
      'c.body as licence_body',
    );
  if (!version || version.review !== 'submitted') return;
  const prefix = versionPrefix(version.listing_id, versionId);
  try {
    const { guideCount, pictures, built, previewKey, measured } = await makeListingFiles(version, prefix, `${prefix}/package`, stored);
    await db()('listing_versions')
      .where({ id: versionId, review: 'submitted' })
      .update({
        assets_status: 'ready',
        assets_error: null,
        guide_count: guideCount,
        pictures: JSON.stringify(pictures),
        preview_key: previewKey,
        facts: JSON.stringify(measured.facts),
        guides_per_cm2: measured.guidesPerCm2,
        typical_length_cm: measured.typicalLengthCm,
        package_key: built!.object_key,
        package_file_name: built!.file_name,
        package_byte_size: built!.byte_size,
      });
  } catch (error) {
    const message = (error as Error).message ?? String(error);
    console.error(`[market] pictures and package of listing version ${versionId} failed: ${message}`);
    await db()('listing_versions').where({ id: versionId, review: 'submitted' }).update({ assets_status: 'failed', assets_error: message.slice(0, 2000) });
  }
}
