'use client';
// What the admins' review queues share (listings waiting for review, and new versions of listings
// on the market): the frame of a queue — the last decision's note, a load error, the empty
// state — and the form that sends a thing back to its seller with a reason.
import { useId, type ReactNode } from 'react';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import type { ApiRequestError } from '@/lib/http/client';
import type { FieldErrors } from '@/lib/http/field-errors';
import { decisionSchema } from '@/lib/market/validation';
import { TextAreaField, textAreaField } from '@/components/market/TextAreaField';

// A rejection is the decision route's own rules with `approve: false`.
const rejectionSchema = z.object({ reason: z.string() }).superRefine((value, context) => {
  const checked = decisionSchema.safeParse({ approve: false, reason: value.reason });
  if (!checked.success) for (const issue of checked.error.issues) context.addIssue({ code: 'custom', path: issue.path, message: issue.message });
});

export function QueueFrame({ done, error, empty, children }: { done: string | null; error?: ApiRequestError; empty: string | null; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-4">
      {done && <Notice tone="success">{done}</Notice>}
      {error && <Notice tone="error">{error.message}</Notice>}
      {empty ? <p className="rounded-3xl border-2 border-dashed border-tarn/30 p-6 text-loam-soft">{empty}</p> : <ul className="flex flex-col gap-3">{children}</ul>}
    </div>
  );
}

/** Sends a thing back with the admin's reason; `reject` answers the route's failure, if any. */
export function RejectForm({
  what,
  hint,
  reject,
}: {
  what: string;
  hint: string;
  reject: (reason: string) => Promise<{ message: string; fields?: FieldErrors } | undefined>;
}) {
  const form = useValidatedForm(rejectionSchema);
  const id = useId();
  return (
    <form
      noValidate
      aria-label={`Reject ${what}`}
      className="flex flex-col gap-3 rounded-2xl bg-chalk p-4"
      onSubmit={form.onSubmit(async (input) => {
        const failure = await reject(input.reason);
        if (failure) return { message: failure.message, fields: failure.fields };
      })}
    >
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      <TextAreaField id={`${id}-reason`} label="Why it goes back" hint={hint} rows={3} {...textAreaField(form.field('reason'))} />
      <div>
        <Button type="submit" disabled={!form.ready || form.busy}>
          {form.busy ? 'Sending it back…' : 'Send it back to the seller'}
        </Button>
      </div>
    </form>
  );
}
