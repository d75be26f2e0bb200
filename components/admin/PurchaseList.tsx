'use client';
// Recent purchases for the admins: refund one through the payment provider (the buyer's
// downloads stop at once; the provider's webhook marks it refunded), and reconcile the payments
// whose webhook never arrived.
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { AdminPurchase, AdminPurchasesResponse, ReconcileResponse, RefundResponse } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';

const HEADINGS = ['When', 'Preset', 'Buyer', 'Paid', 'Status'];
const ALL_PURCHASES = '/api/admin/purchases';

export function PurchaseList({ initial }: { initial: AdminPurchasesResponse }) {
  const [email, setEmail] = useState('');
  const key = email ? `/api/admin/purchases?email=${encodeURIComponent(email)}` : ALL_PURCHASES;
  // The page's server copy is the unfiltered list; a filter by e-mail is read from the API.
  const { data, error, mutate } = useServerSeededSWR<AdminPurchasesResponse>(
    key,
    initial,
    {
      // While a refund waits for the provider's confirmation, look again.
      refreshInterval: (latest) => (latest?.purchases.some((p) => p.refundPending) ? 2_000 : 0),
    },
    ALL_PURCHASES,
  );
  const purchases = data?.purchases ?? [];

  function filter(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setEmail(String(new FormData(event.currentTarget).get('email') ?? '').trim());
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <form role="search" aria-label="Purchases by buyer" onSubmit={filter} className="flex items-end gap-2">
          <div className="flex flex-col gap-1.5">
            <label htmlFor="purchase-email" className="text-sm font-semibold">
              Buyer’s e-mail
            </label>
            <input id="purchase-email" name="email" type="email" defaultValue={email} className="rounded-xl border-2 border-vellum bg-white px-3 py-2" />
          </div>
          <Button type="submit" look="quiet">
            Find
          </Button>
        </form>
        <ReconcileButton onDone={() => mutate()} />
      </div>
      {error && <Notice tone="error">{error.message}</Notice>}
      {purchases.length === 0 ? (
        <p className="text-loam-soft">No purchases{email ? ` by ${email}` : ''} yet.</p>
      ) : (
        <div className="overflow-x-auto rounded-3xl ring-2 ring-vellum">
          <table className="w-full min-w-[48rem] bg-white text-sm">
            <caption className="sr-only">Recent purchases</caption>
            <thead className="bg-vellum text-left">
              <tr>
                {HEADINGS.map((heading) => (
                  <th key={heading} scope="col" className={`px-4 py-2.5 ${heading === 'Paid' ? 'text-right' : ''}`}>
                    {heading}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {purchases.map((purchase) => (
                <PurchaseRow key={purchase.id} purchase={purchase} onChanged={() => mutate()} />
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

function PurchaseRow({ purchase, onChanged }: { purchase: AdminPurchase; onChanged: () => void }) {
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  async function refund(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const reason = String(new FormData(event.currentTarget).get('reason') ?? '').trim();
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<RefundResponse>(`/api/admin/purchases/${purchase.id}/refund`, reason ? { reason } : {});
    setBusy(false);
    if (!outcome.ok) {
      setProblem(outcome.error.fields?.reason ?? outcome.error.message);
      return;
    }
    setConfirming(false);
    onChanged();
  }

  return (
    <tr className="border-t border-vellum align-top" data-testid="admin-purchase" data-purchase-id={purchase.id} data-status={purchase.status}>
      <td className="px-4 py-2.5 whitespace-nowrap">{formatDateTime(purchase.createdAt)}</td>
      <td className="px-4 py-2.5">
        <a href={`/market/${purchase.listing.id}`} className="text-loam">
          {purchase.listing.title}
        </a>
      </td>
      <td className="px-4 py-2.5">
        {purchase.buyer.displayName}
        <div className="text-xs text-loam-soft">{purchase.buyer.email}</div>
      </td>
      <td className="px-4 py-2.5 text-right tabular-nums">{formatPrice(purchase.amountCents, purchase.currency)}</td>
      <td className="px-4 py-2.5">
        {purchase.status === 'refunded' ? (
          <span className="font-semibold text-hawthorn">Refunded {purchase.refundedAt && formatDateTime(purchase.refundedAt)}</span>
        ) : purchase.refundPending ? (
          <span className="font-semibold text-loam-soft">Refund asked; waiting for the provider</span>
        ) : confirming ? (
          <form onSubmit={refund} aria-label={`Refund ${purchase.listing.title} to ${purchase.buyer.email}`} className="flex flex-col gap-2">
            {purchase.paidOutAt ? (
              <p className="max-w-xs text-xs text-hawthorn" data-testid="paid-out-warning">
                Already paid out to the seller on {formatDateTime(purchase.paidOutAt)}: the refund leaves the seller owing{' '}
                {formatPrice(purchase.sellerNetCents, purchase.currency)}, kept back from their later sales.
              </p>
            ) : (
              <p className="max-w-xs text-xs text-loam-soft">Not paid out to the seller yet: the sale simply leaves their balance.</p>
            )}
            <label className="flex flex-col gap-1 text-xs font-semibold">
              Reason (optional, kept with the refund)
              <input name="reason" maxLength={500} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm font-normal" />
            </label>
            <div className="flex gap-2">
              <Button type="submit" disabled={busy} className="px-3 py-1.5">
                {busy ? 'Refunding…' : `Refund ${formatPrice(purchase.amountCents, purchase.currency)}`}
              </Button>
              <Button look="quiet" onClick={() => setConfirming(false)} className="px-3 py-1.5">
                Keep
              </Button>
            </div>
          </form>
        ) : (
          <div className="flex items-center gap-3">
            <span>Paid</span>
            <Button look="quiet" onClick={() => setConfirming(true)} className="px-3 py-1.5">
              Refund…
            </Button>
          </div>
        )}
        {problem && (
          <p role="alert" className="pt-1 text-sm text-hawthorn">
            {problem}
          </p>
        )}
      </td>
    </tr>
  );
}

function ReconcileButton({ onDone }: { onDone: () => void }) {
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  async function reconcile() {
    setBusy(true);
    setResult(null);
    const outcome = await postJson<ReconcileResponse>('/api/admin/reconcile', {});
    setBusy(false);
    if (!outcome.ok) {
      setResult({ tone: 'error', text: outcome.error.message });
      return;
    }
    const { checked, recovered, refundsChecked, refundsRecovered } = outcome.data;
    const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
    setResult({
      tone: 'success',
      text:
        `Checked ${plural(checked, 'completed checkout')}; ${recovered === 0 ? 'none was missing' : `recorded ${plural(recovered, 'missing purchase')}`}. ` +
        `Checked ${plural(refundsChecked, 'refund')}; ${refundsRecovered === 0 ? 'none was missing' : `recorded ${plural(refundsRecovered, 'missing refund')}`}.`,
    });
    onDone();
  }
  return (
    <div className="flex flex-col items-end gap-2">
      <Button look="quiet" onClick={reconcile} disabled={busy}>
        {busy ? 'Reconciling…' : 'Reconcile payments'}
      </Button>
      {result && <Notice tone={result.tone}>{result.text}</Notice>}
    </div>
  );
}
