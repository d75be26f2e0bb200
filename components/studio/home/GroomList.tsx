'use client';
// The groomer's grooms: a picture, the surface it grows on, when it was last changed, its
// revision and latest version — and opening, renaming, duplicating and deleting.
import Link from 'next/link';
import { useState } from 'react';
import { Notice } from '@/components/ui/Notice';
import { renameGroomSchema } from '@/lib/studio/validation';
import { studioApi, type GroomSummary } from '@/lib/studio/client/api';
import { timeAgo } from '@/lib/studio/client/format';
import { ConfirmDialog } from '../ui/ConfirmDialog';
import { NameForm } from './NameForm';

export function GroomList({ grooms, onChanged }: { grooms: GroomSummary[]; onChanged: () => void }) {
  const [renaming, setRenaming] = useState<string | null>(null);
  const [deleting, setDeleting] = useState<GroomSummary | null>(null);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);

  async function duplicate(groom: GroomSummary) {
    setFailure(null);
    setBusy(true);
    const outcome = await studioApi.duplicateGroom(groom.id);
    setBusy(false);
    if (!outcome.ok) return setFailure(`${groom.name} could not be duplicated: ${outcome.error.message}`);
    onChanged();
  }

  async function remove(groom: GroomSummary) {
    setBusy(true);
    const outcome = await studioApi.deleteGroom(groom.id);
    setBusy(false);
    setDeleting(null);
    if (!outcome.ok) return setFailure(`${groom.name} could not be deleted: ${outcome.error.message}`);
    onChanged();
  }

  if (grooms.length === 0) {
    return <p className="rounded-3xl bg-vellum p-5 text-loam-soft">No grooms yet. Upload a growth surface below, then start a groom on it.</p>;
  }
  return (
    <div className="flex flex-col gap-3">
      {failure && <Notice tone="error">{failure}</Notice>}
      <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label="Your grooms">
        {grooms.map((groom) => (
          <li key={groom.id} className="flex flex-col overflow-hidden rounded-3xl bg-vellum" data-testid="groom-card">
            <Link href={`/studio/grooms/${groom.id}`} className="block aspect-[4/3] bg-tarn-deep no-underline" aria-label={`Open ${groom.name}`}>
              {groom.thumbnailUrl ? (
                // eslint-disable-next-line @next/next/no-img-element -- presigned, short-lived links from object storage
                <img src={groom.thumbnailUrl} alt="" className="h-full w-full object-cover" />
              ) : (
                <span className="flex h-full items-center justify-center text-sm text-chalk/70">No picture yet</span>
              )}
            </Link>
            <div className="flex flex-1 flex-col gap-2 p-4">
              {renaming === groom.id ? (
                <NameForm
                  id={`rename-${groom.id}`}
                  label="New name"
                  initial={groom.name}
                  submitLabel="Rename"
                  schema={renameGroomSchema}
                  onCancel={() => setRenaming(null)}
                  onSubmit={async (name) => {
                    const outcome = await studioApi.renameGroom(groom.id, name);
                    if (!outcome.ok) return outcome.error.fields?.name ?? outcome.error.message;
                    setRenaming(null);
                    onChanged();
                    return null;
                  }}
                />
              ) : (
                <h3 className="text-lg font-bold leading-tight">
                  <Link href={`/studio/grooms/${groom.id}`} className="text-loam no-underline hover:underline">
                    {groom.name}
                  </Link>
                </h3>
              )}
              <p className="text-sm text-loam-soft">on {groom.surfaceName}</p>
              <p className="text-xs text-loam-soft">
                Edited <time dateTime={groom.updatedAt}>{timeAgo(groom.updatedAt)}</time> · revision {groom.revision}
                {groom.latestVersion ? ` · version ${groom.latestVersion.number} “${groom.latestVersion.name}”` : ' · no versions yet'}
              </p>
              <div className="mt-auto flex flex-wrap gap-1.5 pt-2">
                <Link href={`/studio/grooms/${groom.id}`} className="rounded-full bg-tarn px-3.5 py-1.5 text-sm font-semibold text-chalk no-underline hover:bg-tarn-deep">
                  Open
                </Link>
                <button type="button" onClick={() => setRenaming(groom.id)} className="rounded-full border-2 border-tarn/25 px-3 py-1 text-sm font-semibold text-tarn hover:border-tarn" aria-label={`Rename ${groom.name}`}>
                  Rename
                </button>
                <button type="button" disabled={busy} onClick={() => duplicate(groom)} className="rounded-full border-2 border-tarn/25 px-3 py-1 text-sm font-semibold text-tarn hover:border-tarn disabled:opacity-50" aria-label={`Duplicate ${groom.name}`}>
                  Duplicate
                </button>
                <button type="button" onClick={() => setDeleting(groom)} className="rounded-full px-3 py-1 text-sm font-semibold text-hawthorn hover:bg-hawthorn-pale" aria-label={`Delete ${groom.name}`}>
                  Delete
                </button>
              </div>
            </div>
          </li>
        ))}
      </ul>
      <ConfirmDialog
        open={deleting !== null}
        danger
        title={`Delete ${deleting?.name ?? 'this groom'}?`}
        confirmLabel="Delete the groom"
        busy={busy}
        onCancel={() => setDeleting(null)}
        onConfirm={() => deleting && remove(deleting)}
      >
        Its spec, its {deleting?.versionCount ?? 0} version{deleting?.versionCount === 1 ? '' : 's'} and its exports go with it. The growth surface stays.
      </ConfirmDialog>
    </div>
  );
}
