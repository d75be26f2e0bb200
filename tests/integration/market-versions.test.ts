// Listing versions and the seller's rights tick, against the real stack (PostgreSQL, storage, the
// payments fake, the mail sink, a job-worker process): a seller improves a sold listing, the
// update waits for an admin while the approved version stays on sale, and on approval the owners
// (not a refunded buyer) get it free with a notice and an e-mail and keep the version they bought.
// The package ships the growth surface only when the seller ticked that they may publish it.
import { strFromU8, unzipSync } from 'fflate';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import type { Actor } from '@/lib/accounts/actor';
import { listLibrary, requestDownload } from '@/lib/market/library';
import { listLicences } from '@/lib/market/licences';
import {
  createListing,
  createListingVersion,
  decideListing,
  decideListingVersion,
  getListingDetail,
  listListingVersions,
  listVersionsForAdmin,
  submitListing,
} from '@/lib/market/listings';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { RIGHTS_WORDING } from '@/lib/market/rights';
import type { ListingDraftInput } from '@/lib/market/validation';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import { mailTo } from './helpers';
import { buyListing, deliver, eventsAbout, makePerson, studioGroom, waitFor, failureOf } from './market-helpers';

let worker: JobsWorkerProcess;

afterAll(async () => {
  await worker?.stop();
  await stopJobs();
  await closeDb();
});


/** A surface, a groom and two saved versions of it, as the studio keeps them. */
async function twoVersions(owner: Actor) {
  const made = await studioGroom(owner, ['First nap', 'Longer nap']);
  return { groomId: made.groomId, v1: made.versionIds[0], v2: made.versionIds[1], surfaceBytes: made.surfaceBytes };
}

/** The files of a downloaded package zip, by their path inside its folder. */
async function packageFiles(buyer: Actor, purchaseId: string, version?: number): Promise<Record<string, Uint8Array>> {
  const link = await requestDownload(buyer, purchaseId, version);
  const response = await fetch(link.url);
  expect(response.status).toBe(200);
  const entries = unzipSync(new Uint8Array(await response.arrayBuffer()));
  return Object.fromEntries(Object.entries(entries).map(([path, bytes]) => [path.slice(path.indexOf('/') + 1), bytes]));
}

type UsdSpecs = Record<string, { fields: Record<string, unknown> }>;
const usdSpecs = (bytes: Uint8Array) => (new USDAParser().parseData(strFromU8(bytes)) as { specsByPath: UsdSpecs }).specsByPath;

async function refund(buyer: Actor, purchaseId: string) {
  await refundPurchase(await makePerson('versions-refunder', ['admin']), purchaseId, 'Bought the wrong coat.');
  const purchase = await db()('purchases').where({ id: purchaseId }).first('payment_intent_id');
  const [refunded] = await eventsAbout({ id: '', paymentIntent: purchase.payment_intent_id }, ['charge.refunded']);
  expect((await deliver(refunded)).status).toBe(200);
  expect((await db()('purchases').where({ id: purchaseId }).first('status')).status).toBe('refunded');
}

let seller: Actor;
let admin: Actor;
let groom: Awaited<ReturnType<typeof twoVersions>>;
let licenceSlug: string;

const FIRST_WORDS = 'Short plush pile for a ring-shaped toy, one whorl and one saddle.';
const SECOND_WORDS = 'Short plush pile for a ring-shaped toy, now with the growth surface and its field file in the package.';

function draft(): ListingDraftInput {
  return {
    groomId: groom.groomId,
    versionId: groom.v1,
    title: 'Loop plush nap, kept up to date',
    description: FIRST_WORDS,
    tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
    priceCents: 1500,
    currency: 'eur',
    licenceSlug,
    formats: ['usda', 'json'],
    rightsConfirmed: true,
    shipsSurface: false,
  };
}

/** A published listing of version 1 (its files made by the job), approved by the admin. */
async function publishedListing(): Promise<string> {
  const listing = await createListing(seller, draft());
  await waitFor('the listing’s files', async () => (await db()('listings').where({ id: listing.id }).first('assets_status')).assets_status === 'ready', 90_000);
  await submitListing(seller, listing.id);
  await decideListing(admin, listing.id, { approve: true });
  return listing.id;
}

beforeAll(async () => {
  worker = await startJobsWorkerProcess();
  seller = await makePerson('versions-seller', ['groomer']);
  admin = await makePerson('versions-admin', ['admin']);
  groom = await twoVersions(seller);
  licenceSlug = (await listLicences())[0].slug;
});

describe('the seller’s rights tick', () => {
  it('stores who confirmed, when and under which wording, with each version', async () => {
    const listing = await createListing(seller, draft());
    const [first] = await listListingVersions(seller, listing.id);
    expect(first).toMatchObject({ number: 1, review: 'listing', shipsSurface: false, rights: { wordingVersion: RIGHTS_WORDING.version } });
    const row = await db()('listing_versions').where({ listing_id: listing.id }).first('rights_confirmed_by', 'rights_confirmed_at');
    expect(row.rights_confirmed_by).toBe(seller.userId);
    expect(Date.now() - row.rights_confirmed_at.getTime()).toBeLessThan(10 * 60_000);
    // Someone else's listing's versions are not theirs to see.
    expect((await failureOf(listListingVersions(await makePerson('versions-other', ['groomer']), listing.id))).status).toBe(404);
  });
});

describe('updates to owners', () => {
  it('puts an approved update in the owners’ libraries with a notice and an e-mail, keeps the bought version, and gives a refunded buyer nothing', async () => {
    const listingId = await publishedListing();
    const owner = await makePerson('versions-owner', ['buyer']);
    const refunded = await makePerson('versions-refunded', ['buyer']);
    const ownerPurchase = await buyListing(owner, listingId);
    const refundedPurchase = await buyListing(refunded, listingId);
    await refund(refunded, refundedPurchase);

    // The update waits for the admins; the approved version stays on sale meanwhile.
    const update = await createListingVersion(seller, listingId, {
      groomId: groom.groomId,
      versionId: groom.v2,
      description: SECOND_WORDS,
      formats: ['usda', 'json', 'ply'],
      notes: 'The package now holds the growth surface and the field file.',
      rightsConfirmed: true,
      shipsSurface: true,
    });
    expect(update).toMatchObject({ number: 2, review: 'submitted', onSale: false, shipsSurface: true, rights: { wordingVersion: RIGHTS_WORDING.version } });
    expect((await failureOf(createListingVersion(seller, listingId, { ...update, groomId: groom.groomId, versionId: groom.v2, notes: '', rightsConfirmed: true }))).code).toBe('wrong-state');
    const waiting = await getListingDetail(null, listingId);
    expect(waiting).toMatchObject({ description: FIRST_WORDS, formats: ['usda', 'json'], groom: { versionId: groom.v1 } });
    expect((await listVersionsForAdmin()).map((version) => version.id)).toContain(update.id);
    const [beforeItem] = await listLibrary(owner);
    expect(beforeItem).toMatchObject({ boughtVersion: 1, currentVersion: 1, updateNotice: null, versions: [{ number: 1, packageReady: true }] });

    await waitFor('the update’s files', async () => (await db()('listing_versions').where({ id: update.id }).first('assets_status')).assets_status === 'ready', 90_000);
    // Still not on sale until approved.
    expect((await getListingDetail(null, listingId)).description).toBe(FIRST_WORDS);
    const approved = await decideListingVersion(admin, update.id, { approve: true });
    expect(approved).toMatchObject({ review: 'approved', onSale: true });

    const published = await getListingDetail(null, listingId);
    expect(published).toMatchObject({ description: SECOND_WORDS, formats: ['usda', 'json', 'ply'], groom: { versionId: groom.v2 } });
    // The update's own reduced preview and facts come with it.
    expect(published.guidePreviewUrl).toContain(`/versions/${update.id}/preview/sample.glb`);
    expect(published.facts).toMatchObject({ pointsPerGuide: expect.any(Number) });

    // The owner: both versions, a notice, and an e-mail in the sink.
    const [item] = await listLibrary(owner);
    expect(item).toMatchObject({ boughtVersion: 1, currentVersion: 2, updateNotice: { number: 2 }, versions: [{ number: 2, packageReady: true }, { number: 1, packageReady: true }] });
    const mail = await waitFor('the owner’s mail', async () => (await mailTo(owner.email!)).find((m) => m.subject.includes('new version')));
    expect(mail.text).toMatch(/version 2/);
    expect(mail.text).toMatch(/The package now holds the growth surface/);
    expect(mail.text).toMatch(/\/library/);

    // The refunded buyer: no notice, no version, no mail.
    const [refundedItem] = await listLibrary(refunded);
    expect(refundedItem).toMatchObject({ status: 'refunded', updateNotice: null, versions: [] });
    expect((await failureOf(requestDownload(refunded, refundedPurchase, 2))).code).toBe('refunded');
    expect((await mailTo(refunded.email!)).filter((m) => m.subject.includes('new version'))).toEqual([]);

    // Version 1 as bought: no surface in the package, none in the USD; version 2: the source file and the Mesh prim.
    const first = await packageFiles(owner, ownerPurchase, 1);
    expect(Object.keys(first).sort()).toEqual(['LICENCE.txt', 'README.txt', 'groom-spec.json', 'guides.usda']);
    expect(usdSpecs(first['guides.usda'])['/Groom/Surface']).toBeUndefined();
    expect((await listLibrary(owner))[0].updateNotice).toEqual({ number: 2 });
    const second = await packageFiles(owner, ownerPurchase);
    expect(Object.keys(second).sort()).toEqual(['LICENCE.txt', 'README.txt', 'field.ply', 'groom-spec.json', 'guides.usda', 'surface/loop.obj']);
    expect(Buffer.from(second['surface/loop.obj']).equals(Buffer.from(groom.surfaceBytes))).toBe(true);
    // three.js's USDA parser reads the surface as a Mesh prim beside the guides.
    expect(usdSpecs(second['guides.usda'])['/Groom/Surface'].fields.typeName).toBe('Mesh');
    expect(strFromU8(second['README.txt'])).toMatch(/surface\/loop\.obj/);
    // Downloading the new version ends its notice.
    expect((await listLibrary(owner))[0].updateNotice).toBeNull();
    expect((await failureOf(requestDownload(owner, ownerPurchase, 3))).status).toBe(404);

    // A buyer after the update bought version 2, and only it.
    const later = await makePerson('versions-later', ['buyer']);
    const laterPurchase = await buyListing(later, listingId);
    expect((await listLibrary(later))[0]).toMatchObject({ boughtVersion: 2, versions: [{ number: 2, packageReady: true }], updateNotice: null });
    expect((await failureOf(requestDownload(later, laterPurchase, 1))).status).toBe(404);
  });

  it('keeps the version on sale when an update is sent back, tells the seller why, and lets them try again', async () => {
    const listingId = await publishedListing();
    const other = await makePerson('versions-other-seller', ['groomer']);
    const input = { groomId: groom.groomId, versionId: groom.v2, description: SECOND_WORDS, formats: ['usda' as const], notes: '', rightsConfirmed: true as const, shipsSurface: false };
    expect((await failureOf(createListingVersion(other, listingId, input))).status).toBe(404);
    const update = await createListingVersion(seller, listingId, input);
    expect((await failureOf(decideListingVersion(admin, update.id, { approve: false, reason: ' ' }))).status).toBe(400);
    const rejected = await decideListingVersion(admin, update.id, { approve: false, reason: 'The pictures show a client’s character.' });
    expect(rejected).toMatchObject({ review: 'rejected', rejectionReason: 'The pictures show a client’s character.', onSale: false });
    expect((await failureOf(decideListingVersion(admin, update.id, { approve: true }))).code).toBe('wrong-state');
    const mail = await waitFor('the rejection', async () => (await mailTo(seller.email!)).find((m) => m.subject.includes('Version 2') && m.subject.includes('needs changes')));
    expect(mail.text).toMatch(/a client’s character/);
    expect((await getListingDetail(null, listingId)).description).toBe(FIRST_WORDS);
    // The number is free again for the next try.
    expect((await createListingVersion(seller, listingId, input)).number).toBe(2);
  });

  it('takes new versions only for a listing on the market, and only from its seller; admins decide, not on their own listing', async () => {
    const draftListing = await createListing(seller, draft());
    const input = { groomId: groom.groomId, versionId: groom.v2, description: SECOND_WORDS, formats: ['usda' as const], notes: '', rightsConfirmed: true as const, shipsSurface: false };
    expect(await failureOf(createListingVersion(seller, draftListing.id, input))).toMatchObject({ status: 409, code: 'wrong-state' });
    const sellingAdmin = await makePerson('versions-admin-seller', ['groomer', 'admin']);
    const own = await twoVersions(sellingAdmin);
    const listing = await createListing(sellingAdmin, { ...draft(), groomId: own.groomId, versionId: own.v1 });
    await waitFor('the listing’s files', async () => (await db()('listings').where({ id: listing.id }).first('assets_status')).assets_status === 'ready', 90_000);
    await submitListing(sellingAdmin, listing.id);
    await decideListing(admin, listing.id, { approve: true });
    const update = await createListingVersion(sellingAdmin, listing.id, { ...input, groomId: own.groomId, versionId: own.v2 });
    expect((await failureOf(decideListingVersion(sellingAdmin, update.id, { approve: true }))).code).toBe('own-listing');
  });
});
