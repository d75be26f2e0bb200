// Who may do what, for every route handler and page of app/: one row each (more where one
// route answers differently for different things). access-matrix.test.ts lists app/ from the file
// tree and fails on a route or page without a row, or on a row whose route is gone, then plays
// every row for every person against the test stack.
//
// A row's expected statuses are one string, in the order of WHO:
//   anonymous · buyer · owner (the groomer who owns the thing; for a purchase, see the row) ·
//   other (another groomer) · admin.
// Routes answer a status (401 signed out, 403 wrong role, 404 someone else's thing, 2xx, 4xx for
// bad input); pages answer 200, `signin` (a redirect to /signin that comes back), 403 or 404.
//
// Adding a route is one line: `route('POST', '/api/things/[thingId]/poke', '401 403 200 404 403',
// { params: { thingId: 'groom' }, body: { hard: true } })`. `params` maps a path parameter to one
// of the Things made for the run (or a literal value); `body` may read the Things too.
// The people are called in the order anonymous, buyer, other, admin and last the owner, so a row
// whose owner call changes or deletes the thing (DELETE, submit, refund) can use the thing itself;
// a thing one row changes is used by no other row whose answer the change would alter, so the
// rows hold in any order (vitest --sequence.shuffle).

import { LICENCE_TEXTS } from '@/lib/market/licences';

export const WHO = ['anonymous', 'buyer', 'owner', 'other', 'admin'] as const;
export type Who = (typeof WHO)[number];

/** What each run makes for the rows: ids of things owned by the owner (or bought by the buyer). */
export type Things = {
  upload: string; // an uploaded file not yet registered as a surface
  surface: string;
  spareSurface: string; // for DELETE
  groom: string;
  spareGroom: string; // for DELETE
  version: string;
  export: string;
  specGroom: string; // a groom of its own for the autosave row, whose revision no other row moves
  spec: unknown; // its saved spec and revision
  revision: number;
  listing: string; // published, with a picture, not bought by anyone in the rows
  boughtListing: string; // published, bought by the buyer, its package made
  draftListing: string;
  submitListing: string; // a draft the owner submits
  unlistListing: string; // published; the owner takes it off the market
  submittedListing: string; // waiting for an admin's decision
  waitingVersion: string; // an update of a published listing, waiting for an admin's decision (listing versions)
  purchase: string; // the buyer's purchase of boughtListing
  refundPurchase: string; // another purchase of the buyer, which the admin refunds
  account: string; // a buyer's account nobody in the rows signs in with, for the admins' account rows
  missing: string; // an id nothing has
  demo: string; // a practice groom's id
  // A buyer's own use of presets (issue 14, fit): the buyer is the one who bought; the owner is the seller.
  buyerSurface: string; // the buyer's own ready growth surface
  fit: string; // a finished fit of the buyer's purchase onto buyerSurface, for reading
  acceptFit: string; // another finished fit, which the buyer accepts into a groom
  trial: string; // a trial of `listing` on buyerSurface
  refundedPurchase: string; // a purchase of the buyer's, refunded before the rows run
};
type IdOf = { [K in keyof Things]: Things[K] extends string ? K : never }[keyof Things];

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export type PageStatus = 200 | 'signin' | 403 | 404;

export type RouteRow = {
  kind: 'route';
  method: Method;
  path: string;
  expected: Record<Who, number>;
  params?: Record<string, IdOf | string[]>;
  body?: ((things: Things) => unknown) | Record<string, unknown>;
  query?: string;
  note?: string;
};
export type PageRow = { kind: 'page'; path: string; expected: Record<Who, PageStatus>; params?: Record<string, IdOf>; note?: string };

function statuses<T>(line: string, read: (word: string) => T): Record<Who, T> {
  const words = line.trim().split(/\s+/);
  if (words.length !== WHO.length) throw new Error(`"${line}" needs ${WHO.length} statuses: ${WHO.join(', ')}`);
  return Object.fromEntries(WHO.map((who, i) => [who, read(words[i])])) as Record<Who, T>;
}

function route(method: Method, path: string, expected: string, options: Omit<RouteRow, 'kind' | 'method' | 'path' | 'expected'> = {}): RouteRow {
  return { kind: 'route', method, path, expected: statuses(expected, Number), ...options };
}

function page(path: string, expected: string, options: Omit<PageRow, 'kind' | 'path' | 'expected'> = {}): PageRow {
  return {
    kind: 'page',
    path,
    expected: statuses(expected, (word) => {
      if (word === 'signin') return word;
      const status = Number(word);
      if (status !== 200 && status !== 403 && status !== 404) throw new Error(`a page answers 200, signin, 403 or 404, not ${word}`);
      return status;
    }),
    ...options,
  };
}

const all = (status: number | 'signin') => Array(WHO.length).fill(status).join(' ');
const surface = { surfaceId: 'surface' } as const;
/** A 2 × 2 mid-grey PNG (made with sharp), for the image map row. */
const GREY_PNG = 'iVBORw0KGgoAAAANSUhEUgAAAAIAAAACCAIAAAD91JpzAAAACXBIWXMAAAPoAAAD6AG1e1JrAAAADklEQVQImWNoAAMGCAUAKg4GAeLeQoEAAAAASUVORK5CYII=';
const groom = { groomId: 'groom' } as const;
const listing = { id: 'listing' } as const;

//                                                              anon buyer owner other admin
export const ROUTE_ROWS: RouteRow[] = [
  route('GET', '/api/health', all(200)),
  route('GET', '/api/auth/[...nextauth]', all(200), { params: { nextauth: ['session'] } }),
  // next-auth sends a sign-in without its CSRF token back to the sign-in page (302 to /signin?csrf=true).
  route('POST', '/api/auth/[...nextauth]', all(302), { params: { nextauth: ['callback', 'credentials'] }, note: 'no CSRF token' }),
  route('POST', '/api/account/sign-up', all(400), { body: { email: 'not-an-address' }, note: 'bad input' }),
  route('POST', '/api/account/verification', all(400), { body: {}, note: 'bad input' }),
  route('POST', '/api/account/password-reset', all(400), { body: {}, note: 'bad input' }),
  route('POST', '/api/account/password-reset/confirm', all(400), { body: { token: 'x' }, note: 'bad input' }),
  route('POST', '/api/payments/webhook', all(400), { body: { type: 'checkout.session.completed' }, note: 'unsigned' }),

  // The studio: groomers and buyers (fitting what they bought), each only their own things; the buyer answers as another groomer does.
  route('POST', '/api/studio/uploads', '401 201 201 201 403', { body: { fileName: 'coat.obj', byteSize: 1024 } }),
  route('POST', '/api/studio/uploads', '401 400 400 400 403', { body: { fileName: 'coat.obj', byteSize: 0 }, note: 'bad input' }),
  route('GET', '/api/studio/surfaces', '401 200 200 200 403'),
  route('POST', '/api/studio/surfaces', '401 404 202 404 403', { body: (t) => ({ uploadId: t.upload, name: 'Matrix surface', units: 'cm' }) }),
  route('GET', '/api/studio/surfaces/[surfaceId]', '401 404 200 404 403', { params: surface }),
  route('GET', '/api/studio/surfaces/[surfaceId]/prepared', '401 404 200 404 403', { params: surface }),
  // The matrix's surface (the demo ring as OBJ) has no UVs: the owner's image is read and refused in words (422).
  route('POST', '/api/studio/surfaces/[surfaceId]/image-map', '401 404 422 404 403', { params: surface, body: { attribute: 'length', image: GREY_PNG } }),
  route('GET', '/api/studio/surfaces/[surfaceId]', '401 404 404 404 403', { params: { surfaceId: ['not-an-id'] }, note: 'malformed id' }),
  route('DELETE', '/api/studio/surfaces/[surfaceId]', '401 404 200 404 403', { params: { surfaceId: 'spareSurface' } }),
  route('GET', '/api/studio/grooms', '401 200 200 200 403'),
  route('POST', '/api/studio/grooms', '401 404 201 404 403', { body: (t) => ({ surfaceId: t.surface, name: 'Matrix groom' }) }),
  route('POST', '/api/studio/grooms', '401 400 400 400 403', { body: { surfaceId: 'nope' }, note: 'bad input' }),
  route('GET', '/api/studio/grooms/[groomId]', '401 404 200 404 403', { params: groom }),
  route('GET', '/api/studio/grooms/[groomId]', '401 404 404 404 403', { params: { groomId: 'missing' }, note: 'no such groom' }),
  route('PATCH', '/api/studio/grooms/[groomId]', '401 404 200 404 403', { params: groom, body: { name: 'Matrix groom, renamed' } }),
  route('DELETE', '/api/studio/grooms/[groomId]', '401 404 200 404 403', { params: { groomId: 'spareGroom' } }),
  route('PUT', '/api/studio/grooms/[groomId]/spec', '401 404 200 404 403', { params: { groomId: 'specGroom' }, body: (t) => ({ spec: t.spec, baseRevision: t.revision }) }),
  route('PUT', '/api/studio/grooms/[groomId]/spec', '401 400 400 400 403', { params: groom, body: { baseRevision: 0 }, note: 'bad input' }),
  route('POST', '/api/studio/grooms/[groomId]/duplicate', '401 404 201 404 403', { params: groom, body: {} }),
  route('POST', '/api/studio/grooms/[groomId]/surface/preview', '401 404 200 404 403', { params: groom, body: (t) => ({ surfaceId: t.surface }) }),
  route('POST', '/api/studio/grooms/[groomId]/surface/preview', '401 400 400 400 403', { params: groom, body: { surfaceId: 'nope' }, note: 'bad input' }),
  route('PUT', '/api/studio/grooms/[groomId]/surface', '401 404 409 404 403', { params: groom, body: (t) => ({ surfaceId: t.spareSurface, baseRevision: 999_999 }), note: 'a stale revision: nothing moves' }),
  route('PUT', '/api/studio/grooms/[groomId]/surface', '401 400 400 400 403', { params: groom, body: { surfaceId: 'nope' }, note: 'bad input' }),
  route('POST', '/api/studio/grooms/[groomId]/exports', '401 404 202 404 403', { params: groom, body: { format: 'json' } }),
  route('POST', '/api/studio/grooms/[groomId]/exports', '401 400 400 400 403', { params: groom, body: { format: 'docx' }, note: 'bad input' }),
  route('GET', '/api/studio/exports/[exportId]', '401 404 200 404 403', { params: { exportId: 'export' } }),
  route('GET', '/api/studio/grooms/[groomId]/versions', '401 404 200 404 403', { params: groom }),
  route('POST', '/api/studio/grooms/[groomId]/versions', '401 404 201 404 403', { params: groom, body: { name: 'Matrix version' } }),
  route('POST', '/api/studio/grooms/[groomId]/versions/[versionId]/restore', '401 404 200 404 403', { params: { groomId: 'groom', versionId: 'version' } }),

  // The market. The seller is the owner; the buyer bought `boughtListing`.
  route('GET', '/api/market/licences', all(200)),
  route('GET', '/api/market/search', all(200), { query: 'q=coat' }),
  route('GET', '/api/market/search', all(400), { query: 'page=0', note: 'bad input' }),
  route('GET', '/api/market/listings', '401 403 200 200 403'),
  route('POST', '/api/market/listings', '401 403 201 404 403', {
    body: (t) => ({
      groomId: t.groom,
      versionId: t.version,
      title: 'Matrix coat listing',
      description: 'A coat made by the access matrix, to check who may list what.',
      tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
      priceCents: 900,
      currency: 'eur',
      licenceSlug: LICENCE_TEXTS[0].slug,
      formats: ['json'],
      rightsConfirmed: true,
    }),
  }),
  route('GET', '/api/market/listings/[id]', all(200), { params: listing, note: 'published' }),
  route('GET', '/api/market/listings/[id]', '404 404 200 404 200', { params: { id: 'draftListing' }, note: 'draft' }),
  route('PATCH', '/api/market/listings/[id]', '401 403 200 404 403', { params: { id: 'draftListing' }, body: { title: 'Matrix draft, retitled' } }),
  route('PATCH', '/api/market/listings/[id]', '401 403 400 400 403', { params: { id: 'draftListing' }, body: { priceCents: -5 }, note: 'bad input' }),
  route('POST', '/api/market/listings/[id]/submit', '401 403 200 404 403', { params: { id: 'submitListing' } }),
  route('POST', '/api/market/listings/[id]/unlist', '401 403 200 404 403', { params: { id: 'unlistListing' } }),
  route('GET', '/api/market/listings/[id]/pictures/[name]', all(302), { params: { id: 'listing', name: ['front-256'] } }),
  route('GET', '/api/market/listings/[id]/pictures/[name]', '404 404 404 404 404', { params: { id: 'draftListing', name: ['front-256'] }, note: 'draft without pictures' }),
  route('POST', '/api/market/listings/[id]/checkout', '401 200 403 200 403', { params: listing }),
  route('POST', '/api/market/listings/[id]/checkout', '401 409 403 200 403', { params: { id: 'boughtListing' }, note: 'the buyer owns it' }),
  route('PUT', '/api/market/listings/[id]/review', '401 200 403 403 403', { params: { id: 'boughtListing' }, body: { rating: 4, body: 'Lies well.' } }),
  route('PUT', '/api/market/listings/[id]/review', '401 400 400 400 403', { params: { id: 'boughtListing' }, body: { rating: 9 }, note: 'bad input' }),
  route('GET', '/api/library', '401 200 200 200 403'),
  route('POST', '/api/library/[purchaseId]/download', '401 200 404 404 403', { params: { purchaseId: 'purchase' }, note: "the buyer's purchase" }),
  // Listing versions: the seller's updates, the owners' versions, the admins' queue of updates.
  route('POST', '/api/library/[purchaseId]/download', '401 404 404 404 403', { params: { purchaseId: 'purchase' }, query: 'version=7', note: 'a version not theirs' }),
  route('POST', '/api/library/[purchaseId]/download', '401 400 400 400 403', { params: { purchaseId: 'purchase' }, query: 'version=latest', note: 'bad input' }),
  route('GET', '/api/market/listings/[id]/versions', '401 403 200 404 200', { params: listing }),
  route('POST', '/api/market/listings/[id]/versions', '401 403 201 404 403', {
    params: listing,
    body: (t) => ({ groomId: t.groom, versionId: t.version, description: 'A newer coat made by the access matrix, for its owners.', formats: ['json'], rightsConfirmed: true }),
  }),
  route('POST', '/api/market/listings/[id]/versions', '401 403 400 400 403', {
    params: listing,
    body: (t) => ({ groomId: t.groom, versionId: t.version, description: 'A newer coat made by the access matrix, for its owners.', formats: ['json'] }),
    note: 'no rights tick',
  }),
  route('GET', '/api/admin/listing-versions', '401 403 403 403 200'),
  route('POST', '/api/admin/listing-versions/[id]/decision', '401 403 403 403 400', { params: { id: 'waitingVersion' }, body: { approve: false }, note: 'no reason' }),
  route('POST', '/api/admin/listing-versions/[id]/decision', '401 403 403 403 404', { params: { id: 'missing' }, body: { approve: true }, note: 'no such version' }),
  route('POST', '/api/admin/listing-versions/[id]/decision', '401 403 403 403 200', { params: { id: 'waitingVersion' }, body: { approve: false, reason: 'Matrix: show the whole coat.' } }),
  // Refund requests (words branch): the buyer's request on their purchase (it does not stop downloads), the admins' queue.
  route('POST', '/api/library/[purchaseId]/refund-request', '401 201 404 404 403', {
    params: { purchaseId: 'purchase' },
    body: { reason: 'Matrix request: the coat did not fit my character.' },
    note: "the buyer's purchase",
  }),
  route('GET', '/api/admin/refund-requests', '401 403 403 403 200'),
  route('POST', '/api/admin/refund-requests/[id]/decline', '401 403 403 403 404', {
    params: { id: 'missing' },
    body: { answer: 'Matrix answer: no such request.' },
    note: 'no such request',
  }),

  // Fitting a bought preset and trying one before buying: the buyer's own, on the buyer's own surface.
  route('POST', '/api/library/[purchaseId]/fits', '401 202 404 404 403', { params: { purchaseId: 'purchase' }, body: (t) => ({ surfaceId: t.buyerSurface }) }),
  route('POST', '/api/library/[purchaseId]/fits', '401 403 404 404 403', { params: { purchaseId: 'refundedPurchase' }, body: (t) => ({ surfaceId: t.buyerSurface }), note: 'refunded' }),
  route('POST', '/api/library/[purchaseId]/fits', '401 400 400 400 403', { params: { purchaseId: 'purchase' }, body: { surfaceId: 'nope' }, note: 'bad input' }),
  route('GET', '/api/library/fits/[fitId]', '401 200 404 404 403', { params: { fitId: 'fit' } }),
  route('POST', '/api/library/fits/[fitId]/accept', '401 201 404 404 403', { params: { fitId: 'acceptFit' }, body: { name: 'Matrix fitted coat' } }),
  route('POST', '/api/library/fits/[fitId]/accept', '401 400 400 400 403', { params: { fitId: 'fit' }, body: { name: '' }, note: 'bad input' }),
  route('POST', '/api/market/listings/[id]/trials', '401 202 403 404 403', { params: listing, body: (t) => ({ surfaceId: t.buyerSurface }), note: 'the owner sells it' }),
  route('POST', '/api/market/listings/[id]/trials', '401 400 400 400 403', { params: listing, body: {}, note: 'bad input' }),
  route('GET', '/api/market/trials/[trialId]', '401 200 404 404 403', { params: { trialId: 'trial' } }),

  // The seller's figures and payouts.
  route('GET', '/api/sales', '401 403 200 200 403', { query: 'bucket=month' }),
  route('GET', '/api/sales', '401 403 400 400 403', { query: 'bucket=century', note: 'bad input' }),
  route('GET', '/api/sales/export.csv', '401 403 200 200 403'),
  route('GET', '/api/sales/payouts', '401 403 200 200 403'),
  route('POST', '/api/sales/payouts', '401 403 400 400 403', { body: { currency: 'doubloons' }, note: 'bad input' }),
  route('POST', '/api/sales/payouts', '401 403 409 409 403', { body: { currency: 'gbp' }, note: 'nothing to pay out in GBP' }),

  // Admins.
  route('GET', '/api/admin/listings', '401 403 403 403 200'),
  route('GET', '/api/admin/listings', '401 403 403 403 400', { query: 'state=lost', note: 'bad input' }),
  route('POST', '/api/admin/listings/[id]/decision', '401 403 403 403 400', { params: { id: 'submittedListing' }, body: { approve: false }, note: 'no reason' }),
  route('POST', '/api/admin/listings/[id]/decision', '401 403 403 403 200', { params: { id: 'submittedListing' }, body: { approve: true } }),
  route('GET', '/api/admin/purchases', '401 403 403 403 200'),
  route('POST', '/api/admin/purchases/[id]/refund', '401 403 403 403 404', { params: { id: 'missing' }, body: {}, note: 'no such purchase' }),
  route('POST', '/api/admin/purchases/[id]/refund', '401 403 403 403 200', { params: { id: 'refundPurchase' }, body: { reason: 'Matrix refund.' } }),
  route('POST', '/api/admin/reconcile', '401 403 403 403 200'),
  route('GET', '/api/admin/mail', '401 403 403 403 200'),
  route('GET', '/api/admin/accounts', '401 403 403 403 200'),
  route('PATCH', '/api/admin/accounts/[id]', '401 403 403 403 200', { params: { id: 'account' }, body: { roles: ['buyer', 'groomer'] } }),
  route('PATCH', '/api/admin/accounts/[id]', '401 403 403 403 404', { params: { id: 'missing' }, body: { disabled: true }, note: 'no such account' }),
];

//                                                              anon buyer owner other admin
export const PAGE_ROWS: PageRow[] = [
  page('/', all(200)),
  page('/signin', all(200)),
  page('/signup', all(200)),
  page('/forgot-password', all(200)),
  page('/reset-password', all(200)),
  page('/verify-email', all(200)),
  page('/market', all(200)),
  page('/market/[id]', all(200), { params: listing, note: 'published' }),
  page('/market/[id]', '404 404 200 404 200', { params: { id: 'draftListing' }, note: 'draft' }),
  page('/market/[id]', all(404), { params: { id: 'missing' }, note: 'no such listing' }),
  page('/library', 'signin 200 200 200 403'),
  page('/studio', 'signin 200 200 200 403'),
  page('/studio/grooms/[groomId]', 'signin 404 200 404 403', { params: groom }),
  page('/studio/practice/[demoId]', 'signin 200 200 200 403', { params: { demoId: 'demo' } }),
  page('/sales', 'signin 403 200 200 403'),
  page('/sales/new', 'signin 403 200 200 403'),
  page('/sales/listings/[id]/edit', 'signin 403 200 404 403', { params: { id: 'draftListing' } }),
  page('/sales/listings/[id]/versions/new', 'signin 403 200 404 403', { params: listing }),
  page('/admin', 'signin 403 403 403 200'),
  page('/admin/mail', 'signin 403 403 403 200'),
  page('/admin/accounts', 'signin 403 403 403 200'),
];
