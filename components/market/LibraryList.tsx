'use client';
// The buyer's purchases: download the package (a short-lived link, every download logged),
// refunded ones marked and without download, and a review for each preset still owned. After a
// checkout the list is read again until the new purchase has arrived.
import Link from 'next/link';
import { useEffect, useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { LibraryItem, LibraryResponse } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDate } from './format';
import { forgetCheckout, pendingCheckout, type PendingCheckout } from './pending-checkout';
import { PresetOnSurface } from './PresetOnSurface';
import { ReviewForm } from './ReviewForm';
import { UpdateNotices, VersionDownloads } from './LibraryVersions';
import { RefundRequest } from './RefundRequest';

/** How long the page waits for a paid checkout to show up before saying so. */
const ARRIVAL_WAIT_MS = 90_000;

type Arrival = { state: 'waiting'; checkout: PendingCheckout | null; since: number } | { state: 'arrived'; title: string } | { state: 'late' };

function arrivedItem(items: LibraryItem[], checkout: PendingCheckout | null, since: number): LibraryItem | undefined {
  return items.find((item) =>
    checkout ? item.listing.id === checkout.listingId && item.status === 'paid' : Date.parse(item.purchasedAt) >= since - 10 * 60_000,
  );
}

export function LibraryList({ initial, justPaid, maxUploadBytes }: { initial: LibraryResponse; justPaid: boolean; maxUploadBytes: number }) {
  const [arrival, setArrival] = useState<Arrival | null>(null);
  useEffect(() => {
    if (justPaid) setArrival({ state: 'waiting', checkout: pendingCheckout(), since: Date.now() });
  }, [justPaid]);
  const waiting = arrival?.state === 'waiting';
  const { data, error, mutate } = useServerSeededSWR<LibraryResponse>('/api/library', initial, {
    refreshInterval: waiting ? 1_500 : 0,
  });

  useEffect(() => {
    if (arrival?.state !== 'waiting' || !data) return;
    const item = arrivedItem(data.purchases, arrival.checkout, arrival.since);
    if (item) {
      forgetCheckout();
      setArrival({ state: 'arrived', title: item.listing.title });
      return;
    }
    const left = arrival.since + ARRIVAL_WAIT_MS - Date.now();
    const timer = setTimeout(() => setArrival({ state: 'late' }), Math.max(0, left));
    return () => clearTimeout(timer);
  }, [arrival, data]);

  const purchases = data?.purchases ?? [];
  return (
    <div className="flex flex-col gap-6">
      {arrival?.state === 'waiting' && (
        <div role="status" className="flex items-center gap-3 rounded-2xl border-l-4 border-pollen bg-vellum px-4 py-3 text-sm" data-testid="purchase-waiting">
          <span className="inline-block h-3 w-3 animate-ping rounded-full bg-bracken" aria-hidden="true" />
          Payment received{arrival.checkout ? ` for “${arrival.checkout.title}”` : ''}. Waiting for the payment provider to confirm it — your
          preset appears here in a moment.
        </div>
      )}
      {arrival?.state === 'arrived' && (
        <Notice tone="success">
          <span data-testid="purchase-arrived">“{arrival.title}” is in your library. Download it below.</span>
        </Notice>
      )}
      {arrival?.state === 'late' && (
        <Notice tone="info">
          The payment provider has not confirmed the purchase yet. It will appear here as soon as it does; nothing is charged twice
          if you wait. Reload the page in a few minutes.
        </Notice>
      )}
      {error && <Notice tone="error">{error.message}</Notice>}
      <UpdateNotices items={purchases} />
      {purchases.length === 0 ? (
        <div className="rounded-3xl border-2 border-dashed border-tarn/30 p-8 text-loam-soft">
          Nothing here yet. Presets you buy on the{' '}
          <Link href="/market" className="font-semibold text-tarn">
            market
          </Link>{' '}
          land here, ready to download.
        </div>
      ) : (
        <ul className="flex flex-col gap-5" aria-label="Your presets">
          {purchases.map((item) => (
            <PurchaseCard key={item.purchaseId} item={item} onDownloaded={() => mutate()} maxUploadBytes={maxUploadBytes} />
          ))}
        </ul>
      )}
    </div>
  );
}

function PurchaseCard({ item, onDownloaded, maxUploadBytes }: { item: LibraryItem; onDownloaded: () => void; maxUploadBytes: number }) {
  const refunded = item.status === 'refunded' || item.refundPending;
  const [reviewing, setReviewing] = useState(false);
  const [fitting, setFitting] = useState(false);
  return (
    <li
      id={`purchase-${item.purchaseId}`}
      data-testid="library-item"
      data-status={item.status}
      className={`flex flex-col gap-4 rounded-3xl p-5 ring-2 sm:flex-row ${refunded ? 'bg-vellum/50 ring-vellum' : 'bg-white ring-vellum'}`}
    >
      <div className="h-28 w-28 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
        {item.listing.pictureUrl && (
          // eslint-disable-next-line @next/next/no-img-element -- a redirect to a short-lived object-storage URL
          <img src={item.listing.pictureUrl} alt="" className={`h-full w-full object-cover ${refunded ? 'opacity-50 grayscale' : ''}`} />
        )}
      </div>
      <div className="flex flex-1 flex-col gap-2">
        <div className="flex flex-wrap items-center gap-2">
          <h2 className="text-xl font-bold">
            <Link href={`/market/${item.listing.id}`} className="text-loam no-underline hover:underline">
              {item.listing.title}
            </Link>
          </h2>
          {item.status === 'refunded' && (
            <span className="rounded-full bg-hawthorn-pale px-2.5 py-0.5 text-xs font-bold text-hawthorn" data-testid="refunded-mark">
              Refunded{item.refundedAt ? ` ${formatDate(item.refundedAt)}` : ''}
            </span>
          )}
          {item.refundPending && (
            <span className="rounded-full bg-hawthorn-pale px-2.5 py-0.5 text-xs font-bold text-hawthorn" data-testid="refunded-mark">
              Being refunded
            </span>
          )}
        </div>
        <p className="text-sm text-loam-soft">
          by {item.listing.seller.displayName} · bought {formatDate(item.purchasedAt)} for {formatPrice(item.amountCents, item.currency)} ·{' '}
          {item.licence.title}
        </p>
        <p className="text-sm text-loam-soft">
          {item.listing.formats.length} file format{item.listing.formats.length === 1 ? '' : 's'} ·{' '}
          {item.downloads === 0 ? 'not downloaded yet' : `downloaded ${item.downloads} time${item.downloads === 1 ? '' : 's'}`}
          {item.currentVersion > 1 && ` · version ${item.boughtVersion} bought, version ${item.currentVersion} on the market`}
        </p>
        {refunded ? (
          <p className="text-sm text-loam-soft">
            The money went back to your card, and with it the licence: the files are no longer yours to download or use in new work,
            and the preset can no longer be fitted to your surfaces.
          </p>
        ) : (
          <div className="flex flex-col gap-3 pt-1">
            <div className="flex flex-wrap items-center gap-3">
              <VersionDownloads item={item} onDownloaded={onDownloaded} />
              <Button look="quiet" onClick={() => setFitting((open) => !open)} aria-expanded={fitting}>
                {fitting ? 'Close the fitting' : 'Fit to my character'}
              </Button>
              <Button look="quiet" onClick={() => setReviewing((open) => !open)} aria-expanded={reviewing}>
                {reviewing ? 'Close the review' : 'Rate and review'}
              </Button>
            </div>
            {fitting && (
              <div className="rounded-2xl bg-vellum/50 p-4">
                <PresetOnSurface kind="fit" startUrl={`/api/library/${item.purchaseId}/fits`} title={item.listing.title} maxUploadBytes={maxUploadBytes} />
              </div>
            )}
            {reviewing && (
              <div className="rounded-2xl bg-chalk p-4">
                <ReviewForm listingId={item.listing.id} title={item.listing.title} />
              </div>
            )}
            <RefundRequest item={item} onAsked={onDownloaded} />
          </div>
        )}
      </div>
    </li>
  );
}
