// Listings made from a groom version the studio saved: the version is frozen (spec and surface
// copied), states move only as allowed, and other groomers' grooms are not found.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { LICENCE_TEXTS } from '@/lib/market/licences';
import { getObjectBytes } from '@/lib/platform/storage';
import { parseGroomSpec } from '@/lib/groom';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import { buildListingAssets } from '@/lib/market/assets';
import type { Actor } from '@/lib/accounts/actor';
import { stopJobs } from '@/lib/platform/jobs';
import { createListing, getListingDetail, listOwnListings, submitListing, unlistListing, updateListing } from '@/lib/market/listings';
import type { ListingDraftInput } from '@/lib/market/validation';
import { makePerson, studioGroom, failureOf } from './market-helpers';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

/** A surface, a groom and a saved version, as the studio keeps them. */
async function studioVersion(owner: Actor) {
  const made = await studioGroom(owner, ['First nap']);
  return { surfaceId: made.surfaceId, groomId: made.groomId, versionId: made.versionIds[0], objectKey: made.objectKey };
}

const draft = (ids: { groomId: string; versionId: string }): ListingDraftInput => ({
  ...ids,
  title: 'Loop plush nap',
  description: 'Short plush pile for a ring-shaped toy, one whorl and one saddle.',
  tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
  priceCents: 900,
  currency: 'eur',
  licenceSlug: LICENCE_TEXTS[0].slug,
  formats: ['usda', 'json'],
  rightsConfirmed: true,
  shipsSurface: false,
});


let seller: Actor;
beforeAll(async () => {
  seller = await makePerson('listing-seller', ['groomer']);
});

describe('a listing from a saved version', () => {
  it('freezes the version: its spec and a copy of the surface outlive the groom', async () => {
    const ids = await studioVersion(seller);
    const listing = await createListing(seller, draft(ids));
    expect(listing).toMatchObject({ state: 'draft', groomName: 'Loop the plush ring', versionNumber: 1, priceCents: 900, currency: 'eur' });
    const row = await db()('listings').where({ id: listing.id }).first('surface_key', 'spec', 'groom_version_id');
    expect(row.surface_key).toBe(`market/listings/${listing.id}/surface.obj`);
    expect(row.groom_version_id).toBe(ids.versionId);
    // The studio's groom goes away (and its version with it); the listing still makes its files.
    await db()('grooms').where({ id: ids.groomId }).delete();
    await buildListingAssets(listing.id);
    const after = await db()('listings').where({ id: listing.id }).first('assets_status', 'assets_error', 'guide_count');
    expect(after).toMatchObject({ assets_status: 'ready', assets_error: null });
    expect(after.guide_count).toBeGreaterThan(100);
    expect((await getListingDetail(seller, listing.id)).groom.versionName).toBe('First nap');
  });

  it('does not find another groomer’s groom or version, or an unknown licence', async () => {
    const ids = await studioVersion(seller);
    const other = await makePerson('other-groomer', ['groomer']);
    expect(await failureOf(createListing(other, draft(ids)))).toMatchObject({ status: 404, code: 'not-found' });
    expect(await failureOf(createListing(seller, draft({ ...ids, versionId: randomUUID() })))).toMatchObject({ status: 404, message: 'There is no such version.' });
    const unknown = await failureOf(createListing(seller, { ...draft(ids), licenceSlug: 'forever-free' }));
    expect(unknown.extra.fields).toEqual({ licenceSlug: 'Choose one of the market’s licences.' });
  });

  it('moves draft → submitted → unlisted → draft, and refuses edits out of turn', async () => {
    const listing = await createListing(seller, draft(await studioVersion(seller)));
    const other = await makePerson('other-groomer', ['groomer']);
    expect((await failureOf(submitListing(other, listing.id))).status).toBe(404);
    expect((await submitListing(seller, listing.id)).state).toBe('submitted');
    expect((await failureOf(updateListing(seller, listing.id, { title: 'Changed while waiting' }))).code).toBe('wrong-state');
    expect((await failureOf(submitListing(seller, listing.id))).code).toBe('wrong-state');
    expect((await unlistListing(seller, listing.id)).state).toBe('unlisted');
    const edited = await updateListing(seller, listing.id, { priceCents: 1100, tags: { animal: 'toy', coatLength: 'medium', style: 'plush', bodyRegion: 'full-body' } });
    expect(edited).toMatchObject({ state: 'draft', priceCents: 1100, assets: { status: 'pending' } });
    expect((await listOwnListings(seller)).map((own) => own.id)).toContain(listing.id);
    // Not published: only the seller sees it.
    expect((await failureOf(getListingDetail(other, listing.id))).status).toBe(404);
    expect((await failureOf(getListingDetail(null, listing.id))).status).toBe(404);
  });
});
