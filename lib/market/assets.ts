// What a listing shows and sells, made from its frozen version by a background job: pictures
// (front, side, top at 256² and 1024², WebP), the public guide preview (.glb: a reduced asset of
// its own, see previewGuides in lib/groom — never the package's guides), the guide count, and the
// package zip (the promised export files, the licence in full and a README). The package is built
// once per listing revision (the revision moves on with every edit that changes the package); a
// second run of the job keeps the first.
//
// Two things can go wrong while it builds, and neither leaves a wrong or failed listing behind:
//   - the seller edits the listing meanwhile: the job notices at the end (the revision it read is
//     no longer the listing's, checked under the row's lock) and builds again from the edit;
//   - object storage blips: each storage call is tried again after growing pauses (the SDK's own
//     quick retries come first); the listing is marked failed only after the last try, or at
//     once for an error that a retry cannot mend (a missing object, a bad spec).
import { strToU8, zipSync, type Zippable } from 'fflate';
import { checkSurfaceFile, readSurface } from '../field';
import {
  coatFacts,
  EXPORT_FORMAT_FACTS,
  growGuides,
  parseGroomSpec,
  previewGuides,
  previewToGlb,
  prepareGroomSurface,
  renderThumbnail,
  solveGroomField,
  THUMBNAIL_VIEWS,
  writeExport,
  type ExportSource,
  type GroomMade,
  type ThumbnailView,
} from '../groom';
import { encodeImage } from '../groom/render/encode-image';
import { db } from '../platform/db';
import { fileSlug } from '../platform/file-names';
import { getObjectBytes, putObject } from '../platform/storage';
import { copyObject } from '../platform/storage';
import { deleteMarketObjects, listingPrefix } from './storage';
import { measureListing, type MeasuredListing } from './listing-facts';
import { TAX_NOTE, type PackageFormat } from './vocabulary';
import { packageReadme } from './package-readme';

export type Picture = { view: ThumbnailView; size: number; key: string };

export const PICTURE_SIZES = [256, 1024] as const;

/** A package's files are named after what they are made from: guides.usda, guides-bspline.usda, groom-spec.json, field.ply … */
const PACKAGE_FILE_STEMS: Record<ExportSource, string> = { guides: 'guides', spec: 'groom-spec', field: 'field' };

function packageFileName(format: PackageFormat): string {
  const { source, variant, extension } = EXPORT_FORMAT_FACTS[format];
  return [PACKAGE_FILE_STEMS[source], variant].filter(Boolean).join('-') + extension;
}

/** What a listing version's files are made from (the listing row for the version on sale, or an update's row). */
export type ListingFilesSource = {
  /** The frozen sculpt the guides' roots are sampled on (see listings.roots_surface_key), or null. */
  roots_surface_key: string | null;
  roots_surface_file_name: string | null;
  title: string;
  description: string;
  spec: unknown;
  surface_key: string;
  surface_file_name: string;
  formats: PackageFormat[];
  groom_name: string;
  version_number: number | null;
  version_name: string | null;
  price_cents: number;
  currency: string;
  seller_name: string;
  licence_title: string;
  licence_body: string;
  ships_surface: boolean;
};

type ListingForAssets = ListingFilesSource & {
  id: string;
  groom_version_id: string;
  revision: number;
  current_version: number;
};

/** The README's facts of a listing (the words are lib/market/package-readme.ts). */
function readme(listing: ListingFilesSource, guideCount: number, files: string[]): string {
  return packageReadme(
    {
      title: listing.title,
      description: listing.description,
      sellerName: listing.seller_name,
      groomName: listing.groom_name,
      versionNumber: listing.version_number,
      versionName: listing.version_name,
      priceCents: listing.price_cents,
      currency: listing.currency,
      licenceTitle: listing.licence_title,
      guideCount,
      taxNote: TAX_NOTE,
    },
    files,
  );
}

/**
 * A listing made outside a request (the demo seed, which has no object storage at hand) still
 * names the studio's surface object: copy it under the listing's own prefix first.
 */
async function freezeSurface(listing: ListingForAssets, stored: Stored) {
  const prefix = listingPrefix(listing.id);
  if (listing.surface_key.startsWith(`${prefix}/`)) return;
  const dot = listing.surface_file_name.lastIndexOf('.');
  const key = `${prefix}/surface${dot >= 0 ? listing.surface_file_name.slice(dot).toLowerCase() : ''}`;
  await stored(() => copyObject(listing.surface_key, key));
  await db()('listings').where({ id: listing.id }).update({ surface_key: key });
  listing.surface_key = key;
}

/** Pauses before the second, third and fourth try of a storage call (after the SDK's own quick retries). */
export const STORAGE_RETRY_DELAYS_MS = [2_000, 10_000, 30_000];

/** Whether another try may mend a storage error: no answer at all, a 5xx, a throttle or a timeout. */
export function isTransientStorageError(error: unknown): boolean {
  const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  return status === undefined || status >= 500 || status === 429 || status === 408;
}

/** A storage call with the retries of `storedWithRetries`. */
export type Stored = <T>(call: () => Promise<T>) => Promise<T>;

/** Tries a storage call again after each of `delaysMs` while its error is transient. */
export function storedWithRetries(delaysMs: readonly number[]): Stored {
  return async (call) => {
    for (let attempt = 0; ; attempt++) {
      try {
        return await call();
      } catch (error) {
        if (attempt >= delaysMs.length || !isTransientStorageError(error)) throw error;
        console.error(`[market] storage failed (${(error as Error).message}); trying again in ${delaysMs[attempt]} ms`);
        await new Promise((resolve) => setTimeout(resolve, delaysMs[attempt]));
      }
    }
  };
}

/** How often a build starts again because the listing was edited while it ran, before leaving it to the edit's own job. */
const MAX_REBUILDS = 3;

export type AssetBuildOptions = { storageRetryDelaysMs?: readonly number[] };

/** Pictures, guide count, preview and package of a listing; marks it ready, or failed with the reason. */
export async function buildListingAssets(listingId: string, options: AssetBuildOptions = {}): Promise<void> {
  const stored = storedWithRetries(options.storageRetryDelaysMs ?? STORAGE_RETRY_DELAYS_MS);
  for (let round = 0; round < MAX_REBUILDS; round++) {
    const outcome = await buildOnce(listingId, stored);
    if (outcome !== 'edited') return;
  }
  console.error(`[market] listing ${listingId} kept changing while its package was built; its latest edit's job will build it`);
}

/** One build from the listing as it is now; 'edited' when the listing changed meanwhile (nothing kept). */
async function buildOnce(listingId: string, stored: Stored): Promise<'done' | 'edited' | 'gone'> {
  const listing: ListingForAssets | undefined = await db()('listings as l')
    .join('users as u', 'u.id', 'l.seller_id')
    .join('licences as c', 'c.id', 'l.licence_id')
    .where('l.id', listingId)
    .first(
      'l.id',
      'l.title',
      'l.description',
      'l.spec',
      'l.surface_key',
      'l.surface_file_name',
      'l.roots_surface_key',
      'l.roots_surface_file_name',
      'l.formats',
      'l.groom_name',
      'l.version_number',
      'l.version_name',
      'l.groom_version_id',
      'l.revision',
      'l.current_version',
      'l.ships_surface',
      'l.price_cents',
      'l.currency',
      'u.display_name as seller_name',
      'c.title as licence_title',
      'c.body as licence_body',
    );
  if (!listing) return 'gone'; // deleted meanwhile: nothing to make
  try {
    await freezeSurface(listing, stored);
    const prefix = listingPrefix(listing.id);
    const version = listing.current_version;
    const existing = await db()('listing_packages')
      .where({ listing_id: listing.id, listing_version: version, listing_revision: listing.revision })
      .first('listing_id');
    // Under the version and revision, so a build never overwrites the package a row (or an owner of an older version) names.
    const packagePrefix = existing ? null : version > 1 ? `${prefix}/package/v${version}/r${listing.revision}` : `${prefix}/package/r${listing.revision}`;
    const { guideCount, pictures, built, previewKey, measured } = await makeListingFiles(listing, prefix, packagePrefix, stored);
    // Kept only if the listing is still the one it was built from (the edit locks the same row).
    const outcome = await db().transaction<'done' | 'edited' | 'gone'>(async (trx) => {
      const now = await trx('listings').where({ id: listing.id }).forUpdate().first('revision');
      if (!now) return 'gone';
      if (now.revision !== listing.revision) return 'edited';
      if (built) {
        await trx('listing_packages').where({ listing_id: listing.id, listing_version: version }).delete();
        await trx('listing_packages').insert({ listing_id: listing.id, listing_version: version, groom_version_id: listing.groom_version_id, listing_revision: listing.revision, ...built });
      }
      await trx('listings')
        .where({ id: listing.id })
        .update({ assets_status: 'ready', assets_error: null, guide_count: guideCount, pictures: JSON.stringify(pictures), preview_key: previewKey, facts: JSON.stringify(measured.facts), guides_per_cm2: measured.guidesPerCm2, typical_length_cm: measured.typicalLengthCm, updated_at: trx.fn.now() });
      return 'done';
    });
    // Listings built before the reduced preview kept the full guides there: no row names that file now.
    if (outcome === 'done') await deleteMarketObjects([`${prefix}/preview/guides.glb`]);
    return outcome;
  } catch (error) {
    const message = (error as Error).message ?? String(error);
    // A failure of an older revision says nothing about the edited listing: build that instead.
    const marked = await db()('listings')
      .where({ id: listing.id, revision: listing.revision })
      .update({ assets_status: 'failed', assets_error: message.slice(0, 2000), updated_at: db().fn.now() });
    if (marked === 0) return 'edited';
    console.error(`[market] pictures and package of listing ${listing.id} failed: ${message}`);
    return 'done';
  }
}

export type ListingFiles = {
  guideCount: number;
  pictures: Picture[];
  built: { object_key: string; file_name: string; byte_size: number } | null;
  /** The reduced public preview (see lib/groom's previewGuides), never the package's guides. */
  previewKey: string;
  measured: MeasuredListing;
};

/**
 * Grows a listing version's guides once and stores its pictures and guide preview under `prefix`,
 * and its package zip under `packagePrefix` (none when null: the version's package exists). The
 * growth surface goes into the package, and beside the guides in their files, only when the
 * version says it ships it. Throws the storage's or lib/groom's error; stores nothing else.
 */
export async function makeListingFiles(listing: ListingFilesSource, prefix: string, packagePrefix: string | null, stored: Stored): Promise<ListingFiles> {
  const spec = parseGroomSpec(listing.spec);
  const surfaceBytes = await stored(() => getObjectBytes(listing.surface_key));
  // The same check the studio ran on the surface: its facts describe the listing.
  const { read, report } = checkSurfaceFile(surfaceBytes, listing.surface_file_name);
  if (!read || !report.facts) throw new Error(`the listing's surface could not be read: ${report.problems[0]?.message ?? 'no facts'}`);
  const surface = prepareGroomSurface(read.mesh, { boundary: spec.field.boundary });
  const solved = solveGroomField(spec, surface);
  // A version moved onto a new sculpt grows from the roots on the earlier one, as the studio's export does.
  const rootsFrom = listing.roots_surface_key ? readSurface(await stored(() => getObjectBytes(listing.roots_surface_key!)), listing.roots_surface_file_name!).mesh : undefined;
  const { guides } = growGuides(surface, solved, spec, rootsFrom ? { rootsFrom } : {});
  const made: GroomMade = { spec, surface, solved, guides };

  const pictures: Picture[] = [];
  for (const view of THUMBNAIL_VIEWS) {
    for (const size of PICTURE_SIZES) {
      const image = renderThumbnail(read.mesh, guides, { size, view, upAxis: spec.upAxis, colourBy: 'length' });
      const key = `${prefix}/pictures/${view}-${size}.webp`;
      const bytes = await encodeImage(image, 'webp');
      await stored(() => putObject(key, bytes, 'image/webp'));
      pictures.push({ view, size, key });
    }
  }
  const previewKey = `${prefix}/preview/sample.glb`;
  const preview = previewGuides(guides);
  await stored(() => putObject(previewKey, previewToGlb(preview), EXPORT_FORMAT_FACTS.glb.mediaType));
  const measured = measureListing(coatFacts(surface, spec, guides), report.facts, preview);

  let built: ListingFiles['built'] = null;
  if (packagePrefix) {
    const folder = fileSlug(listing.title, 60, 'preset');
    const entries: Zippable = {};
    for (const format of listing.formats) {
      const name = packageFileName(format);
      const bytes = writeExport(format, made, { withSurface: listing.ships_surface && EXPORT_FORMAT_FACTS[format].source === 'guides' });
      entries[`${folder}/${name}`] = typeof bytes === 'string' ? strToU8(bytes) : bytes;
    }
    if (listing.ships_surface) entries[`${folder}/surface/${listing.surface_file_name}`] = surfaceBytes;
    entries[`${folder}/LICENCE.txt`] = strToU8(`${listing.licence_body}\n`);
    // The README explains what the zip holds, read from the zip's own entries (so a file added to
    // the package is named, and one left out is never described).
    const packed = Object.keys(entries).map((path) => path.slice(folder.length + 1)).filter((name) => name !== 'LICENCE.txt');
    entries[`${folder}/README.txt`] = strToU8(readme(listing, guides.count, packed));
    // A fixed time stamp, so the same version always zips to the same bytes.
    const zip = zipSync(entries, { level: 6, mtime: new Date('2026-01-01T00:00:00Z') });
    const fileName = `${folder}.zip`;
    const key = `${packagePrefix}/${fileName}`;
    await stored(() => putObject(key, zip, 'application/zip'));
    built = { object_key: key, file_name: fileName, byte_size: zip.byteLength };
  }
  return { guideCount: guides.count, pictures, built, previewKey, measured };
}
