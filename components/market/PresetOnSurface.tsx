'use client';
// A preset carried onto one of the buyer's own growth surfaces: pick one (or upload one, with the
// studio's own upload and check), then the job's stage while it works, then the transfer report.
// For a purchase ("Fit to my character") accepting the report opens the new groom in the studio;
// for a trial ("Try it on") the report comes with pictures and a reduced 3D preview.
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR from 'swr';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { SurfaceUpload } from '@/components/studio/home/SurfaceUpload';
import { TransferReportView } from '@/components/studio/ui/TransferReportView';
import { fetchData, postJson, type ApiRequestError } from '@/lib/http/client';
import type { FitAcceptedResponse, PresetTransferResponse, PresetTransferView } from '@/lib/market/types';
import type { SurfaceSummary } from '@/lib/studio/types';
import { GuidePreview } from './GuidePreview';

/** How often the job's row is read while it works. */
const POLL_MS = 1_000;

type Props = {
  kind: 'fit' | 'trial';
  /** Where the transfer starts: /api/library/[purchaseId]/fits or /api/market/listings/[id]/trials. */
  startUrl: string;
  title: string;
  maxUploadBytes: number;
};

const readUrl = (transfer: { kind: 'fit' | 'trial'; id: string }) => (transfer.kind === 'fit' ? `/api/library/fits/${transfer.id}` : `/api/market/trials/${transfer.id}`);
const working = (transfer: PresetTransferView | undefined) => transfer?.status === 'queued' || transfer?.status === 'running';

export function PresetOnSurface({ kind, startUrl, title, maxUploadBytes }: Props) {
  const surfaces = useSWR<{ surfaces: SurfaceSummary[] }, ApiRequestError>('/api/studio/surfaces', fetchData, {
    refreshInterval: (data) => (data?.surfaces.some((surface) => surface.state === 'checking') ? 1_500 : 0),
  });
  const [target, setTarget] = useState('');
  const [started, setStarted] = useState<PresetTransferView | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const read = useSWR<PresetTransferResponse, ApiRequestError>(started ? readUrl(started) : null, fetchData, {
    refreshInterval: (data) => (working(data?.transfer ?? started ?? undefined) ? POLL_MS : 0),
  });
  const transfer = read.data?.transfer ?? started;
  const mine = surfaces.data?.surfaces ?? [];
  const action = kind === 'fit' ? 'Fit it to this surface' : 'Try it on this surface';

  async function start() {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<PresetTransferResponse>(startUrl, { surfaceId: target });
    setBusy(false);
    if (!outcome.ok) return setProblem(outcome.error.message);
    setStarted(outcome.data.transfer);
  }

  return (
    <div className="flex flex-col gap-4" data-testid={kind === 'fit' ? 'fit-panel' : 'trial-panel'}>
      {surfaces.error && <Notice tone="error">{surfaces.error.message}</Notice>}
      <div className="flex flex-col gap-2">
        <label htmlFor={`${kind}-surface`} className="text-sm font-semibold">
          Your surface
        </label>
        <select
          id={`${kind}-surface`}
          value={target}
          onChange={(event) => {
            setTarget(event.target.value);
            setStarted(null);
          }}
          className="rounded-lg border border-tarn/30 px-2 py-2 text-sm"
        >
          <option value="">{surfaces.data && mine.length === 0 ? 'No surfaces yet: upload one below' : 'Choose one of your surfaces…'}</option>
          {mine.map((surface) => (
            <option key={surface.id} value={surface.id} disabled={surface.state !== 'ready'}>
              {surface.name}
              {surface.state === 'checking' ? ' (being checked)' : surface.state === 'refused' ? ' (refused by its check)' : ''}
            </option>
          ))}
        </select>
      </div>
      <details className="rounded-2xl bg-chalk p-3">
        <summary className="cursor-pointer text-sm font-semibold">Upload a surface of your own character</summary>
        <SurfaceUpload
          maxBytes={maxUploadBytes}
          onUploaded={(surface) => {
            void surfaces.mutate();
            if (surface.state === 'ready') setTarget(surface.id);
          }}
        />
      </details>
      <Button onClick={start} disabled={!target || busy || working(transfer ?? undefined)}>
        {busy ? 'Starting…' : action}
      </Button>
      {problem && <Notice tone="error">{problem}</Notice>}
      {transfer && <TransferOutcome transfer={transfer} title={title} />}
    </div>
  );
}

function TransferOutcome({ transfer, title }: { transfer: PresetTransferView; title: string }) {
  if (working(transfer)) {
    return (
      <p role="status" className="flex items-center gap-3 text-sm" data-testid="transfer-stage">
        <span className="inline-block h-3 w-3 animate-ping rounded-full bg-bracken" aria-hidden="true" />
        {transfer.stage}…
      </p>
    );
  }
  if (transfer.status === 'failed') return <Notice tone="error">{transfer.error ?? 'The preset could not be carried onto that surface.'}</Notice>;
  return (
    <div className="flex flex-col gap-4 rounded-2xl bg-chalk p-4">
      <p className="text-sm font-semibold">
        {title} on {transfer.surface.name}
      </p>
      {transfer.report && <TransferReportView report={transfer.report} />}
      {transfer.trial && <TrialLook transfer={transfer} title={title} />}
      {transfer.kind === 'fit' && <AcceptFit transfer={transfer} />}
    </div>
  );
}

function TrialLook({ transfer, title }: { transfer: PresetTransferView; title: string }) {
  const trial = transfer.trial!;
  return (
    <div className="flex flex-col gap-3" data-testid="trial-look">
      <div className="grid grid-cols-3 gap-2">
        {trial.pictures.map((picture) => (
          // eslint-disable-next-line @next/next/no-img-element -- a short-lived object-storage URL
          <img key={picture.view} src={picture.url} alt={`${title} on ${transfer.surface.name}, ${picture.view}`} className="w-full rounded-xl" />
        ))}
      </div>
      <GuidePreview url={trial.previewUrl} title={`${title} on ${transfer.surface.name}`} />
      <p className="text-xs text-loam-soft" data-testid="trial-share">
        A look, not the preset: {trial.guideCount.toLocaleString('en-GB')} guides
        {trial.listingGuideCount ? ` of the ${trial.listingGuideCount.toLocaleString('en-GB')} you would get` : ''}, {trial.pointsPerGuide} points each, without
        widths or binding. Buy it to fit the whole preset to your character.
      </p>
    </div>
  );
}

function AcceptFit({ transfer }: { transfer: PresetTransferView }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function accept() {
    setBusy(true);
    setProblem(null);
    const outcome = await postJson<FitAcceptedResponse>(`/api/library/fits/${transfer.id}/accept`, {});
    if (!outcome.ok) {
      setBusy(false);
      return setProblem(outcome.error.message);
    }
    router.push(`/studio/grooms/${outcome.data.groom.id}`);
  }
  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm text-loam-soft">
        Accepting makes a groom of yours in the studio with this spec: grow its guides, change it, keep versions and export it. It is yours to use under the
        licence you bought, not to sell.
      </p>
      <Button onClick={accept} disabled={busy}>
        {busy ? 'Opening…' : transfer.groomId ? 'Open it in the studio again' : 'Accept and open it in the studio'}
      </Button>
      {problem && <Notice tone="error">{problem}</Notice>}
    </div>
  );
}
