'use client';
// Named versions of a groom: keep the saved spec under a name, and bring any version back
// (it becomes the saved spec, and one undo takes the editor back to what it was before).
import { useState, type FormEvent } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import { studioApi, type GroomVersion } from '@/lib/studio/client/api';
import { Notice } from '@/components/ui/Notice';
import { ConfirmDialog } from '../ui/ConfirmDialog';

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

export interface VersionsApi {
  groomId: string;
  /** The surface the editor has open: a version made on another one opens there (the page reloads). */
  surfaceId?: string;
  flush(): Promise<boolean>;
  adopt(spec: GroomSpec, revision: number, label: string): void;
}

/** One list object per server copy of the versions, so the panel shown again is not a new server copy. */
const versionLists = new WeakMap<readonly GroomVersion[], { versions: GroomVersion[] }>();
function versionListOf(initial: readonly GroomVersion[]) {
  let list = versionLists.get(initial);
  if (!list) versionLists.set(initial, (list = { versions: [...initial] }));
  return list;
}

export function VersionPanel({ api, initial }: { api: VersionsApi; initial: readonly GroomVersion[] }) {
  const serverCopy = versionListOf(initial);
  const { data, error, mutate } = useServerSeededSWR<{ versions: GroomVersion[] }>(studioApi.versionsUrl(api.groomId), serverCopy);
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [restoring, setRestoring] = useState<GroomVersion | null>(null);
  const versions = [...(data?.versions ?? [])].sort((a, b) => b.number - a.number);

  async function keep(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const trimmed = name.trim();
    if (trimmed.length === 0) return setNameError('Give the version a name, such as “lead review”.');
    if (trimmed.length > 100) return setNameError('Keep the name to 100 characters.');
    setNameError(null);
    setFailure(null);
    setDone(null);
    setBusy(true);
    const saved = await api.flush();
    if (!saved) {
      setBusy(false);
      return setFailure('The latest changes are not saved yet (see the save status above), so there is nothing safe to keep as a version.');
    }
    const outcome = await studioApi.createVersion(api.groomId, trimmed);
    setBusy(false);
    if (!outcome.ok) {
      if (outcome.error.fields?.name) setNameError(outcome.error.fields.name);
      else setFailure(outcome.error.message);
      return;
    }
    setName('');
    setDone(`Kept as version ${outcome.data.version.number}, “${outcome.data.version.name}”.`);
    await mutate();
  }

  async function restore(version: GroomVersion) {
    setBusy(true);
    setFailure(null);
    setDone(null);
    await api.flush();
    const outcome = await studioApi.restoreVersion(api.groomId, version.id);
    setBusy(false);
    setRestoring(null);
    if (!outcome.ok) return setFailure(outcome.error.message);
    if (api.surfaceId && outcome.data.surfaceId !== api.surfaceId) return window.location.reload();
    api.adopt(outcome.data.spec, outcome.data.revision, `Bring back version ${version.number}`);
    setDone(`Version ${version.number}, “${version.name}”, is the groom again (revision ${outcome.data.revision}). Undo takes you back.`);
  }

  return (
    <div className="flex flex-col gap-4">
      <form onSubmit={keep} noValidate className="flex flex-col gap-2 rounded-xl bg-chalk p-3">
        <label htmlFor="version-name" className="text-sm font-semibold text-loam">
          Keep the groom as it is now, under a name
        </label>
        <div className="flex gap-2">
          <input
            id="version-name"
            name="name"
            value={name}
            maxLength={120}
            onChange={(event) => setName(event.target.value)}
            aria-invalid={nameError ? true : undefined}
            aria-describedby={nameError ? 'version-name-error' : undefined}
            placeholder="e.g. lead review"
            className={`min-w-0 flex-1 rounded-xl border-2 bg-white px-3 py-1.5 text-sm text-loam ${nameError ? 'border-hawthorn' : 'border-vellum focus:border-tarn'}`}
          />
          <button type="submit" disabled={busy} className="rounded-full bg-bracken px-4 py-1.5 text-sm font-semibold text-chalk hover:bg-bracken-deep disabled:opacity-50">
            Keep version
          </button>
        </div>
        {nameError && (
          <p id="version-name-error" className="text-xs font-medium text-hawthorn" data-field-error="name">
            {nameError}
          </p>
        )}
      </form>
      {failure && <Notice tone="error">{failure}</Notice>}
      {done && <Notice tone="success">{done}</Notice>}
      {error && <Notice tone="error">The versions could not be loaded: {error.message}</Notice>}
      {versions.length === 0 ? (
        <p className="text-sm text-loam-soft">No versions yet. The groom is saved as you work; a version is a named copy to come back to.</p>
      ) : (
        <ol className="flex flex-col gap-2" aria-label="Versions">
          {versions.map((version) => (
            <li key={version.id} className="flex items-center gap-3 rounded-xl bg-chalk px-3 py-2" data-testid="version-row">
              <span className="flex h-8 w-8 shrink-0 items-center justify-center rounded-full bg-tarn text-xs font-bold text-chalk">{version.number}</span>
              <div className="min-w-0 flex-1">
                <p className="truncate text-sm font-semibold text-loam">{version.name}</p>
                <p className="text-xs text-loam-soft">{dateFormat.format(new Date(version.createdAt))}</p>
              </div>
              <button type="button" onClick={() => setRestoring(version)} disabled={busy} className="rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn" aria-label={`Bring back version ${version.number}, ${version.name}`}>
                Bring back
              </button>
            </li>
          ))}
        </ol>
      )}
      <ConfirmDialog
        open={restoring !== null}
        title={restoring ? `Bring back version ${restoring.number}?` : ''}
        confirmLabel="Bring it back"
        busy={busy}
        onCancel={() => setRestoring(null)}
        onConfirm={() => restoring && restore(restoring)}
      >
        The groom becomes “{restoring?.name}” again and is saved that way. What you have now stays in the undo history of this page, and in any version you kept of it.
      </ConfirmDialog>
    </div>
  );
}
