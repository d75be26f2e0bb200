'use client';
// Listings waiting for an admin: look at the page, then approve it onto the market or send it
// back with a reason the seller reads (they are e-mailed either way).
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { AdminListingsResponse, DecisionResponse, ListingSummary } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';
import { QueueFrame, RejectForm } from './DecisionParts';

const QUEUE = '/api/admin/listings?state=submitted';

export function ModerationQueue({ initial }: { initial: AdminListingsResponse }) {
  const { data, error, mutate } = useServerSeededSWR<AdminListingsResponse>(QUEUE, initial, {
    refreshInterval: 10_000,
  });
  const [done, setDone] = useState<string | null>(null);
  const listings = data?.listings ?? [];
  return (
    <QueueFrame done={done} error={error} empty={listings.length === 0 ? 'No listing is waiting for review.' : null}>
      {listings.map((listing) => (
        <QueueItem
          key={listing.id}
          listing={listing}
          onDecided={async (text) => {
            setDone(text);
            await mutate();
          }}
        />
      ))}
    </QueueFrame>
  );
}

function QueueItem({ listing, onDecided }: { listing: ListingSummary; onDecided: (message: string) => Promise<void> }) {
  const [rejecting, setRejecting] = useState(false);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  async function decide(approve: boolean, reason?: string) {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<DecisionResponse>(`/api/admin/listings/${listing.id}/decision`, { approve, reason });
    setBusy(false);
    if (!outcome.ok) return outcome.error;
    await onDecided(approve ? `“${listing.title}” is on the market; the seller has been told.` : `“${listing.title}” went back to its seller with your reason.`);
  }

  return (
    <li className="flex flex-col gap-3 rounded-3xl bg-white p-5 ring-2 ring-vellum" data-testid="queue-item" data-listing-id={listing.id}>
      <div className="flex flex-wrap items-start gap-4">
        <div className="h-20 w-20 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
          {listing.pictureUrl && (
            // eslint-disable-next-line @next/next/no-img-element -- a redirect to a short-lived object-storage URL
            <img src={listing.pictureUrl} alt="" className="h-full w-full object-cover" />
          )}
        </div>
        <div className="flex flex-1 flex-col gap-1">
          <Link href={`/market/${listing.id}`} className="text-lg font-bold text-loam">
            {listing.title}
          </Link>
          <p className="text-sm text-loam-soft">
            {listing.seller.displayName} ({listing.seller.email}) · {formatPrice(listing.priceCents, listing.currency)} · {listing.groomName}
            {listing.versionNumber !== null && `, version ${listing.versionNumber}`}
            {listing.submittedAt && ` · submitted ${formatDateTime(listing.submittedAt)}`}
          </p>
          <p className="text-sm">
            {listing.assets.status === 'ready'
              ? 'Pictures, preview and package are ready.'
              : listing.assets.status === 'pending'
                ? 'Pictures, preview and package are still being made.'
                : `Pictures and package failed: ${listing.assets.error}`}
          </p>
        </div>
        <div className="flex gap-2">
          <Button
            onClick={async () => {
              const failure = await decide(true);
              if (failure) setProblem(failure.message);
            }}
            disabled={busy || listing.assets.status !== 'ready'}
          >
            Approve
          </Button>
          <Button look="quiet" onClick={() => setRejecting((open) => !open)} aria-expanded={rejecting} disabled={busy}>
            Reject…
          </Button>
        </div>
      </div>
      {problem && <Notice tone="error">{problem}</Notice>}
      {rejecting && <RejectForm what={listing.title} hint="The seller reads this in an e-mail and beside the listing." reject={(reason) => decide(false, reason)} />}
    </li>
  );
}
