// One preset in the market's results: its picture, title, seller, tags, density and lengths, rating and price.
import Link from 'next/link';
import type { ListingCard } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { Stars } from './Stars';
import { amount, lengthRange } from './listing-facts';
import { tagLabel } from './search-params';

export function ListingTile({ listing }: { listing: ListingCard }) {
  const tags = [listing.tags.animal, listing.tags.coatLength, listing.tags.style, listing.tags.bodyRegion];
  return (
    <li data-testid="listing-tile" className="relative flex flex-col overflow-hidden rounded-3xl bg-white ring-2 ring-vellum hover:ring-tarn/40">
      <div className="aspect-square bg-tarn-deep">
        {listing.pictureUrl ? (
          // eslint-disable-next-line @next/next/no-img-element -- a redirect to a short-lived object-storage URL
          <img src={listing.pictureUrl} alt="" className="h-full w-full object-cover" loading="lazy" />
        ) : (
          <div className="flex h-full items-center justify-center text-sm text-chalk/60">Pictures on their way</div>
        )}
      </div>
      <div className="flex flex-1 flex-col gap-2 p-4">
        <h2 className="text-lg leading-snug font-bold">
          <Link href={`/market/${listing.id}`} className="text-loam no-underline after:absolute after:inset-0 hover:underline">
            {listing.title}
          </Link>
        </h2>
        <p className="text-sm text-loam-soft">by {listing.seller.displayName}</p>
        <ul className="flex flex-wrap gap-1" aria-label="Tags">
          {tags.map((tag) => (
            <li key={tag} className="rounded-full bg-lichen-pale px-2 py-0.5 text-xs font-medium text-tarn-deep">
              {tagLabel(tag)}
            </li>
          ))}
        </ul>
        <p className="text-sm text-loam-soft">
          {listing.facts ? `${amount(listing.facts.guidesPerCm2)} guides per cm² · ${lengthRange(listing.facts)}` : 'Being measured'} ·{' '}
          {listing.formats.length} file format{listing.formats.length === 1 ? '' : 's'}
        </p>
        <div className="mt-auto flex items-center justify-between gap-2 pt-2">
          <Stars rating={listing.rating.average} count={listing.rating.count} size="text-sm" />
          <span className="font-bold text-bracken-deep" data-testid="listing-price">
            {formatPrice(listing.priceCents, listing.currency)}
          </span>
        </div>
      </div>
    </li>
  );
}
