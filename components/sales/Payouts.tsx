'use client';
// The seller's balance as it is, per currency: what can be paid out now, what is held (sales are
// paid out some days after the sale, so refunds come first), what waits for an asked refund,
// and what is owed after a refund of a sale already paid out (kept back from later sales). "Pay
// out" asks for confirmation before the transfer; then the history, with payouts in progress.
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import { TAX_NOTE, formatPrice, type Currency } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';
import type { Balance, PayoutResponse, PayoutsResponse } from '@/lib/market/types';

export function Payouts({ initialPayouts, balance, holdDays }: { initialPayouts: PayoutsResponse; balance: Balance[]; holdDays: number }) {
  const router = useRouter();
  const { data, mutate } = useServerSeededSWR<PayoutsResponse>('/api/sales/payouts', initialPayouts);
  const [busy, setBusy] = useState<Currency | null>(null);
  const [confirming, setConfirming] = useState<Currency | null>(null);
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);

  async function payOut(currency: Currency) {
    setBusy(currency);
    setMessage(null);
    const outcome = await postJson<PayoutResponse>('/api/sales/payouts', { currency });
    setBusy(null);
    setConfirming(null);
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
      {balance.length === 0 ? (
        <p className="text-loam-soft" data-testid="balance">
          No sales yet, so nothing to pay out.
        </p>
      ) : (
        <div className="flex flex-wrap gap-3">
          {balance.map((b) => (
            <BalanceCard
              key={b.currency}
              balance={b}
              holdDays={holdDays}
              busy={busy}
              confirming={confirming === b.currency}
              onAsk={() => setConfirming(b.currency)}
              onCancel={() => setConfirming(null)}
              onConfirm={() => payOut(b.currency)}
            />
          ))}
        </div>
      )}
      <p className="max-w-xl text-xs text-loam-soft">
        Payouts go to the payout account the payment provider keeps for you. {TAX_NOTE}
      </p>
      <p className="max-w-xl text-xs text-loam-soft" data-testid="refund-after-payout">
        A sale refunded after it was paid out is not taken back from your bank account: your share of it is kept back from your later sales
        before anything more is paid out.
      </p>
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
              <tr key={payout.id} className="border-t border-vellum" data-status={payout.status}>
                <td className="py-1.5">{formatDateTime(payout.createdAt)}</td>
                <td className="py-1.5 text-right tabular-nums">{formatPrice(payout.amountCents, payout.currency)}</td>
                <td className="py-1.5 pl-4 font-mono text-xs text-loam-soft">
                  {payout.transferId ??
                    (payout.status === 'pending' && (
                      <Button look="quiet" onClick={() => payOut(payout.currency)} disabled={busy !== null} className="px-3 py-1 font-sans">
                        {busy === payout.currency ? 'Finishing…' : 'In progress: finish it now'}
                      </Button>
                    ))}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

function BalanceCard(props: {
  balance: Balance;
  holdDays: number;
  busy: Currency | null;
  confirming: boolean;
  onAsk: () => void;
  onCancel: () => void;
  onConfirm: () => void;
}) {
  const { balance: b, holdDays, busy, confirming } = props;
  const money = (cents: number) => formatPrice(cents, b.currency);
  const negative = b.balanceCents < 0;
  const lines: { label: string; cents: number; note?: string }[] = [
    { label: 'Can be paid out now', cents: b.payableCents },
    ...(b.clearedCents > 0 && b.owedCents > 0 ? [{ label: 'Sales past the holding period', cents: b.clearedCents }] : []),
    ...(b.heldCents > 0
      ? [{ label: 'Held', cents: b.heldCents, note: `sales are paid out ${holdDays} days after the sale${b.heldUntil ? `; the first on ${formatDateTime(b.heldUntil)}` : ''}` }]
      : []),
    ...(b.refundPendingCents > 0 ? [{ label: 'Waiting for refunds asked', cents: b.refundPendingCents }] : []),
    ...(b.owedCents > 0
      ? [{ label: 'Owed', cents: -b.owedCents, note: 'refunds of sales already paid out; kept back from your next sales before anything more is paid out' }]
      : []),
  ];
  return (
    <div className={`flex min-w-[18rem] flex-col gap-3 rounded-2xl px-4 py-3 ${negative ? 'bg-hawthorn-pale' : 'bg-lichen-pale'}`} data-testid="balance-card" data-currency={b.currency}>
      <div>
        <div className="text-xs font-bold uppercase tracking-wide text-loam-soft">Balance {b.currency.toUpperCase()}</div>
        <div className={`text-xl font-extrabold ${negative ? 'text-hawthorn' : ''}`} data-testid="balance">
          {money(b.balanceCents)}
        </div>
        {negative && <p className="text-sm">You owe the market {money(-b.balanceCents)}: it is settled from your later sales.</p>}
      </div>
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm">
        {lines.map((line) => (
          <div key={line.label} className="contents">
            <dt>
              {line.label}
              {line.note && <span className="block text-xs text-loam-soft">{line.note}</span>}
            </dt>
            <dd className="text-right tabular-nums">{money(line.cents)}</dd>
          </div>
        ))}
      </dl>
      {b.payableCents > 0 &&
        (confirming ? (
          <div className="flex flex-col gap-2 rounded-xl bg-white px-3 py-2" role="group" aria-label={`Confirm the payout of ${money(b.payableCents)}`}>
            <p className="text-sm">
              Transfer {money(b.payableCents)} to your payout account now? A payout cannot be taken back from here.
            </p>
            <div className="flex gap-2">
              <Button onClick={props.onConfirm} disabled={busy !== null} className="px-3 py-1.5">
                {busy === b.currency ? 'Paying out…' : `Yes, pay out ${money(b.payableCents)}`}
              </Button>
              <Button look="quiet" onClick={props.onCancel} disabled={busy !== null} className="px-3 py-1.5">
                Not now
              </Button>
            </div>
          </div>
        ) : (
          <Button onClick={props.onAsk} disabled={busy !== null}>
            {`Pay out ${b.currency.toUpperCase()}…`}
          </Button>
        ))}
    </div>
  );
}
