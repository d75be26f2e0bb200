'use client';
// Exports of the saved groom, made on the server by the same groom library: one button per
// format, the job's progress while it runs, and the download when it is ready. Guides always say
// where they grow; the box adds the growth surface itself, so a pipeline can bind them from the
// file alone.
import { useEffect, useRef, useState } from 'react';
import { Notice } from '@/components/ui/Notice';
import { studioApi, type ExportFormat, type ExportJob } from '@/lib/studio/client/api';
import { ProgressBar } from '../ui/ProgressBar';
import { EXPORT_FORMATS as EXPORT_FORMATS_OF_GROOM, EXPORT_FORMAT_FACTS } from '@/lib/groom/export/formats';

export const EXPORT_FORMATS: readonly { format: ExportFormat; label: string; note: string }[] = [
  { format: 'usda', label: 'USD curves', note: '.usda, BasisCurves, linear' },
  { format: 'usda-bspline', label: 'USD curves, smooth', note: '.usda, BasisCurves, B-spline' },
  { format: 'gltf', label: 'glTF lines', note: '.gltf, one file' },
  { format: 'glb', label: 'glTF lines, binary', note: '.glb' },
  { format: 'obj', label: 'OBJ polylines', note: '.obj' },
  { format: 'json', label: 'Groom spec', note: '.json, every decision of the groom' },
  { format: 'ply', label: 'Field', note: '.ply, the direction per face and vertex' },
];

/** The formats that carry guides, and so can carry the surface beside them. */
const SURFACE_FORMATS: ReadonlySet<ExportFormat> = new Set(EXPORT_FORMATS_OF_GROOM.filter((format) => EXPORT_FORMAT_FACTS[format].source === 'guides'));

const POLL_MS = 700;

export function ExportPanel({ groomId, flush }: { groomId: string; flush: () => Promise<boolean> }) {
  const [jobs, setJobs] = useState<ExportJob[]>([]);
  const [failure, setFailure] = useState<string | null>(null);
  const [starting, setStarting] = useState<ExportFormat | null>(null);
  const [withSurface, setWithSurface] = useState(false);
  const timers = useRef(new Map<string, ReturnType<typeof setTimeout>>());
  const downloaded = useRef(new Set<string>());

  useEffect(() => {
    const pending = timers.current;
    return () => pending.forEach((timer) => clearTimeout(timer));
  }, []);

  function replace(job: ExportJob) {
    setJobs((all) => [job, ...all.filter((other) => other.id !== job.id)]);
  }

  /** The list sits under the format buttons, below the fold of the panel: its entry is brought into view when it changes. */
  function bringIntoView(id: string) {
    requestAnimationFrame(() => document.getElementById(`export-${id}`)?.scrollIntoView({ block: 'nearest', behavior: 'smooth' }));
  }

  function poll(id: string) {
    timers.current.set(
      id,
      setTimeout(async () => {
        const outcome = await studioApi.getExport(id);
        if (!outcome.ok) {
          setFailure(`Could not follow the export: ${outcome.error.message}`);
          return;
        }
        const job = outcome.data.export;
        replace(job);
        if (job.status === 'done' && job.downloadUrl && !downloaded.current.has(job.id)) {
          downloaded.current.add(job.id);
          startDownload(job.downloadUrl, job.fileName);
          bringIntoView(job.id);
        } else if (job.status === 'queued' || job.status === 'running') {
          poll(id);
        }
      }, POLL_MS),
    );
  }

  async function start(format: ExportFormat) {
    setFailure(null);
    setStarting(format);
    const saved = await flush();
    if (!saved) {
      setStarting(null);
      return setFailure('Exports are made from the saved groom, and the latest changes are not saved yet — see the save status above.');
    }
    const outcome = await studioApi.startExport(groomId, format, { withSurface: withSurface && SURFACE_FORMATS.has(format) });
    setStarting(null);
    if (!outcome.ok) return setFailure(outcome.error.message);
    replace(outcome.data.export);
    bringIntoView(outcome.data.export.id);
    poll(outcome.data.export.id);
  }

  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm text-loam-soft">Made on the server from the saved groom; the download starts when the file is ready.</p>
      <label className="flex items-start gap-2 text-sm text-loam">
        <input type="checkbox" checked={withSurface} onChange={(event) => setWithSurface(event.target.checked)} className="mt-0.5" data-testid="export-with-surface" />
        <span>
          Include the growth surface
          <span className="block text-xs text-loam-soft">USD, glTF and OBJ: the skin in its own numbering beside the guides, so each root can be rebuilt from the file.</span>
        </span>
      </label>
      <ul className="grid grid-cols-1 gap-2 sm:grid-cols-2 lg:grid-cols-1 xl:grid-cols-2">
        {EXPORT_FORMATS.map(({ format, label, note }) => (
          <li key={format}>
            <button
              type="button"
              onClick={() => start(format)}
              disabled={starting !== null}
              className="flex w-full flex-col rounded-xl border-2 border-tarn/20 bg-chalk px-3 py-2 text-left hover:border-tarn disabled:opacity-60"
              aria-label={`Export ${label} (${note})`}
            >
              <span className="text-sm font-bold text-loam">{label}</span>
              <span className="text-xs text-loam-soft">{note}</span>
            </button>
          </li>
        ))}
      </ul>
      {failure && <Notice tone="error">{failure}</Notice>}
      {jobs.length > 0 && (
        <ol className="flex flex-col gap-2" aria-label="Exports">
          {jobs.map((job) => (
            <li key={job.id} id={`export-${job.id}`} className="flex flex-col gap-1.5 rounded-xl bg-chalk p-3" data-testid="export-job" data-format={job.format} data-status={job.status}>
              <span className="text-sm font-semibold text-loam">
                {EXPORT_FORMATS.find((f) => f.format === job.format)?.label ?? job.format}
                {job.withSurface && <span className="font-normal text-loam-soft"> · with the surface</span>}
              </span>
              {job.status === 'queued' && <ProgressBar label="Waiting for a worker" fraction={0} />}
              {job.status === 'running' && <ProgressBar label={job.stage ? job.stage.charAt(0).toUpperCase() + job.stage.slice(1) : 'Working'} fraction={job.progress} />}
              {job.status === 'done' && job.downloadUrl && (
                <a href={job.downloadUrl} download={job.fileName ?? true} className="text-sm font-semibold text-tarn underline" data-testid="export-download">
                  Download {job.fileName ?? 'the file'}
                </a>
              )}
              {job.status === 'failed' && <p className="text-sm text-hawthorn">The export failed: {job.error ?? 'no reason was given.'}</p>}
            </li>
          ))}
        </ol>
      )}
    </div>
  );
}

function startDownload(url: string, fileName: string | null) {
  const link = document.createElement('a');
  link.href = url;
  if (fileName) link.download = fileName;
  link.rel = 'noopener';
  document.body.append(link);
  link.click();
  link.remove();
}
