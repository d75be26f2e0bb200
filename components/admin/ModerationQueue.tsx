'use client';
// Listings waiting for an admin: look at the page, then approve it onto the market or send it
// back with a reason the seller reads (they are e-mailed either way).
import type { AdminListingsResponse } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';
import { DecisionItem, DecisionQueue } from './DecisionParts';

export function ModerationQueue({ initial }: { initial: AdminListingsResponse }) {
  return (
    <DecisionQueue
      url="/api/admin/listings?state=submitted"
      initial={initial}
      items={(response) => response.listings}
      empty="No listing is waiting for review."
      item={(listing, decided) => (
        <DecisionItem
          testId="queue-item"
          data={{ 'data-listing-id': listing.id }}
          pictureUrl={listing.pictureUrl}
          href={`/market/${listing.id}`}
          title={listing.title}
          name={listing.title}
          assets={listing.assets}
          approveLabel="Approve"
          decisionUrl={`/api/admin/listings/${listing.id}/decision`}
          notes={{ approved: `“${listing.title}” is on the market; the seller has been told.`, rejected: `“${listing.title}” went back to its seller with your reason.` }}
          rejectHint="The seller reads this in an e-mail and beside the listing."
          decided={decided}
        >
          <p className="text-sm text-loam-soft">
            {listing.seller.displayName} ({listing.seller.email}) · {formatPrice(listing.priceCents, listing.currency)} · {listing.groomName}
            {listing.versionNumber !== null && `, version ${listing.versionNumber}`}
            {listing.submittedAt && ` · submitted ${formatDateTime(listing.submittedAt)}`}
          </p>
        </DecisionItem>
      )}
    />
  );
}
