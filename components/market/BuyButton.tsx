'use client';
// Starts a card checkout: the server creates the payment session with the price from the
// database and answers with the address of the provider's hosted checkout page, where the
// browser goes next. The listing is remembered for the page the checkout returns to, which
// waits for the purchase to arrive.
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import type { ApiError } from '@/lib/http/types';
import type { CheckoutResponse } from '@/lib/market/types';
import { rememberCheckout } from './pending-checkout';

export function BuyButton({ listingId, title, priceLabel }: { listingId: string; title: string; priceLabel: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<ApiError | null>(null);

  async function buy() {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<CheckoutResponse>(`/api/market/listings/${listingId}/checkout`, {});
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
