// The shapes the market's route handlers answer with, shared with the market's pages.
// Money: integer cents with the currency beside it; times: ISO 8601 strings.
import type { ThumbnailView, TransferReport, Unit } from '../groom';
import type { GroomDetail } from '../studio/types';
import type { BodyRegion, CoatLength, Animal, Currency, ListingState, PackageFormat, SalesBucket, Style } from './vocabulary';

export type Money = { cents: number; currency: Currency };

export type ListingTagsOut = { animal: Animal; coatLength: CoatLength; style: Style; bodyRegion: BodyRegion };

/**
 * What a listing is, measured when its assets are built (lib/market/listing-facts.ts): the coat in
 * numbers that mean something on another character, the seller's surface, the ways the spec
 * carries onto a buyer's surface, and what the public preview holds. Lengths in `units`.
 */
export type ListingFacts = {
  units: Unit;
  upAxis: 'y' | 'z';
  guidesPerCm2: number;
  hairsPerGuide: number;
  hairsPerCm2: number;
  /** The area the guides grow on, on the seller's surface. */
  growthAreaCm2: number;
  pointsPerGuide: number;
  length: { combed: number; shortest: number; median: number; longest: number };
  /** The regions (OBJ groups) the spec grows on (empty: the whole surface), and those the seller's surface has. */
  regions: { expected: string[]; surface: string[] };
  /** The seller's surface: triangles, genus, openings (boundary loops), connected pieces, UVs. */
  surface: { faces: number; genus: number | null; openings: number | null; pieces: number; uvs: boolean; uvOverlappingFaces: number };
  /** How the spec can be carried onto a buyer's surface (lib/groom's transferSpec). */
  transfer: { uv: boolean; alignment: boolean };
  preview: { guides: number; pointsPerGuide: number };
};

/** One result of the search. `pictureUrl` is a route of the app that redirects to a short-lived URL. */
export type ListingCard = {
  id: string;
  title: string;
  priceCents: number;
  currency: Currency;
  tags: ListingTagsOut;
  formats: PackageFormat[];
  guideCount: number | null;
  /** Null until the listing's assets are (re)built. */
  facts: ListingFacts | null;
  salesCount: number;
  rating: { average: number | null; count: number };
  seller: { id: string; displayName: string };
  licence: { slug: string; title: string };
  pictureUrl: string | null;
  publishedAt: string | null;
};

export type SearchResponse = { results: ListingCard[]; total: number; page: number; pageSize: number };

export type Review = { id: string; rating: number; body: string; buyer: { displayName: string }; createdAt: string; updatedAt: string; mine: boolean };

export type ListingDetail = ListingCard & {
  description: string;
  state: ListingState;
  rejectionReason: string | null;
  groom: { id: string; name: string; versionId: string; versionNumber: number | null; versionName: string | null };
  gallery: { view: ThumbnailView; size: number; url: string }[];
  guidePreviewUrl: string | null;
  assets: { status: 'pending' | 'ready' | 'failed'; error: string | null };
  licence: { slug: string; title: string; summary: string; body: string };
  reviews: Review[];
  /** What the caller may do: set for the signed-in caller, all false for visitors. */
  viewer: { isSeller: boolean; owns: boolean; purchaseId: string | null; mayBuy: boolean; mayReview: boolean };
  taxNote: string;
  createdAt: string;
  submittedAt: string | null;
  /** Listing versions: the number of the version on sale, and whether its package ships the seller's growth surface. */
  currentVersion: number;
  shipsSurface: boolean;
};

/** A seller's own listing or one in the admin's queue. */
export type ListingSummary = {
  id: string;
  title: string;
  state: ListingState;
  rejectionReason: string | null;
  priceCents: number;
  currency: Currency;
  groomName: string;
  versionNumber: number | null;
  seller: { id: string; displayName: string; email: string };
  assets: { status: 'pending' | 'ready' | 'failed'; error: string | null };
  pictureUrl: string | null;
  createdAt: string;
  submittedAt: string | null;
  publishedAt: string | null;
};

export type LibraryItem = {
  purchaseId: string;
  listing: { id: string; title: string; pictureUrl: string | null; formats: PackageFormat[]; seller: { displayName: string } };
  licence: { slug: string; title: string };
  amountCents: number;
  currency: Currency;
  status: 'paid' | 'refunded';
  refundPending: boolean;
  packageReady: boolean;
  downloads: number;
  purchasedAt: string;
  refundedAt: string | null;
  /** Listing versions: the version bought, the one on sale, and each one the owner may download (none once refunded). */
  boughtVersion: number;
  currentVersion: number;
  versions: { number: number; packageReady: boolean }[];
  /** A newer version than the one bought, not yet downloaded: the library's notice. */
  updateNotice: { number: number } | null;
  /** The buyer's latest refund request for this purchase, open or answered. */
  refundRequest: RefundRequestState | null;
  /** Whether the buyer agreed at checkout that a right to cancel may end once the download starts. */
  cancellationWaived: boolean;
};

export type SalesFigures = {
  currency: Currency;
  revenueCents: number;
  refundCents: number;
  platformFeeCents: number;
  netCents: number;
  units: number;
  refunds: number;
  downloads: number;
};

export type SalesReport = {
  from: string;
  to: string;
  bucket: SalesBucket;
  feePercent: number;
  totals: SalesFigures[];
  series: (SalesFigures & { periodStart: string })[];
  listings: (SalesFigures & { listingId: string; title: string })[];
  balance: Balance[];
  /** Days a sale is held before it can be paid out. */
  payoutHoldDays: number;
  taxNote: string;
};

/**
 * A seller's balance in one currency, as it is: balanceCents = clearedCents + heldCents +
 * refundPendingCents − owedCents (negative when refunds of sales already paid out exceed the
 * sales not paid out yet). payableCents is what a payout would transfer now.
 */
export type Balance = {
  currency: Currency;
  balanceCents: number;
  payableCents: number;
  /** Sales past the holding period, not paid out yet. */
  clearedCents: number;
  /** Sales still in the holding period; heldUntil: when the first of them clears (ISO). */
  heldCents: number;
  heldUntil: string | null;
  /** Sales whose refund was asked and not yet confirmed by the provider. */
  refundPendingCents: number;
  /** Refunds of sales already paid out, kept back from later sales. */
  owedCents: number;
};

/** A payout: pending from the moment its row is written until the provider's transfer is recorded. */
export type Payout = { id: string; amountCents: number; currency: Currency; transferId: string | null; status: 'pending' | 'paid' | 'failed'; createdAt: string };

export type AdminPurchase = {
  id: string;
  listing: { id: string; title: string };
  buyer: { id: string; email: string; displayName: string };
  amountCents: number;
  currency: Currency;
  status: 'paid' | 'refunded';
  refundPending: boolean;
  createdAt: string;
  refundedAt: string | null;
  /** The seller's share of the sale (price − the market's fee). */
  sellerNetCents: number;
  /** When the sale was paid out to the seller; a refund then leaves the seller owing their share. */
  paidOutAt: string | null;
};

export type Licence = { id: string; slug: string; title: string; summary: string; body: string };

export type DownloadLink = { url: string; fileName: string; expiresInSeconds: number };

// What each route handler answers with (docs/market-api.md), by route.

/** GET /api/market/licences */
export type LicencesResponse = { licences: Licence[] };
/** POST /api/market/listings */
export type CreateListingResponse = { listing: ListingSummary };
/** GET /api/market/listings */
export type OwnListingsResponse = { listings: ListingSummary[] };
/** GET /api/market/listings/[id] */
export type ListingResponse = { listing: ListingDetail };
/** PATCH /api/market/listings/[id], and its submit and unlist */
export type UpdateListingResponse = { listing: ListingSummary };
/** PUT /api/market/listings/[id]/review */
export type ReviewResponse = { review: Review };
/** POST /api/market/listings/[id]/checkout */
export type CheckoutResponse = { url: string; sessionId: string };
/** GET /api/library */
export type LibraryResponse = { purchases: LibraryItem[] };
/** POST /api/library/[purchaseId]/download */
export type DownloadResponse = DownloadLink;
/** GET /api/sales */
export type SalesResponse = SalesReport;
/** POST /api/sales/payouts */
export type PayoutResponse = { payout: Payout };
/** GET /api/sales/payouts */
export type PayoutsResponse = { payouts: Payout[] };
/** GET /api/admin/listings */
export type AdminListingsResponse = { listings: ListingSummary[] };
/** POST /api/admin/listings/[id]/decision */
export type DecisionResponse = { listing: ListingSummary };
/** GET /api/admin/purchases */
export type AdminPurchasesResponse = { purchases: AdminPurchase[] };
/** POST /api/admin/purchases/[id]/refund */
export type RefundResponse = { purchase: AdminPurchase };
/** POST /api/admin/reconcile */
export type ReconcileResponse = { recovered: number; checked: number; refundsChecked: number; refundsRecovered: number };
/** POST /api/payments/webhook */
export type WebhookResponse = { received: true; id: string; type: string; outcome: 'handled' | 'duplicate' | 'ignored' | 'refused' };

// Listing versions (lib/market/listings/versions.ts).

/** One version of a listing: the first (reviewed with the listing) or an update, with the seller's confirmation of their rights. */
export type ListingVersionSummary = {
  id: string;
  listingId: string;
  listingTitle: string;
  number: number;
  review: 'listing' | 'submitted' | 'approved' | 'rejected';
  rejectionReason: string | null;
  /** Whether this is the version the market sells now. */
  onSale: boolean;
  groom: { id: string; name: string; versionNumber: number | null; versionName: string | null };
  description: string;
  formats: PackageFormat[];
  notes: string;
  shipsSurface: boolean;
  rights: { confirmedAt: string; wordingVersion: string } | null;
  assets: { status: 'pending' | 'ready' | 'failed'; error: string | null };
  /** A short-lived URL of its front picture (256 px), once made. */
  pictureUrl: string | null;
  seller: { id: string; displayName: string; email: string };
  createdAt: string;
  submittedAt: string | null;
  decidedAt: string | null;
};
/** GET /api/market/listings/[id]/versions */
export type ListingVersionsResponse = { versions: ListingVersionSummary[] };
/** POST /api/market/listings/[id]/versions, POST /api/admin/listing-versions/[id]/decision */
export type ListingVersionResponse = { version: ListingVersionSummary };
/** GET /api/admin/listing-versions */
export type AdminListingVersionsResponse = { versions: ListingVersionSummary[] };
// Refund requests and the checkout's agreement (words branch).
export type RefundRequestState = {
  id: string;
  reason: string;
  requestedAt: string;
  /** null while it waits in the admins' queue. */
  outcome: 'refunded' | 'declined' | null;
  answer: string | null;
  closedAt: string | null;
};
/** An open request as the admins' refund queue shows it. */
export type AdminRefundRequest = {
  id: string;
  reason: string;
  requestedAt: string;
  purchase: AdminPurchase;
  downloads: number;
  cancellationWaived: boolean;
};
/** POST /api/library/[purchaseId]/refund-request */
export type RefundRequestResponse = { request: RefundRequestState };
/** GET /api/admin/refund-requests */
export type AdminRefundRequestsResponse = { requests: AdminRefundRequest[] };
/** POST /api/admin/refund-requests/[id]/decline */
export type RefundDeclineResponse = { request: RefundRequestState };

// A buyer's own use of a preset (lib/market/fitting): a listing's spec carried onto one of their
// surfaces, for a purchase (a fit, accepted into a groom of theirs) or before buying (a trial).
export type PresetTransferView = {
  id: string;
  kind: 'fit' | 'trial';
  status: 'queued' | 'running' | 'done' | 'failed';
  /** What the job is doing now, in words. */
  stage: string;
  listing: { id: string; title: string };
  purchaseId: string | null;
  surface: { id: string; name: string };
  /** Where every place landed, what did not carry over, the index budget (null until done). */
  report: TransferReport | null;
  error: string | null;
  /** The groom an accepted fit made. */
  groomId: string | null;
  /** A trial's reduced preview (null for a fit, and until done). */
  trial: TrialPreview | null;
  createdAt: string;
};

/** What a trial shows: a few guides with few points, built for the trial (never the package's files). */
export type TrialPreview = {
  guideCount: number;
  pointsPerGuide: number;
  /** The listing's own guide count, the whole the share is of. */
  listingGuideCount: number | null;
  /** A short-lived URL of the reduced .glb. */
  previewUrl: string;
  pictures: { view: ThumbnailView; url: string }[];
};

export type PresetTransferResponse = { transfer: PresetTransferView };
export type FitAcceptedResponse = { groom: GroomDetail };
