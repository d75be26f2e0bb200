'use client';
// Starts a card checkout: the server creates the payment session with the price from the
// database and answers with the address of the provider's hosted checkout page, where the
// browser goes next. The listing is remembered for the page the checkout returns to, which
// waits for the purchase to arrive. Before paying, the buyer may agree that a right to cancel ends
// with the download where the law allows that (optional; what no agreement means is said beside it).
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import type { ApiError } from '@/lib/http/types';
import type { CheckoutResponse } from '@/lib/market/types';
import { AGE_NOTE, WAIVER_AGREEMENT, WITHOUT_WAIVER } from '@/lib/market/vocabulary';
import { rememberCheckout } from './pending-checkout';

export function BuyButton({ listingId, title, priceLabel }: { listingId: string; title: string; priceLabel: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<ApiError | null>(null);
  // The buyer's choice, sent with the checkout and kept with the purchase; nothing is ticked for them.
  const [waiveCancellation, setWaiveCancellation] = useState(false);

  async function buy() {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<CheckoutResponse>(`/api/market/listings/${listingId}/checkout`, { waiveCancellation });
    if (outcome.ok) {
      rememberCheckout({ listingId, title });
      window.location.assign(outcome.data.url);
      return;
    }
    if (outcome.error.code === 'not-signed-in') {
      window.location.assign(`/signin?callbackUrl=${encodeURIComponent(`/market/${listingId}`)}`);
      return;
    }
    setBusy(false);
    setProblem(outcome.error);
  }

  return (
    <div className="flex flex-col gap-3">
      <label className="flex items-start gap-2 text-sm text-loam">
        <input
          type="checkbox"
          name="waiveCancellation"
          checked={waiveCancellation}
          onChange={(event) => setWaiveCancellation(event.target.checked)}
          className="mt-1 accent-bracken"
        />
        <span>{WAIVER_AGREEMENT}</span>
      </label>
      {!waiveCancellation && (
        <p className="text-xs text-loam-soft" data-testid="without-waiver">
          {WITHOUT_WAIVER}
        </p>
      )}
      <p className="text-xs text-loam-soft">{AGE_NOTE}</p>
      <Button onClick={buy} disabled={busy} className="w-full py-3 text-base">
        {busy ? 'Opening the checkout…' : `Buy for ${priceLabel}`}
      </Button>
      {problem && (
        <Notice tone="error">
          {problem.message}
          {(problem.code as string) === 'already-owned' && (
            <>
              {' '}
              <Link href="/library" className="font-semibold">
                Open your library
              </Link>
            </>
          )}
        </Notice>
      )}
    </div>
  );
}
