'use client';
// Moving the groom onto another surface: a new version of the character uploaded here, or another
// surface of the groomer's. The transfer report comes first — where every feature lands, how far
// it moved, what stays behind and why, the new index budget — and only "Move the groom" changes
// anything (the groom as it was stays in its versions, on its old surface). The same report can
// start a new groom there instead. For a character turned in its file, landmark pairs are clicked
// on the two surfaces side by side (or typed).
import { useState } from 'react';
import useSWR from 'swr';
import { fetchData, request } from '@/lib/http/client';
import type { GroomDetail, SurfaceMovePreview, SurfaceSummary } from '@/lib/studio/types';
import { Notice } from '@/components/ui/Notice';
import { landmarkLine, readMoveInputs } from '@/lib/studio/client/move-input';
import type { Vec3 } from '@/lib/studio/client/features';
import type { OpenedSurface } from '@/lib/studio/client/protocol';
import { LandmarkPicker } from './LandmarkPicker';
import { SurfaceUpload } from '../home/SurfaceUpload';
import { TransferReportView } from '../ui/TransferReportView';

export function SurfaceMovePanel({ groomId, surfaceId, maxUploadBytes, flush, groomSurface, upAxis }: { groomId: string; surfaceId: string; maxUploadBytes: number; flush: () => Promise<boolean>; groomSurface: OpenedSurface | null; upAxis: 'y' | 'z' }) {
  const { data, mutate } = useSWR<{ surfaces: SurfaceSummary[] }>('/api/studio/surfaces', fetchData, { refreshInterval: (d) => (d?.surfaces.some((s) => s.state === 'checking') ? 1500 : 0) });
  const [target, setTarget] = useState('');
  const [regions, setRegions] = useState('');
  const [landmarks, setLandmarks] = useState('');
  const [preview, setPreview] = useState<SurfaceMovePreview | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const others = (data?.surfaces ?? []).filter((s) => s.id !== surfaceId);
  const ready = others.filter((s) => s.state === 'ready');
  const chosen = ready.find((s) => s.id === target);
  // The pairs already written, drawn on both views; a box that does not read yet draws none.
  const written = readMoveInputs('', landmarks);
  const pairs = 'problem' in written ? [] : (written.landmarks ?? []);
  const addPair = (from: Vec3, to: Vec3) => {
    setLandmarks((text) => `${text.trimEnd()}${text.trim() ? '\n' : ''}${landmarkLine(from, to)}\n`);
    setPreview(null);
  };

  const input = () => {
    const read = readMoveInputs(regions, landmarks);
    if ('problem' in read) {
      setFailure(read.problem);
      return null;
    }
    return { surfaceId: target, ...read };
  };

  async function show() {
    const body = input();
    if (!body) return;
    setBusy(true);
    setFailure(null);
    setPreview(null);
    await flush();
    const outcome = await request<{ preview: SurfaceMovePreview }>('POST', `/api/studio/grooms/${encodeURIComponent(groomId)}/surface/preview`, body);
    setBusy(false);
    if (!outcome.ok) return setFailure(outcome.error.message);
    setPreview(outcome.data.preview);
  }

  async function move() {
    const body = input();
    if (!body || !preview) return;
    setBusy(true);
    const outcome = await request<{ groom: GroomDetail }>('PUT', `/api/studio/grooms/${encodeURIComponent(groomId)}/surface`, { ...body, baseRevision: preview.revision, moveId: preview.moveId });
    if (!outcome.ok) {
      setBusy(false);
      return setFailure(outcome.error.message);
    }
    // The editor opens the groom on its new surface.
    window.location.reload();
  }

  async function startThere() {
    const body = input();
    if (!body || !preview) return;
    setBusy(true);
    const outcome = await request<{ groom: GroomDetail }>('POST', `/api/studio/grooms/${encodeURIComponent(groomId)}/duplicate`, { ...body, moveId: preview.moveId });
    if (!outcome.ok) {
      setBusy(false);
      return setFailure(outcome.error.message);
    }
    window.location.assign(`/studio/grooms/${encodeURIComponent(outcome.data.groom.id)}`);
  }

  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm text-loam">
        Move this groom onto a new version of its character, or onto another of your surfaces. You see where every feature lands before anything changes;
        the groom as it is now stays in its versions, on this surface.
      </p>
      <details className="rounded-xl bg-chalk p-3">
        <summary className="cursor-pointer text-sm font-semibold text-loam">Upload a new version of the character</summary>
        <SurfaceUpload maxBytes={maxUploadBytes} onUploaded={(s) => { void mutate(); setTarget(s.id); }} />
      </details>
      <div className="flex flex-col gap-2 rounded-xl bg-chalk p-3">
        <label htmlFor="move-target" className="text-sm font-semibold text-loam">Move onto</label>
        <select id="move-target" value={target} onChange={(e) => { setTarget(e.target.value); setPreview(null); }} className="rounded-lg border border-tarn/30 px-2 py-1.5 text-sm">
          <option value="">Choose a surface…</option>
          {others.map((s) => (
            <option key={s.id} value={s.id} disabled={s.state !== 'ready'}>
              {s.name}{s.state === 'checking' ? ' (being checked)' : s.state === 'refused' ? ' (refused)' : ''}
            </option>
          ))}
        </select>
        {ready.length === 0 && <p className="text-xs text-loam">None of your other surfaces is ready yet.</p>}
        <label htmlFor="move-regions" className="text-sm font-semibold text-loam">Renamed regions (old=new, one a line)</label>
        <textarea id="move-regions" value={regions} onChange={(e) => setRegions(e.target.value)} rows={2} className="rounded-lg border border-tarn/30 px-2 py-1 font-mono text-xs" />
        <label htmlFor="move-landmarks" className="text-sm font-semibold text-loam">Landmarks, for a character turned in its file (old x y z = new x y z, three or more)</label>
        {chosen && groomSurface && (
          <details className="rounded-lg border border-tarn/20 p-2">
            <summary className="cursor-pointer text-sm font-semibold text-loam">Match places by hand on the two surfaces</summary>
            <LandmarkPicker groomSurface={groomSurface} upAxis={upAxis} targetId={chosen.id} targetName={chosen.name} pairs={pairs} onPair={addPair} />
          </details>
        )}
        <textarea id="move-landmarks" value={landmarks} onChange={(e) => setLandmarks(e.target.value)} rows={3} className="rounded-lg border border-tarn/30 px-2 py-1 font-mono text-xs" />
        <button type="button" disabled={!target || busy} onClick={show} className="rounded-xl bg-tarn px-3 py-1.5 text-sm font-semibold text-chalk disabled:opacity-50">
          {busy && !preview ? 'Carrying the features over…' : 'Show the transfer report'}
        </button>
      </div>
      {failure && <Notice tone="error">{failure}</Notice>}
      {preview && (
        <div className="flex flex-col gap-3 rounded-xl bg-chalk p-3">
          <p className="text-sm font-semibold text-loam">From {preview.from.name} to {preview.to.name}</p>
          <TransferReportView report={preview.report} />
          <div className="flex flex-wrap gap-2">
            <button type="button" disabled={busy} onClick={move} className="rounded-xl bg-tarn px-3 py-1.5 text-sm font-semibold text-chalk disabled:opacity-50">Move the groom</button>
            <button type="button" disabled={busy} onClick={startThere} className="rounded-xl border border-tarn px-3 py-1.5 text-sm font-semibold text-tarn disabled:opacity-50">Start a new groom there instead</button>
            <button type="button" disabled={busy} onClick={() => setPreview(null)} className="rounded-xl px-3 py-1.5 text-sm font-semibold text-tarn">Cancel</button>
          </div>
        </div>
      )}
    </div>
  );
}
