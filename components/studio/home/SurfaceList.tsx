'use client';
// The groomer's growth surfaces with the facts that matter for grooming (faces, pieces, genus,
// border loops, Euler characteristic — what the index budget will ask), starting a groom on one,
// and deleting one no groom uses. A surface still being checked shows the check's stage and
// progress; a refused one its reason, until it is deleted.
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Notice } from '@/components/ui/Notice';
import { createGroomSchema } from '@/lib/studio/validation';
import { formatIndex } from '@/lib/studio/client/features';
import { studioApi, type SurfaceSummary } from '@/lib/studio/client/api';
import { plural, timeAgo } from '@/lib/studio/client/format';
import { ConfirmDialog } from '../ui/ConfirmDialog';
import { ProgressBar } from '../ui/ProgressBar';
import { NameForm } from './NameForm';

const nameSchema = createGroomSchema.pick({ name: true });

export function SurfaceList({ surfaces, onChanged }: { surfaces: SurfaceSummary[]; onChanged: () => void }) {
  const router = useRouter();
  const [starting, setStarting] = useState<string | null>(null);
  const [deleting, setDeleting] = useState<SurfaceSummary | null>(null);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);

  async function remove(surface: SurfaceSummary) {
    setBusy(true);
    const outcome = await studioApi.deleteSurface(surface.id);
    setBusy(false);
    setDeleting(null);
    if (!outcome.ok) {
      return setFailure(outcome.error.code === 'surface-in-use' ? `${surface.name} is still used by grooms; delete them first. (${outcome.error.message})` : outcome.error.message);
    }
    onChanged();
  }

  if (surfaces.length === 0) return <p className="rounded-3xl bg-vellum p-5 text-loam-soft">No growth surfaces yet.</p>;
  return (
    <div className="flex flex-col gap-3">
      {failure && <Notice tone="error">{failure}</Notice>}
      <ul className="flex flex-col gap-3" aria-label="Your growth surfaces">
        {surfaces.map((surface) => (
          <li key={surface.id} className="flex flex-wrap gap-4 rounded-3xl bg-vellum p-4" data-testid="surface-card">
            <div className="h-24 w-24 shrink-0 overflow-hidden rounded-2xl bg-tarn-deep">
              {surface.thumbnailUrl && (
                // eslint-disable-next-line @next/next/no-img-element -- presigned, short-lived links from object storage
                <img src={surface.thumbnailUrl} alt="" className="h-full w-full object-cover" />
              )}
            </div>
            <div className="flex min-w-0 flex-1 flex-col gap-1">
              <h3 className="text-lg font-bold leading-tight">{surface.name}</h3>
              <p className="text-sm text-loam-soft">
                {surface.fileName} · {surface.units} · uploaded {timeAgo(surface.createdAt)}
              </p>
              {surface.state === 'checking' && (
                <div data-testid="surface-checking">
                  <ProgressBar label={`Being checked: ${surface.check.stage}`} fraction={surface.check.progress > 0 ? surface.check.progress : null} />
                </div>
              )}
              {surface.state === 'refused' && (
                <p className="text-sm font-medium text-hawthorn" data-testid="surface-refused">
                  Refused: {surface.problems.filter((problem) => problem.severity === 'error').map((problem) => problem.message).join(' ')}
                </p>
              )}
              {surface.state === 'ready' && (
                <>
                  <p className="text-sm text-loam">
                    {plural(surface.faceCount, 'face')} · {plural(surface.componentCount, 'piece')} · genus {surface.genus} · {plural(surface.boundaryLoopCount, 'border loop')} · χ = {surface.eulerCharacteristic}
                    {surface.boundaryLoopCount === 0 ? ` (indices must sum to ${formatIndex(surface.eulerCharacteristic)})` : ''} · {surface.areaCm2.toLocaleString('en-GB', { maximumFractionDigits: 0 })} cm²
                  </p>
                  {surface.groups.length > 0 && <p className="text-xs text-loam-soft">Groups: {surface.groups.join(', ')}</p>}
                  {surface.uvs && (
                    <p className="text-xs text-loam-soft" data-testid="surface-uvs">
                      {!surface.uvs.present
                        ? 'No UVs: guides are bound by polygon only.'
                        : surface.uvs.overlapFraction > 0
                          ? `UVs overlap on ${(100 * surface.uvs.overlapFraction).toFixed(1)} % of the map: a UV names more than one place there.`
                          : 'UVs without overlaps: every guide’s root UV names one place.'}
                    </p>
                  )}
                  {surface.warnings.length > 0 && (
                    <details className="text-xs text-loam-soft">
                      <summary className="cursor-pointer font-semibold text-bracken-deep">{plural(surface.warnings.length, 'thing', 'things')} worth knowing</summary>
                      <ul className="list-disc pl-5">
                        {surface.warnings.map((w, i) => (
                          <li key={i}>{w.message}</li>
                        ))}
                      </ul>
                    </details>
                  )}
                </>
              )}
              {starting === surface.id ? (
                <div className="pt-2">
                  <NameForm
                    id={`groom-on-${surface.id}`}
                    label={`Name of the new groom on ${surface.name}`}
                    submitLabel="Start grooming"
                    schema={nameSchema}
                    onCancel={() => setStarting(null)}
                    onSubmit={async (name) => {
                      const outcome = await studioApi.createGroom({ surfaceId: surface.id, name });
                      if (!outcome.ok) return outcome.error.fields?.name ?? outcome.error.message;
                      router.push(`/studio/grooms/${outcome.data.groom.id}`);
                      return null;
                    }}
                  />
                </div>
              ) : (
                <div className="flex flex-wrap gap-1.5 pt-2">
                  {surface.state === 'ready' && (
                  <button type="button" onClick={() => setStarting(surface.id)} className="rounded-full bg-tarn px-3.5 py-1.5 text-sm font-semibold text-chalk hover:bg-tarn-deep" aria-label={`Start a groom on ${surface.name}`}>
                    Start a groom
                  </button>
                  )}
                  <button type="button" onClick={() => setDeleting(surface)} className="rounded-full px-3 py-1 text-sm font-semibold text-hawthorn hover:bg-hawthorn-pale" aria-label={`Delete ${surface.name}`}>
                    Delete
                  </button>
                </div>
              )}
            </div>
          </li>
        ))}
      </ul>
      <ConfirmDialog open={deleting !== null} danger title={`Delete ${deleting?.name ?? 'this surface'}?`} confirmLabel="Delete the surface" busy={busy} onCancel={() => setDeleting(null)} onConfirm={() => deleting && remove(deleting)}>
        The uploaded file goes too. A surface that grooms still grow on cannot be deleted.
      </ConfirmDialog>
    </div>
  );
}
