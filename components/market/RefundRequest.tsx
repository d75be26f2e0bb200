'use client';
// How a buyer asks for a refund of a purchase from their library: what the law where they live may
// give them (said, not decided, here), the agreement they gave at checkout, and a form with their
// reason that puts the request in the admins' refund queue. An answered or waiting request is shown
// instead of the form while it stands.
import { useId, useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { request } from '@/lib/http/client';
import type { LibraryItem, RefundRequestResponse } from '@/lib/market/types';
import { refundRequestSchema } from '@/lib/market/validation';
import { CANCELLATION_NOTE } from '@/lib/market/vocabulary';
import { formatDate } from './format';
import { TextAreaField, textAreaField } from './TextAreaField';

export function RefundRequest({ item, onAsked }: { item: LibraryItem; onAsked: () => void }) {
  const [open, setOpen] = useState(false);
  const form = useValidatedForm(refundRequestSchema);
  const id = useId();
  const asked = item.refundRequest;

  if (asked && asked.outcome === null) {
    return (
      <p className="text-sm text-loam-soft" data-testid="refund-request-state" data-outcome="waiting">
        You asked for a refund on {formatDate(asked.requestedAt)}: “{asked.reason}”. An admin answers by e-mail.
      </p>
    );
  }

  return (
    <div className="flex flex-col gap-2">
      {asked?.outcome === 'declined' && (
        <p className="text-sm text-loam-soft" data-testid="refund-request-state" data-outcome="declined">
          Your refund request of {formatDate(asked.requestedAt)} was declined: “{asked.answer}”
        </p>
      )}
      {open ? (
        <form
          noValidate
          aria-label={`Ask for a refund of ${item.listing.title}`}
          className="flex flex-col gap-3 rounded-2xl bg-chalk p-4"
          onSubmit={form.onSubmit(async (input) => {
            const outcome = await request<RefundRequestResponse>('POST', `/api/library/${item.purchaseId}/refund-request`, input);
            if (!outcome.ok) return outcome.error;
            setOpen(false);
            onAsked();
          })}
        >
          <p className="text-sm text-loam-soft">{CANCELLATION_NOTE}</p>
          <p className="text-sm text-loam-soft" data-testid="checkout-agreement">
            {item.cancellationWaived
              ? 'At checkout you agreed that, where the law allows it, your right to cancel ends once the download starts.'
              : 'At checkout you did not agree to give up a right to cancel once the download starts.'}
          </p>
          {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
          <TextAreaField
            id={`${id}-reason`}
            label="Why you ask for a refund"
            hint="What did not work for you? The admins who decide read this."
            {...textAreaField(form.field('reason'))}
          />
          <div className="flex flex-wrap gap-2">
            <Button type="submit" disabled={!form.ready || form.busy}>
              {form.busy ? 'Sending…' : 'Send the request'}
            </Button>
            <Button look="quiet" onClick={() => setOpen(false)}>
              Keep the purchase
            </Button>
          </div>
        </form>
      ) : (
        <div>
          <Button look="quiet" onClick={() => setOpen(true)} aria-expanded={false}>
            Ask for a refund…
          </Button>
        </div>
      )}
    </div>
  );
}
