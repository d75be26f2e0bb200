'use client';
// Updates of listings on the market, waiting for an admin: the new version's picture, what
// changed and the seller's rights confirmation; approve it (owners get it free, with a notice and
// an e-mail) or send it back with a reason. The version on sale stays on sale meanwhile.
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { AdminListingVersionsResponse, ListingVersionResponse, ListingVersionSummary } from '@/lib/market/types';
import { formatDateTime } from '@/components/market/format';
import { QueueFrame, RejectForm } from './DecisionParts';

const QUEUE = '/api/admin/listing-versions';

export function VersionQueue({ initial }: { initial: AdminListingVersionsResponse }) {
  const { data, error, mutate } = useServerSeededSWR<AdminListingVersionsResponse>(QUEUE, initial, { refreshInterval: 10_000 });
  const [done, setDone] = useState<string | null>(null);
  const versions = data?.versions ?? [];
  return (
    <QueueFrame done={done} error={error} empty={versions.length === 0 ? 'No new version is waiting for review.' : null}>
      {versions.map((version) => (
        <VersionItem
          key={version.id}
          version={version}
          onDecided={async (text) => {
            setDone(text);
            await mutate();
          }}
        />
      ))}
    </QueueFrame>
  );
}

function VersionItem({ version, onDecided }: { version: ListingVersionSummary; onDecided: (message: string) => Promise<void> }) {
  const [rejecting, setRejecting] = useState(false);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const name = `version ${version.number} of “${version.listingTitle}”`;

  async function decide(approve: boolean, reason?: string) {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<ListingVersionResponse>(`/api/admin/listing-versions/${version.id}/decision`, { approve, reason });
    setBusy(false);
    if (!outcome.ok) return outcome.error;
    await onDecided(approve ? `${name} is on the market; its owners and the seller have been told.` : `${name} went back to its seller with your reason.`);
  }

  return (
    <li className="flex flex-col gap-3 rounded-3xl bg-white p-5 ring-2 ring-vellum" data-testid="version-queue-item" data-version-id={version.id}>
      <div className="flex flex-wrap items-start gap-4">
        <div className="h-20 w-20 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
          {version.pictureUrl && (
            // eslint-disable-next-line @next/next/no-img-element -- a short-lived object-storage URL
            <img src={version.pictureUrl} alt="" className="h-full w-full object-cover" />
          )}
        </div>
        <div className="flex flex-1 flex-col gap-1">
          <Link href={`/market/${version.listingId}`} className="text-lg font-bold text-loam">
            {version.listingTitle}: version {version.number}
          </Link>
          <p className="text-sm text-loam-soft">
            {version.seller.displayName} ({version.seller.email}) · {version.groom.name}, saved version {version.groom.versionNumber ?? '—'}
            {version.submittedAt && ` · submitted ${formatDateTime(version.submittedAt)}`}
          </p>
          {version.notes && <p className="text-sm">What changed: {version.notes}</p>}
          <p className="text-sm">
            {version.rights ? `Rights confirmed ${formatDateTime(version.rights.confirmedAt)} (${version.rights.wordingVersion}).` : 'No rights confirmation.'}{' '}
            {version.shipsSurface ? 'The package ships the growth surface.' : 'The package does not ship the growth surface.'}
          </p>
          <p className="text-sm">
            {version.assets.status === 'ready'
              ? 'Pictures, preview and package are ready.'
              : version.assets.status === 'pending'
                ? 'Pictures, preview and package are still being made.'
                : `Pictures and package failed: ${version.assets.error}`}
          </p>
        </div>
        <div className="flex gap-2">
          <Button
            onClick={async () => {
              const failure = await decide(true);
              if (failure) setProblem(failure.message);
            }}
            disabled={busy || version.assets.status !== 'ready'}
          >
            Approve version {version.number}
          </Button>
          <Button look="quiet" onClick={() => setRejecting((open) => !open)} aria-expanded={rejecting} disabled={busy}>
            Reject…
          </Button>
        </div>
      </div>
      {problem && <Notice tone="error">{problem}</Notice>}
      {rejecting && <RejectForm what={name} hint="The seller reads this in an e-mail." reject={(reason) => decide(false, reason)} />}
    </li>
  );
}
