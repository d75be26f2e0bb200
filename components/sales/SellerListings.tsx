'use client';
// The seller's listings in every state — draft, waiting for review, on the market, sent back
// (with the admin's reason), taken off the market — with what can be done to each.
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { ListingSummary, OwnListingsResponse, UpdateListingResponse } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDate } from '@/components/market/format';
import { StateBadge } from '@/components/market/StateBadge';

export function SellerListings({ initial, highlight }: { initial: OwnListingsResponse; highlight: string | null }) {
  const { data, error, mutate } = useServerSeededSWR<OwnListingsResponse>('/api/market/listings', initial, {
    // While pictures are being made, look again now and then.
    refreshInterval: (latest) => (latest?.listings.some((l) => l.assets.status === 'pending') ? 4_000 : 0),
  });
  const listings = data?.listings ?? [];
  if (error) return <Notice tone="error">{error.message}</Notice>;
  if (listings.length === 0) {
    return (
      <p className="rounded-3xl border-2 border-dashed border-tarn/30 p-6 text-loam-soft">
        You have not listed a preset yet. Save a version of a groom in the studio, then{' '}
        <Link href="/sales/new" className="font-semibold text-tarn">
          list it
        </Link>
        .
      </p>
    );
  }
  return (
    <ul className="flex flex-col gap-3">
      {listings.map((listing) => (
        <ListingRow key={listing.id} listing={listing} highlighted={listing.id === highlight} onChanged={() => mutate()} />
      ))}
    </ul>
  );
}

function ListingRow({ listing, highlighted, onChanged }: { listing: ListingSummary; highlighted: boolean; onChanged: () => void }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const editable = ['draft', 'rejected', 'unlisted'].includes(listing.state);

  async function act(action: 'submit' | 'unlist') {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<UpdateListingResponse>(`/api/market/listings/${listing.id}/${action}`, {});
    setBusy(false);
    if (!outcome.ok) setProblem(outcome.error.message);
    else onChanged();
  }

  return (
    <li
      data-testid="seller-listing"
      data-listing-id={listing.id}
      className={`flex flex-col gap-3 rounded-3xl bg-white p-4 ring-2 sm:flex-row sm:items-center ${highlighted ? 'ring-bracken' : 'ring-vellum'}`}
    >
      <div className="h-16 w-16 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
        {listing.pictureUrl && (
          // eslint-disable-next-line @next/next/no-img-element -- a redirect to a short-lived object-storage URL
          <img src={listing.pictureUrl} alt="" className="h-full w-full object-cover" />
        )}
      </div>
      <div className="flex flex-1 flex-col gap-1">
        <div className="flex flex-wrap items-center gap-2">
          <Link href={`/market/${listing.id}`} className="font-bold text-loam">
            {listing.title}
          </Link>
          <StateBadge state={listing.state} />
          {listing.assets.status === 'pending' && <span className="text-xs text-loam-soft">pictures and files being made…</span>}
          {listing.assets.status === 'failed' && (
            <span className="text-xs font-semibold text-hawthorn">the pictures and files could not be made: {listing.assets.error}</span>
          )}
        </div>
        <p className="text-sm text-loam-soft">
          {formatPrice(listing.priceCents, listing.currency)} · {listing.groomName}
          {listing.versionNumber !== null && `, version ${listing.versionNumber}`} · listed {formatDate(listing.createdAt)}
          {listing.publishedAt && ` · on the market since ${formatDate(listing.publishedAt)}`}
        </p>
        {listing.state === 'rejected' && listing.rejectionReason && (
          <p className="text-sm text-hawthorn" data-testid="rejection-reason">
            Sent back: {listing.rejectionReason}
          </p>
        )}
        {problem && <Notice tone="error">{problem}</Notice>}
      </div>
      <div className="flex flex-wrap gap-2">
        {editable && (
          <Link href={`/sales/listings/${listing.id}/edit`} className="rounded-full border-2 border-tarn/30 px-4 py-2 text-sm font-semibold text-tarn no-underline hover:border-tarn">
            Edit
          </Link>
        )}
        {editable && (
          <Button onClick={() => act('submit')} disabled={busy} className="px-4 py-2">
            Submit for review
          </Button>
        )}
        {listing.state === 'published' && (
          <Link
            href={`/sales/listings/${listing.id}/versions/new`}
            className="rounded-full border-2 border-tarn/30 px-4 py-2 text-sm font-semibold text-tarn no-underline hover:border-tarn"
          >
            New version
          </Link>
        )}
        {(listing.state === 'published' || listing.state === 'submitted') && (
          <Button look="quiet" onClick={() => act('unlist')} disabled={busy} className="px-4 py-2">
            {listing.state === 'published' ? 'Take off the market' : 'Withdraw'}
          </Button>
        )}
      </div>
    </li>
  );
}
