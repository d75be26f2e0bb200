'use client';
import useSWR from 'swr';
import { Notice } from '@/components/ui/Notice';
import { fetchData, type ApiRequestError } from '@/lib/http/client';
import type { CaughtMailResponse } from '@/lib/platform/types';
import { formatDateTime } from '@/components/market/format';
import { mailParts } from './mail-links';

export function CaughtMailList() {
  const { data, error, isLoading } = useSWR<CaughtMailResponse, ApiRequestError>('/api/admin/mail', fetchData, {
    refreshInterval: 5_000,
  });

  if (error) return <Notice tone="error">{error.message}</Notice>;
  if (isLoading || !data) return <p className="text-loam-soft">Loading the mail…</p>;
  if (!data.configured) {
    return <Notice tone="info">No mail sink is configured here (MAIL_SINK_URL is empty): mail goes to the SMTP service directly.</Notice>;
  }
  if (data.messages.length === 0) return <Notice tone="info">No mail has arrived since the mail sink started.</Notice>;
  return (
    <ul className="flex flex-col gap-4" aria-label="Sent mail">
      {data.messages.map((mail) => (
        <li key={mail.id} className="rounded-3xl bg-vellum p-5" data-testid="caught-mail">
          <div className="flex flex-wrap items-baseline justify-between gap-2">
            <h2 className="text-lg font-bold">{mail.subject || '(no subject)'}</h2>
            <time dateTime={mail.receivedAt} className="text-sm text-loam-soft">
              {formatDateTime(mail.receivedAt)}
            </time>
          </div>
          <p className="pb-3 text-sm text-loam-soft">
            to {mail.to.join(', ')} · from {mail.from}
          </p>
          <pre className="overflow-x-auto rounded-2xl bg-chalk p-4 font-sans text-sm whitespace-pre-wrap">
            {mailParts(mail.text).map((part, index) =>
              part.kind === 'link' ? (
                <a key={index} href={part.href} className="font-semibold text-tarn break-all">
                  {part.href}
                </a>
              ) : (
                part.text
              ),
            )}
          </pre>
        </li>
      ))}
    </ul>
  );
}
