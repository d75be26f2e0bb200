'use client';
// Where the groom stands with the server: saved (and which revision), waiting, saving, not saved
// (with the reason and a way to try again), or saved elsewhere meanwhile (with the choice).
import type { SaveStatus } from '@/lib/studio/client/autosave';

export function SaveStatusLine({ status, practice, onRetry, onKeepMine }: { status: SaveStatus | null; practice: boolean; onRetry: () => void; onKeepMine: () => void }) {
  if (practice) {
    return (
      <p className="rounded-full bg-pollen/40 px-3 py-1 text-sm font-semibold text-tarn-deep" data-testid="save-status">
        Practice groom — nothing is saved
      </p>
    );
  }
  if (!status) return null;
  switch (status.state) {
    case 'saved':
      return (
        <p className="text-sm text-loam-soft" role="status" data-testid="save-status" data-state="saved">
          <span aria-hidden="true" className="mr-1.5 inline-block h-2 w-2 rounded-full bg-lichen" />
          All changes saved · revision {status.revision}
        </p>
      );
    case 'waiting':
    case 'saving':
      return (
        <p className="text-sm text-loam-soft" role="status" data-testid="save-status" data-state={status.state}>
          <span aria-hidden="true" className="mr-1.5 inline-block h-2 w-2 animate-pulse rounded-full bg-pollen" />
          {status.state === 'saving' ? 'Saving…' : 'Changes waiting to be saved'}
        </p>
      );
    case 'failed':
      return (
        <div role="alert" className="flex max-w-md flex-col gap-1 rounded-xl border-l-4 border-hawthorn bg-hawthorn-pale px-3 py-2 text-sm text-hawthorn" data-testid="save-status" data-state="failed">
          <span>{status.message}</span>
          {status.fields && (
            <ul className="list-disc pl-5 text-xs">
              {Object.entries(status.fields).map(([path, message]) => (
                <li key={path}>
                  {path}: {message}
                </li>
              ))}
            </ul>
          )}
          <button type="button" onClick={onRetry} className="self-start font-semibold underline">
            Try saving again
          </button>
        </div>
      );
    case 'conflict':
      return (
        <div role="alert" className="flex max-w-md flex-col gap-1.5 rounded-xl border-l-4 border-pollen bg-chalk px-3 py-2 text-sm text-loam" data-testid="save-status" data-state="conflict">
          <span>{status.message}</span>
          <div className="flex flex-wrap gap-3">
            <button type="button" onClick={onKeepMine} disabled={status.serverRevision === null} className="font-semibold text-tarn underline disabled:opacity-40">
              Save mine over it
            </button>
            <button type="button" onClick={() => window.location.reload()} className="font-semibold text-tarn underline">
              Load the saved one (drops my changes)
            </button>
          </div>
        </div>
      );
  }
}
