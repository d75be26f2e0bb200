'use client';
// The admins' refund queue: buyers' requests with their reasons, oldest first, with what the law
// where the buyer lives usually turns on (did they agree at checkout that cancelling ends with the
// download, and did they download). An admin refunds (the purchase's refund, which closes the
// request) or declines with an answer the buyer gets by e-mail.
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { AdminRefundRequest, AdminRefundRequestsResponse, RefundDeclineResponse, RefundResponse } from '@/lib/market/types';
import { formatPrice } from '@/lib/market/vocabulary';
import { formatDateTime } from '@/components/market/format';

const QUEUE = '/api/admin/refund-requests';

export function RefundRequests({ initial, onChanged }: { initial: AdminRefundRequestsResponse; onChanged?: () => void }) {
  const { data, error, mutate } = useServerSeededSWR<AdminRefundRequestsResponse>(QUEUE, initial);
  const requests = data?.requests ?? [];
  if (error) return <Notice tone="error">{error.message}</Notice>;
  if (requests.length === 0) return <p className="text-loam-soft">No refund requests waiting.</p>;
  return (
    <ul className="flex flex-col gap-4" aria-label="Refund requests">
      {requests.map((entry) => (
        <RequestCard
          key={entry.id}
          entry={entry}
          onDone={() => {
            void mutate();
            onChanged?.();
          }}
        />
      ))}
    </ul>
  );
}

function RequestCard({ entry, onDone }: { entry: AdminRefundRequest; onDone: () => void }) {
  const [mode, setMode] = useState<'idle' | 'refund' | 'decline'>('idle');
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const { purchase } = entry;

  async function answer(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const text = String(new FormData(event.currentTarget).get('answer') ?? '').trim();
    setBusy(true);
    setProblem(null);
    const outcome =
      mode === 'refund'
        ? await postJson<RefundResponse>(`/api/admin/purchases/${purchase.id}/refund`, { reason: `Asked by the buyer: ${entry.reason}`.slice(0, 500) })
        : await postJson<RefundDeclineResponse>(`/api/admin/refund-requests/${entry.id}/decline`, { answer: text });
    setBusy(false);
    if (!outcome.ok) {
      setProblem(outcome.error.fields?.answer ?? outcome.error.message);
      return;
    }
    setMode('idle');
    onDone();
  }

  return (
    <li className="flex flex-col gap-2 rounded-3xl bg-white p-5 ring-2 ring-vellum" data-testid="refund-request" data-purchase-id={purchase.id}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-bold">
          <a href={`/market/${purchase.listing.id}`} className="text-loam">
            {purchase.listing.title}
          </a>{' '}
          · {formatPrice(purchase.amountCents, purchase.currency)}
        </h3>
        <span className="text-sm text-loam-soft">asked {formatDateTime(entry.requestedAt)}</span>
      </div>
      <p className="text-sm">
        {purchase.buyer.displayName} <span className="text-loam-soft">({purchase.buyer.email})</span>, bought {formatDateTime(purchase.createdAt)}
      </p>
      <blockquote className="border-l-4 border-pollen pl-3 text-sm" data-testid="refund-reason">
        {entry.reason}
      </blockquote>
      <p className="text-xs text-loam-soft">
        {entry.downloads === 0 ? 'Not downloaded.' : `Downloaded ${entry.downloads} time${entry.downloads === 1 ? '' : 's'}.`}{' '}
        {entry.cancellationWaived
          ? 'Agreed at checkout that a right to cancel ends with the download, where the law allows.'
          : 'Did not agree at checkout to give up a right to cancel on download.'}{' '}
        Whether they may cancel depends on the law where they live.
      </p>
      {mode === 'idle' ? (
        <div className="flex gap-2">
          <Button onClick={() => setMode('refund')} className="px-3 py-1.5">
            Refund…
          </Button>
          <Button look="quiet" onClick={() => setMode('decline')} className="px-3 py-1.5">
            Decline…
          </Button>
        </div>
      ) : (
        <form onSubmit={answer} aria-label={`${mode === 'refund' ? 'Refund' : 'Decline'} the request of ${purchase.buyer.email}`} className="flex flex-col gap-2">
          {mode === 'refund' ? (
            purchase.paidOutAt ? (
              <p className="text-xs text-hawthorn">
                Already paid out to the seller: their share of {formatPrice(purchase.sellerNetCents, purchase.currency)} is kept back from their later
                sales.
              </p>
            ) : (
              <p className="text-xs text-loam-soft">Not paid out to the seller yet: the sale simply leaves their balance.</p>
            )
          ) : (
            <label className="flex flex-col gap-1 text-xs font-semibold">
              Answer to the buyer (sent by e-mail)
              <textarea name="answer" required minLength={10} maxLength={2000} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm font-normal" />
            </label>
          )}
          <div className="flex gap-2">
            <Button type="submit" disabled={busy} className="px-3 py-1.5">
              {busy ? 'Sending…' : mode === 'refund' ? `Refund ${formatPrice(purchase.amountCents, purchase.currency)}` : 'Decline the request'}
            </Button>
            <Button look="quiet" onClick={() => setMode('idle')} className="px-3 py-1.5">
              Back
            </Button>
          </div>
        </form>
      )}
      {problem && (
        <p role="alert" className="text-sm text-hawthorn">
          {problem}
        </p>
      )}
    </li>
  );
}
