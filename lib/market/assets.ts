// What a listing shows and sells, made from its frozen version by a background job: pictures
// (front, side, top at 256² and 1024², WebP), a guide preview (.glb), the guide count, and the
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
import { readSurface } from '../field';
import {
  EXPORT_FORMAT_FACTS,
  growGuides,
  parseGroomSpec,
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
import { listingPrefix } from './storage';
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

type ListingForAssets = {
  id: string;
  title: string;
  description: string;
  spec: unknown;
  surface_key: string;
  surface_file_name: string;
  formats: PackageFormat[];
  groom_name: string;
  version_number: number | null;
  version_name: string | null;
  groom_version_id: string;
  revision: number;
  price_cents: number;
  currency: string;
  seller_name: string;
  licence_title: string;
  licence_body: string;
};

/** The README's facts of a listing (the words are lib/market/package-readme.ts). */
function readme(listing: ListingForAssets, guideCount: number, files: string[]): string {
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

type Stored = <T>(call: () => Promise<T>) => Promise<T>;

function storedWithRetries(delaysMs: readonly number[]): Stored {
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
      'l.formats',
      'l.groom_name',
      'l.version_number',
      'l.version_name',
      'l.groom_version_id',
      'l.revision',
      'l.price_cents',
      'l.currency',
      'u.display_name as seller_name',
      'c.title as licence_title',
      'c.body as licence_body',
    );
  if (!listing) return 'gone'; // deleted meanwhile: nothing to make
  try {
    await freezeSurface(listing, stored);
    const spec = parseGroomSpec(listing.spec);
    const read = readSurface(await stored(() => getObjectBytes(listing.surface_key)), listing.surface_file_name);
    const surface = prepareGroomSurface(read.mesh, { boundary: spec.field.boundary });
    const solved = solveGroomField(spec, surface);
    const { guides } = growGuides(surface, solved, spec);
    const made: GroomMade = { spec, surface, solved, guides };
    const prefix = listingPrefix(listing.id);

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
    const preview = writeExport('glb', made);
    await stored(() => putObject(`${prefix}/preview/guides.glb`, preview, EXPORT_FORMAT_FACTS.glb.mediaType));

    const existing = await db()('listing_packages').where({ listing_id: listing.id, listing_revision: listing.revision }).first('listing_id');
    let built: { object_key: string; file_name: string; byte_size: number } | null = null;
    if (!existing) {
      const folder = fileSlug(listing.title, 60, 'preset');
      const entries: Zippable = {};
      for (const format of listing.formats) {
        const name = packageFileName(format);
        const bytes = writeExport(format, made);
        entries[`${folder}/${name}`] = typeof bytes === 'string' ? strToU8(bytes) : bytes;
      }
      entries[`${folder}/LICENCE.txt`] = strToU8(`${listing.licence_body}\n`);
      // The README explains what the zip holds, read from the zip's own entries (so a file added to
      // the package is named, and one left out is never described).
      const packed = Object.keys(entries).map((path) => path.slice(folder.length + 1)).filter((name) => name !== 'LICENCE.txt');
      entries[`${folder}/README.txt`] = strToU8(readme(listing, guides.count, packed));
      // A fixed time stamp, so the same version always zips to the same bytes.
      const zip = zipSync(entries, { level: 6, mtime: new Date('2026-01-01T00:00:00Z') });
      const fileName = `${folder}.zip`;
      // Under the revision, so a build of an older revision never overwrites the package a row names.
      const key = `${prefix}/package/r${listing.revision}/${fileName}`;
      await stored(() => putObject(key, zip, 'application/zip'));
      built = { object_key: key, file_name: fileName, byte_size: zip.byteLength };
    }
    // Kept only if the listing is still the one it was built from (the edit locks the same row).
    return await db().transaction(async (trx) => {
      const now = await trx('listings').where({ id: listing.id }).forUpdate().first('revision');
      if (!now) return 'gone';
      if (now.revision !== listing.revision) return 'edited';
      if (built) {
        await trx('listing_packages').where({ listing_id: listing.id }).delete();
        await trx('listing_packages').insert({ listing_id: listing.id, groom_version_id: listing.groom_version_id, listing_revision: listing.revision, ...built });
      }
      await trx('listings')
        .where({ id: listing.id })
        .update({ assets_status: 'ready', assets_error: null, guide_count: guides.count, pictures: JSON.stringify(pictures), updated_at: trx.fn.now() });
      return 'done';
    });
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
