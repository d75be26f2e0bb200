// After the payment: the package made by the job, downloads, refunds that end access, the
// seller's figures and payouts, reviews, and moderation with its mails. Every test makes its own
// people and listings (copies of one listing whose pictures and package the job made once), so
// each runs alone and in any order.
import { unzipSync, strFromU8 } from 'fflate';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { LICENCE_TEXTS } from '@/lib/market/licences';
import { payments } from '@/lib/platform/payments';
import { startCheckout } from '@/lib/market/payments/checkout';
import { HttpError } from '@/lib/http/errors';
import type { Actor } from '@/lib/accounts/actor';
import { stopJobs } from '@/lib/platform/jobs';
import { enqueueListingAssets } from '@/lib/market/jobs';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import { listLibrary, requestDownload } from '@/lib/market/library';
import { decideListing, getListingDetail, submitListing, updateListing } from '@/lib/market/listings';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { saveReview } from '@/lib/market/reviews';
import { salesCsv, salesReport } from '@/lib/market/sales';
import { listPayouts, requestPayout } from '@/lib/market/payouts';
import { mailTo } from './helpers';
import { deliver, eventsAbout, insertListing, makePerson, payOnHostedPage, ringSurfaceKey, waitFor, type ListingOptions } from './market-helpers';

let worker: JobsWorkerProcess;

afterAll(async () => {
  await worker?.stop();
  await stopJobs();
  await closeDb();
});

async function failure(promise: Promise<unknown>): Promise<HttpError & { fields?: Record<string, string> }> {
  const error = await promise.then(
    () => null,
    (caught: unknown) => caught,
  );
  expect(error).toBeInstanceOf(HttpError);
  return Object.assign(error as HttpError, { fields: (error as HttpError).extra.fields });
}

/** Buys a listing end to end and delivers the fake's events; the purchase id. */
async function buy(buyer: Actor, listingId: string): Promise<string> {
  const checkout = await startCheckout(buyer, listingId);
  expect((await payOnHostedPage(checkout.url, '4242424242424242')).status).toBe(303);
  const [completed] = await eventsAbout({ id: checkout.sessionId }, ['checkout.session.completed']);
  expect((await deliver(completed)).status).toBe(200);
  return (await db()('purchases').where({ checkout_session_id: checkout.sessionId }).first('id')).id;
}

/** Moves a purchase back in time (past the payout holding period, 14 days by default). */
async function daysAgo(purchaseId: string, days: number) {
  await db()('purchases').where({ id: purchaseId }).update({ created_at: db().raw(`now() - interval '${days} days'`) });
}

const NAP: ListingOptions = { title: 'Loop plush nap', formats: ['usda', 'usda-bspline', 'glb', 'obj', 'json', 'ply'], priceCents: 2000, licence: LICENCE_TEXTS[1].slug };

/** The listing whose pictures and package the job made (in beforeAll); copies share its files. */
let made: { id: string; surfaceKey: string };

/** A listing of its own (for `seller`), with the pictures and package of the one the job made. */
async function listingOf(seller: Actor, options: ListingOptions = {}): Promise<string> {
  const source = await db()('listings').where({ id: made.id }).first('pictures', 'guide_count');
  const id = await insertListing(seller, { ...NAP, guideCount: source.guide_count, ...options }, made.surfaceKey);
  await db()('listings').where({ id }).update({ pictures: JSON.stringify(source.pictures) });
  const pack = await db()('listing_packages').where({ listing_id: made.id }).first();
  await db()('listing_packages').insert({ ...pack, listing_id: id });
  return id;
}

beforeAll(async () => {
  // A draft made from the demo ring, its pictures and package made by a job-worker process,
  // started here as the test stack starts it.
  const owner = await makePerson('library-maker', ['groomer']);
  worker = await startJobsWorkerProcess();
  const surfaceKey = await ringSurfaceKey();
  const id = await insertListing(owner, { ...NAP, state: 'draft', assetsStatus: 'pending', guideCount: null }, surfaceKey);
  await enqueueListingAssets(id);
  await waitFor('the listing’s pictures and package', async () => (await db()('listings').where({ id }).first('assets_status')).assets_status === 'ready', 60_000);
  made = { id, surfaceKey: (await db()('listings').where({ id }).first('surface_key')).surface_key };
});

describe('moderation', () => {
  it('rejects with a reason by mail, then approves the edited, rebuilt and resubmitted listing by mail', async () => {
    const seller = await makePerson('library-seller', ['groomer']);
    const admin = await makePerson('library-admin', ['admin']);
    const listingId = await listingOf(seller, { state: 'draft' });
    await submitListing(seller, listingId);
    expect((await failure(decideListing(admin, listingId, { approve: false, reason: ' ' }))).fields).toEqual({ reason: 'Tell the seller why.' });
    const rejected = await decideListing(admin, listingId, { approve: false, reason: 'Show the nap from the side too.' });
    expect(rejected).toMatchObject({ state: 'rejected', rejectionReason: 'Show the nap from the side too.' });
    const rejection = await waitFor('the rejection mail', async () => (await mailTo(seller.email!)).find((mail) => mail.subject.includes('needs changes')));
    expect(rejection.text).toMatch(/Show the nap from the side too\./);
    // The seller acts on it on the listing's edit page (app/sales/listings/[id]/edit), not the public page.
    expect(rejection.text).toContain(`/sales/listings/${listingId}/edit`);
    expect(rejection.text).not.toContain(`/market/${listingId}`);

    await updateListing(seller, listingId, { description: 'Short plush pile for a ring toy, one whorl and one saddle, seen from every side.' });
    // The changed draft gets a new package; wait for it.
    await waitFor('the new package', async () => (await db()('listings').where({ id: listingId }).first('assets_status')).assets_status === 'ready', 60_000);
    await submitListing(seller, listingId);
    const published = await decideListing(admin, listingId, { approve: true });
    expect(published.state).toBe('published');
    const approval = await waitFor('the approval mail', async () => (await mailTo(seller.email!)).find((mail) => mail.subject.includes('is on the market')));
    expect(approval.text).toMatch(/20\.00 EUR/);
    // Only submitted listings are decided on.
    expect((await failure(decideListing(admin, listingId, { approve: true }))).code).toBe('wrong-state');
  });

  it('refuses an admin the approval of their own listing: another admin must decide', async () => {
    const both = await makePerson('library-admin-seller', ['groomer', 'admin']);
    const other = await makePerson('library-admin', ['admin']);
    const listingId = await listingOf(both, { state: 'submitted' });
    const refused = await failure(decideListing(both, listingId, { approve: true }));
    expect(refused).toMatchObject({ status: 403, code: 'own-listing' });
    expect(refused.message).toMatch(/another admin/i);
    expect((await db()('listings').where({ id: listingId }).first('state')).state).toBe('submitted');
    expect((await decideListing(other, listingId, { approve: true })).state).toBe('published');
  });

  it('shows a published listing with pictures, guide count, licence in full and the tax note', async () => {
    const listingId = await listingOf(await makePerson('library-seller', ['groomer']));
    const detail = await getListingDetail(null, listingId);
    expect(detail.guideCount).toBeGreaterThan(100);
    expect(detail.gallery.map((picture) => `${picture.view}-${picture.size}`).sort()).toEqual(['front-1024', 'front-256', 'side-1024', 'side-256', 'top-1024', 'top-256']);
    const picture = await fetch(detail.gallery[0].url);
    expect(picture.headers.get('content-type')).toBe('image/webp');
    expect(detail.licence.body).toMatch(/not legal advice/);
    expect(detail.licence.body).toMatch(/law of the place where the buyer lives or works governs/);
    expect(detail.taxNote).toMatch(/ask a tax adviser where you are/);
    expect(detail.viewer).toMatchObject({ isSeller: false, owns: false, mayBuy: false });
  });
});

describe('library and downloads', () => {
  it('lists the purchase and downloads the package: the promised files, the licence and a README', async () => {
    const buyer = await makePerson('library-buyer', ['buyer']);
    const purchaseId = await buy(buyer, await listingOf(await makePerson('library-seller', ['groomer'])));
    const [item] = await listLibrary(buyer);
    expect(item).toMatchObject({ purchaseId, amountCents: 2000, currency: 'eur', status: 'paid', packageReady: true, downloads: 0, licence: { slug: LICENCE_TEXTS[1].slug } });
    const link = await requestDownload(buyer, purchaseId);
    expect(link.expiresInSeconds).toBe(300);
    const response = await fetch(link.url);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toMatch(/attachment; filename="loop-plush-nap\.zip"/);
    const files = unzipSync(new Uint8Array(await response.arrayBuffer()));
    expect(Object.keys(files).sort()).toEqual(
      ['LICENCE.txt', 'README.txt', 'field.ply', 'groom-spec.json', 'guides-bspline.usda', 'guides.glb', 'guides.obj', 'guides.usda'].map((name) => `loop-plush-nap/${name}`),
    );
    expect(strFromU8(files['loop-plush-nap/LICENCE.txt'])).toMatch(new RegExp(`^${LICENCE_TEXTS[1].title}`));
    expect(strFromU8(files['loop-plush-nap/README.txt'])).toMatch(/20\.00 EUR/);
    expect(strFromU8(files['loop-plush-nap/guides.usda'])).toMatch(/BasisCurves/);
    expect(JSON.parse(strFromU8(files['loop-plush-nap/groom-spec.json'])).specVersion).toBe(3);
    await requestDownload(buyer, purchaseId);
    expect((await listLibrary(buyer))[0].downloads).toBe(2);
    expect(await db()('downloads').where({ purchase_id: purchaseId })).toHaveLength(2);
  });

  it('refuses a download to anyone but the buyer', async () => {
    const purchaseId = await buy(await makePerson('library-buyer', ['buyer']), await listingOf(await makePerson('library-seller', ['groomer'])));
    const stranger = await makePerson('stranger', ['buyer']);
    expect((await failure(requestDownload(stranger, purchaseId))).status).toBe(404);
  });

  it('lets the buyer review once and edit it, keeps the listing’s rating, and withdraws the review when the purchase is refunded', async () => {
    const buyer = await makePerson('library-buyer', ['buyer']);
    const listingId = await listingOf(await makePerson('library-seller', ['groomer']));
    const purchaseId = await buy(buyer, listingId);
    const first = await saveReview(buyer, listingId, { rating: 4, body: 'Even nap, the saddle sits well.' });
    const edited = await saveReview(buyer, listingId, { rating: 5, body: 'Even nap, and the spec reused nicely on our own ring.' });
    expect(edited.id).toBe(first.id);
    expect(await db()('reviews').where({ listing_id: listingId })).toHaveLength(1);
    expect((await getListingDetail(buyer, listingId)).rating).toEqual({ average: 5, count: 1 });
    const outsider = await makePerson('outsider', ['buyer']);
    expect((await failure(saveReview(outsider, listingId, { rating: 1, body: '' }))).code).toBe('not-owned');

    // A refunded buyer no longer owns it: the review leaves the rating and the page — as soon as
    // the refund is asked, before the provider confirms it.
    await refundPurchase(await makePerson('library-admin', ['admin']), purchaseId);
    expect((await getListingDetail(null, listingId)).rating).toEqual({ average: null, count: 0 });
    expect((await db()('listings').where({ id: listingId }).first('rating_count')).rating_count).toBe(0);
    const purchase = await db()('purchases').where({ id: purchaseId }).first('payment_intent_id');
    const [refundEvent] = await eventsAbout({ id: '', paymentIntent: purchase.payment_intent_id }, ['charge.refunded']);
    expect((await deliver(refundEvent)).status).toBe(200);
    const detail = await getListingDetail(null, listingId);
    expect(detail.rating).toEqual({ average: null, count: 0 });
    expect(detail.reviews).toHaveLength(0);
  });
});

describe('figures, payouts and refunds', () => {
  it('shows the seller revenue, fee, net, units and downloads, as JSON and CSV, and pays out the net after the holding period', async () => {
    const seller = await makePerson('library-seller', ['groomer']);
    const buyer = await makePerson('library-buyer', ['buyer']);
    const listingId = await listingOf(seller);
    const purchaseId = await buy(buyer, listingId);
    await requestDownload(buyer, purchaseId);
    await requestDownload(buyer, purchaseId);

    // 20.00 EUR at the 15 % fee: 3.00 EUR to the market, 17.00 EUR to the seller.
    const report = await salesReport(seller, { bucket: 'day' });
    expect(report.totals).toEqual([{ currency: 'eur', revenueCents: 2000, refundCents: 0, platformFeeCents: 300, netCents: 1700, units: 1, refunds: 0, downloads: 2 }]);
    expect(report.listings.find((row) => row.listingId === listingId)).toMatchObject({ units: 1, netCents: 1700, downloads: 2 });
    expect(report.series).toHaveLength(1);
    const csv = await salesCsv(seller, { bucket: 'month' });
    expect(csv.text.slice(1).split('\r\n')[0]).toBe('period_start,listing_id,listing_title,currency,units,revenue,refunds,refunded_amount,platform_fee,net,downloads');
    expect(csv.text).toMatch(new RegExp(`,${listingId},Loop plush nap,EUR,1,20\\.00,0,0\\.00,3\\.00,17\\.00,2\\r\\n`));
    expect(csv.text).toMatch(/\r\ntotal,,,EUR,1,20\.00,0,0\.00,3\.00,17\.00,2\r\n$/);

    // A fresh sale is held (14 days by default) and says so.
    expect(report.balance).toEqual([
      { currency: 'eur', balanceCents: 1700, payableCents: 0, clearedCents: 0, heldCents: 1700, heldUntil: expect.any(String), refundPendingCents: 0, owedCents: 0 },
    ]);
    expect((await failure(requestPayout(seller))).message).toMatch(/17\.00 EUR of recent sales can be paid out 14 days after each sale/);

    await daysAgo(purchaseId, 20);
    const payout = await requestPayout(seller);
    expect(payout).toMatchObject({ amountCents: 1700, currency: 'eur', status: 'paid' });
    const transfer = await payments().transfers.retrieve(payout.transferId!);
    expect(transfer).toMatchObject({ amount: 1700, currency: 'eur' });
    expect(transfer.destination).toBe((await db()('seller_accounts').where({ user_id: seller.userId }).first('account_id')).account_id);
    expect((await failure(requestPayout(seller))).code).toBe('nothing-to-pay-out');
    expect((await listPayouts(seller)).map((p) => p.id)).toEqual([payout.id]);
  });

  it('refunds a paid-out sale: access ends, both sides are told, the balance goes negative and later sales settle it', async () => {
    const seller = await makePerson('library-seller', ['groomer']);
    const admin = await makePerson('library-admin', ['admin']);
    const buyer = await makePerson('library-buyer', ['buyer']);
    const listingId = await listingOf(seller);
    const purchaseId = await buy(buyer, listingId);
    await daysAgo(purchaseId, 20);
    expect((await requestPayout(seller)).amountCents).toBe(1700);

    const refunded = await refundPurchase(admin, purchaseId, 'Bought for the wrong project.');
    expect(refunded).toMatchObject({ status: 'paid', refundPending: true, sellerNetCents: 1700, paidOutAt: expect.any(String) });
    // From the request on, nothing downloads.
    expect((await failure(requestDownload(buyer, purchaseId))).code).toBe('refunded');
    const purchase = await db()('purchases').where({ id: purchaseId }).first('payment_intent_id');
    const [refundEvent] = await eventsAbout({ id: '', paymentIntent: purchase.payment_intent_id }, ['charge.refunded']);
    expect((await deliver(refundEvent)).status).toBe(200);
    expect(await db()('purchases').where({ id: purchaseId }).first('status', 'refunded_at')).toMatchObject({ status: 'refunded', refunded_at: expect.any(Date) });
    expect(await failure(requestDownload(buyer, purchaseId))).toMatchObject({ status: 403, code: 'refunded' });
    expect((await failure(refundPurchase(admin, purchaseId))).code).toBe('refunded');
    const refundMail = await waitFor('the refund mail', async () => (await mailTo(buyer.email!)).find((mail) => mail.subject.startsWith('Refund')));
    expect(refundMail.text).toMatch(/20\.00 EUR/);
    const sellerMail = await waitFor('the seller’s refund mail', async () => (await mailTo(seller.email!)).find((mail) => mail.subject.includes('was refunded')));
    expect(sellerMail.text).toMatch(/already paid out to you, so your balance shows 17\.00 EUR owed/);

    const report = await salesReport(seller, { bucket: 'week' });
    expect(report.totals).toEqual([{ currency: 'eur', revenueCents: 2000, refundCents: 2000, platformFeeCents: 0, netCents: 0, units: 1, refunds: 1, downloads: 0 }]);
    // Paid out 17.00 before the refund: the seller owes it, and nothing can be paid out.
    expect(report.balance).toEqual([{ currency: 'eur', balanceCents: -1700, payableCents: 0, clearedCents: 0, heldCents: 0, heldUntil: null, refundPendingCents: 0, owedCents: 1700 }]);
    expect((await getListingDetail(null, listingId)).salesCount).toBe(0);

    // Two later sales of another listing, past the holding period: 2 × 17.00 − 17.00 owed = 17.00 paid out.
    const other = await listingOf(seller);
    for (const label of ['later-a', 'later-b']) await daysAgo(await buy(await makePerson(label, ['buyer']), other), 20);
    const settled = await requestPayout(seller);
    expect(settled.amountCents).toBe(1700);
    expect((await salesReport(seller, { bucket: 'week' })).balance).toEqual([
      { currency: 'eur', balanceCents: 0, payableCents: 0, clearedCents: 0, heldCents: 0, heldUntil: null, refundPendingCents: 0, owedCents: 0 },
    ]);
    // The former owner may buy again.
    expect((await startCheckout(buyer, listingId)).url).toMatch(/\/pay\//);
  });
});
