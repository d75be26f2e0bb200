'use client';
// What the market owes the seller (net of kept sales, less what was paid out), per currency,
// with a "pay out" action that transfers it through the payment provider, and the history.
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import { formatPrice, type Currency } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';
import type { PayoutResponse, PayoutsResponse, SalesResponse } from '@/lib/market/types';

export function Payouts({ initialPayouts, balance }: { initialPayouts: PayoutsResponse; balance: SalesResponse['balance'] }) {
  const router = useRouter();
  const { data, mutate } = useServerSeededSWR<PayoutsResponse>('/api/sales/payouts', initialPayouts);
  const [busy, setBusy] = useState<Currency | null>(null);
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const payable = balance.filter((b) => b.availableCents > 0);

  async function payOut(currency: Currency) {
    setBusy(currency);
    setMessage(null);
    const outcome = await postJson<PayoutResponse>('/api/sales/payouts', { currency });
    setBusy(null);
    if (!outcome.ok) {
      setMessage({ tone: 'error', text: outcome.error.message });
      return;
    }
    setMessage({ tone: 'success', text: `${formatPrice(outcome.data.payout.amountCents, outcome.data.payout.currency)} is on its way to your account.` });
    await mutate();
    // The balance is read on the server with the page.
    router.refresh();
  }

  const payouts = data?.payouts ?? [];
  return (
    <div className="flex flex-col gap-4">
      {message && <Notice tone={message.tone}>{message.text}</Notice>}
      <div className="flex flex-wrap gap-3">
        {payable.length === 0 ? (
          <p className="text-loam-soft" data-testid="balance">
            Nothing to pay out right now.
          </p>
        ) : (
          payable.map((b) => (
            <div key={b.currency} className="flex items-center gap-4 rounded-2xl bg-lichen-pale px-4 py-3">
              <div>
                <div className="text-xs font-bold uppercase tracking-wide text-loam-soft">Available</div>
                <div className="text-xl font-extrabold" data-testid="balance">
                  {formatPrice(b.availableCents, b.currency)}
                </div>
              </div>
              <Button onClick={() => payOut(b.currency)} disabled={busy !== null}>
                {busy === b.currency ? 'Paying out…' : `Pay out ${b.currency.toUpperCase()}`}
              </Button>
            </div>
          ))
        )}
      </div>
      {payouts.length > 0 && (
        <table className="w-full max-w-xl text-sm" data-testid="payout-history">
          <caption className="pb-2 text-left font-semibold">Paid out</caption>
          <thead className="text-left text-loam-soft">
            <tr>
              <th scope="col" className="py-1.5">When</th>
              <th scope="col" className="py-1.5 text-right">Amount</th>
              <th scope="col" className="py-1.5 pl-4">Transfer</th>
            </tr>
          </thead>
          <tbody>
            {payouts.map((payout) => (
              <tr key={payout.id} className="border-t border-vellum">
                <td className="py-1.5">{formatDateTime(payout.createdAt)}</td>
                <td className="py-1.5 text-right tabular-nums">{formatPrice(payout.amountCents, payout.currency)}</td>
                <td className="py-1.5 pl-4 font-mono text-xs text-loam-soft">{payout.transferId}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
