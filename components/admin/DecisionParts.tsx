'use client';
// What the admins' review queues share (listings waiting for review, and new versions of listings
// on the market): the queue itself — kept fresh from the server, the last decision's note, a load
// error, the empty state —, one item with its picture, approve and reject, and the form that sends
// a thing back to its seller with a reason.
import Link from 'next/link';
import { Fragment, useId, useState, type ReactNode } from 'react';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson, type ApiRequestError } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { FieldErrors } from '@/lib/http/field-errors';
import { decisionSchema } from '@/lib/market/validation';
import type { ListingSummary } from '@/lib/market/types';
import { TextAreaField, textAreaField } from '@/components/market/TextAreaField';

// A rejection is the decision route's own rules with `approve: false`.
const rejectionSchema = z.object({ reason: z.string() }).superRefine((value, context) => {
  const checked = decisionSchema.safeParse({ approve: false, reason: value.reason });
  if (!checked.success) for (const issue of checked.error.issues) context.addIssue({ code: 'custom', path: issue.path, message: issue.message });
});

/**
 * A review queue read from `url` (seeded by the server's copy, refreshed every 10 s and after each
 * decision); `item` draws one entry and calls `decided` with the note to show once it is decided.
 */
export function DecisionQueue<Response, Item extends { id: string }>({
  url,
  initial,
  items,
  empty,
  item,
}: {
  url: string;
  initial: Response;
  items: (response: Response) => Item[];
  empty: string;
  item: (entry: Item, decided: (note: string) => Promise<void>) => ReactNode;
}) {
  const { data, error, mutate } = useServerSeededSWR<Response>(url, initial, { refreshInterval: 10_000 });
  const [done, setDone] = useState<string | null>(null);
  const entries = data ? items(data) : [];
  async function decided(note: string) {
    setDone(note);
    await mutate();
  }
  return (
    <div className="flex flex-col gap-4">
      {done && <Notice tone="success">{done}</Notice>}
      {error && <Notice tone="error">{error.message}</Notice>}
      {entries.length === 0 ? (
        <p className="rounded-3xl border-2 border-dashed border-tarn/30 p-6 text-loam-soft">{empty}</p>
      ) : (
        <ul className="flex flex-col gap-3">{entries.map((entry) => <Fragment key={entry.id}>{item(entry, decided)}</Fragment>)}</ul>
      )}
    </div>
  );
}

/**
 * One thing waiting for a decision: its picture and title (linked to its market page), the lines
 * `children` give, and Approve / Reject… posting `{ approve, reason }` to `decisionUrl`. Approving
 * waits until its pictures, preview and package are ready.
 */
export function DecisionItem({
  testId,
  data,
  pictureUrl,
  href,
  title,
  name,
  assets,
  approveLabel,
  decisionUrl,
  notes,
  rejectHint,
  decided,
  children,
}: {
  testId: string;
  data: Record<`data-${string}`, string>;
  pictureUrl: string | null;
  href: string;
  title: ReactNode;
  /** How the notes and the reject form name the thing. */
  name: string;
  assets: ListingSummary['assets'];
  approveLabel: string;
  decisionUrl: string;
  notes: { approved: string; rejected: string };
  rejectHint: string;
  decided: (note: string) => Promise<void>;
  children: ReactNode;
}) {
  const [rejecting, setRejecting] = useState(false);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  async function decide(approve: boolean, reason?: string) {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<unknown>(decisionUrl, { approve, reason });
    setBusy(false);
    if (!outcome.ok) return outcome.error;
    await decided(approve ? notes.approved : notes.rejected);
  }

  return (
    <li className="flex flex-col gap-3 rounded-3xl bg-white p-5 ring-2 ring-vellum" data-testid={testId} {...data}>
      <div className="flex flex-wrap items-start gap-4">
        <div className="h-20 w-20 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
          {pictureUrl && (
            // eslint-disable-next-line @next/next/no-img-element -- a redirect to a short-lived object-storage URL
            <img src={pictureUrl} alt="" className="h-full w-full object-cover" />
          )}
        </div>
        <div className="flex flex-1 flex-col gap-1">
          <Link href={href} className="text-lg font-bold text-loam">
            {title}
          </Link>
          {children}
          <p className="text-sm">
            {assets.status === 'ready'
              ? 'Pictures, preview and package are ready.'
              : assets.status === 'pending'
                ? 'Pictures, preview and package are still being made.'
                : `Pictures and package failed: ${assets.error}`}
          </p>
        </div>
        <div className="flex gap-2">
          <Button
            onClick={async () => {
              const failure = await decide(true);
              if (failure) setProblem(failure.message);
            }}
            disabled={busy || assets.status !== 'ready'}
          >
            {approveLabel}
          </Button>
          <Button look="quiet" onClick={() => setRejecting((open) => !open)} aria-expanded={rejecting} disabled={busy}>
            Reject…
          </Button>
        </div>
      </div>
      {problem && <Notice tone="error">{problem}</Notice>}
      {rejecting && <RejectForm what={name} hint={rejectHint} reject={(reason) => decide(false, reason)} />}
    </li>
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
