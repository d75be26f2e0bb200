import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { cache } from 'react';
import { BuyButton } from '@/components/market/BuyButton';
import { Cautions } from '@/components/market/Cautions';
import { Gallery } from '@/components/market/Gallery';
import { galleryPictures } from '@/components/market/gallery-pictures';
import { GuidePreview } from '@/components/market/GuidePreview';
import { PresetOnSurface } from '@/components/market/PresetOnSurface';
import { formatDate } from '@/components/market/format';
import { factRows } from '@/components/market/listing-facts';
import { StateBadge } from '@/components/market/StateBadge';
import { Stars } from '@/components/market/Stars';
import { TAG_KEYS, TAG_LABELS, tagLabel } from '@/components/market/search-params';
import { Notice } from '@/components/ui/Notice';
import { actorOf } from '@/lib/accounts/actor';
import { area, mayEnter } from '@/lib/accounts/roles';
import { requireArea } from '@/lib/accounts/session';
import { HttpError } from '@/lib/http/errors';
import { getListingDetail } from '@/lib/market/listings';
import { FORMAT_LABELS, formatPrice } from '@/lib/market/vocabulary';
import { env } from '@/lib/platform/env';

type Props = {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// One read per request, shared by the page and its title.
const readListing = cache(async (id: string) => {
  const session = await requireArea('market');
  if (!UUID.test(id)) notFound();
  try {
    return { session, listing: await getListingDetail(session ? actorOf(session) : null, id.toLowerCase()) };
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) notFound();
    throw error;
  }
});

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { listing } = await readListing((await params).id);
  return { title: listing.title };
}

export default async function ListingPage({ params, searchParams }: Props) {
  const { id } = await params;
  const { session, listing } = await readListing(id);
  const cancelled = (await searchParams).checkout === 'cancelled';
  const price = formatPrice(listing.priceCents, listing.currency);
  const { viewer } = listing;

  return (
    <article className="flex flex-col gap-10">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/market" className="font-semibold text-tarn">
          ← Market
        </Link>
      </nav>

      {cancelled && <Notice tone="info">The checkout was left before paying: nothing was charged.</Notice>}
      {listing.state !== 'published' && (
        <Notice tone="info">
          <span className="flex flex-wrap items-center gap-2">
            <StateBadge state={listing.state} />
            {listing.state === 'rejected' && listing.rejectionReason
              ? `Sent back: ${listing.rejectionReason}`
              : 'Only the seller and the market’s admins see this page until the preset is on the market.'}
          </span>
        </Notice>
      )}

      <div className="grid gap-10 lg:grid-cols-[minmax(0,1fr)_minmax(0,26rem)]">
        <div className="flex flex-col gap-8">
          <Gallery pictures={galleryPictures(listing.gallery)} title={listing.title} />
          <section aria-labelledby="preview-heading" className="flex flex-col gap-3">
            <h2 id="preview-heading" className="text-xl font-bold">
              The guides in 3D
            </h2>
            <GuidePreview url={listing.guidePreviewUrl} title={listing.title} />
          </section>
          {/* Try before buying: people with a studio (buyers, groomers) other than the seller, on a published preset. */}
          {session && mayEnter(area('studio'), session.user.roles) && listing.state === 'published' && !viewer.isSeller && (
            <section aria-labelledby="try-heading" className="flex flex-col gap-3 rounded-3xl bg-vellum/60 p-5">
              <h2 id="try-heading" className="text-xl font-bold">
                Try it on your character
              </h2>
              <p className="text-sm text-loam-soft">
                See this preset carried onto a growth surface of yours before you buy: where each whorl and parting lands, what does not carry over, pictures
                and a light 3D look.
              </p>
              <PresetOnSurface kind="trial" startUrl={`/api/market/listings/${listing.id}/trials`} title={listing.title} maxUploadBytes={env().SURFACE_MAX_BYTES} />
            </section>
          )}
        </div>

        <div className="flex flex-col gap-6">
          <header className="flex flex-col gap-3">
            <h1 className="text-4xl font-extrabold tracking-tight">{listing.title}</h1>
            <p className="text-loam-soft">
              by <span className="font-semibold text-loam">{listing.seller.displayName}</span>
              {listing.publishedAt && <> · on the market since {formatDate(listing.publishedAt)}</>}
            </p>
            <Stars rating={listing.rating.average} count={listing.rating.count} />
          </header>

          <section aria-label="Price" className="flex flex-col gap-4 rounded-3xl bg-vellum p-5">
            <p className="text-3xl font-extrabold text-bracken-deep" data-testid="listing-price">
              {price}
            </p>
            {viewer.owns ? (
              <Notice tone="success">
                You own this preset.{' '}
                <Link href="/library" className="font-semibold">
                  Download it from your library
                </Link>
              </Notice>
            ) : viewer.isSeller ? (
              <p className="text-sm text-loam-soft">
                This is your preset. Follow its sales on{' '}
                <Link href="/sales" className="font-semibold text-tarn">
                  your sales page
                </Link>
                .
              </p>
            ) : viewer.mayBuy ? (
              <BuyButton listingId={listing.id} title={listing.title} priceLabel={price} />
            ) : !session && listing.state === 'published' ? (
              <Link
                href={`/signin?callbackUrl=${encodeURIComponent(`/market/${listing.id}`)}`}
                className="rounded-full bg-bracken px-5 py-3 text-center font-semibold text-chalk no-underline hover:bg-bracken-deep"
              >
                Sign in to buy
              </Link>
            ) : null}
            <p className="text-sm text-loam-soft">{listing.taxNote}</p>
          </section>

          <dl className="grid grid-cols-[auto_1fr] gap-x-5 gap-y-2 text-sm">
            {TAG_KEYS.map((key) => (
              <div key={key} className="contents">
                <dt className="font-semibold text-loam-soft">{TAG_LABELS[key]}</dt>
                <dd>{tagLabel(listing.tags[key])}</dd>
              </div>
            ))}
            <dt className="font-semibold text-loam-soft">Guides on the seller’s surface</dt>
            <dd>{listing.guideCount === null ? 'being counted' : listing.guideCount.toLocaleString('en-GB')}</dd>
            <dt className="font-semibold text-loam-soft">Licence</dt>
            <dd>
              <a href="#licence" className="text-tarn">
                {listing.licence.title}
              </a>
            </dd>
          </dl>

          <section aria-labelledby="facts-heading" className="flex flex-col gap-2">
            <h2 id="facts-heading" className="text-lg font-bold">
              What it is
            </h2>
            {listing.facts ? (
              <dl className="grid grid-cols-[auto_1fr] gap-x-5 gap-y-2 text-sm" data-testid="listing-facts">
                {factRows(listing.facts).map((row) => (
                  <div key={row.term} className="contents">
                    <dt className="font-semibold text-loam-soft">{row.term}</dt>
                    <dd>{row.value}</dd>
                  </div>
                ))}
              </dl>
            ) : (
              <p className="text-sm text-loam-soft">
                {listing.assets.status === 'failed'
                  ? 'Not measured: its pictures and package could not be made.'
                  : 'Its measurements are being taken with its pictures.'}
              </p>
            )}
          </section>

          <section aria-labelledby="files-heading" className="flex flex-col gap-2">
            <h2 id="files-heading" className="text-lg font-bold">
              In the package
            </h2>
            <ul className="flex list-disc flex-col gap-1 pl-5 text-sm" data-testid="package-formats">
              {listing.formats.map((format) => (
                <li key={format}>{FORMAT_LABELS[format]}</li>
              ))}
              <li>The licence (LICENCE.txt) and a README</li>
              {listing.shipsSurface && <li data-testid="ships-surface">The seller’s growth surface (its source file, and in the guides’ files with the binding data)</li>}
            </ul>
            {listing.currentVersion > 1 && (
              <p className="text-sm text-loam-soft" data-testid="listing-version">
                Version {listing.currentVersion}. Owners of an earlier version got it free, and keep the one they bought.
              </p>
            )}
          </section>

          <Cautions />
        </div>
      </div>

      <section aria-labelledby="about-heading" className="flex max-w-3xl flex-col gap-3">
        <h2 id="about-heading" className="text-2xl font-bold">
          About this coat
        </h2>
        <p className="whitespace-pre-line text-loam">{listing.description}</p>
      </section>

      <section id="licence" aria-labelledby="licence-heading" className="flex max-w-3xl flex-col gap-3">
        <h2 id="licence-heading" className="text-2xl font-bold">
          Licence: {listing.licence.title}
        </h2>
        <p className="font-medium text-loam-soft">{listing.licence.summary}</p>
        <div
          className="max-h-[32rem] overflow-y-auto rounded-3xl bg-white p-6 text-sm leading-relaxed whitespace-pre-wrap ring-2 ring-vellum"
          data-testid="licence-text"
          tabIndex={0}
        >
          {listing.licence.body}
        </div>
      </section>

      <section aria-labelledby="reviews-heading" className="flex max-w-3xl flex-col gap-4">
        <div className="flex flex-wrap items-baseline justify-between gap-3">
          <h2 id="reviews-heading" className="text-2xl font-bold">
            Reviews
          </h2>
          {viewer.mayReview && (
            <Link href={`/library#purchase-${viewer.purchaseId}`} className="text-sm font-semibold text-tarn">
              {listing.reviews.some((review) => review.mine) ? 'Edit your review' : 'Review it from your library'}
            </Link>
          )}
        </div>
        {listing.reviews.length === 0 ? (
          <p className="text-loam-soft">No one has reviewed this preset yet.</p>
        ) : (
          <ul className="flex flex-col gap-3">
            {listing.reviews.map((review) => (
              <li key={review.id} className="flex flex-col gap-2 rounded-3xl bg-vellum p-5" data-testid="review">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <Stars rating={review.rating} />
                  <span className="text-sm text-loam-soft">
                    {review.buyer.displayName}
                    {review.mine && ' (you)'} · {formatDate(review.updatedAt)}
                  </span>
                </div>
                {review.body && <p className="whitespace-pre-line">{review.body}</p>}
              </li>
            ))}
          </ul>
        )}
      </section>
    </article>
  );
}
