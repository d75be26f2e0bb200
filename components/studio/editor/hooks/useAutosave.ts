'use client';
// Autosave of a persisted groom: every settled spec (not the steps of a drag) goes to the
// Autosaver, which saves it on the server; the page warns before closing with unsaved changes.
import { useEffect, useMemo, useRef, useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { studioApi, type GroomVersion } from '@/lib/studio/client/api';
import { Autosaver, type SaveStatus } from '@/lib/studio/client/autosave';

export interface Persistence {
  readonly groomId: string;
  readonly revision: number;
  readonly versions: readonly GroomVersion[];
  /** The surface the groom grows on, and the largest surface file an upload may send (for moving it onto another). */
  readonly surfaceId?: string;
  readonly maxUploadBytes?: number;
}

export interface Autosave {
  /** Null for a practice groom, which is never saved. */
  readonly status: SaveStatus | null;
  retry(): void;
  keepMine(): void;
  /** Saves what is waiting; resolves with whether everything is saved. */
  flush(): Promise<boolean>;
  /** Takes a spec the server now holds (a version brought back) as saved at its revision. */
  adopt(spec: GroomSpec, revision: number): void;
}

export function useAutosave(persistence: Persistence | null, initialSpec: GroomSpec, spec: GroomSpec, settled: boolean): Autosave {
  const [status, setStatus] = useState<SaveStatus | null>(null);
  const saver = useRef<Autosaver | null>(null);

  useEffect(() => {
    if (!persistence) return;
    const next = new Autosaver(initialSpec, persistence.revision, {
      save: (saved, base) => studioApi.saveSpec(persistence.groomId, saved, base),
      onStatus: setStatus,
    });
    saver.current = next;
    setStatus(next.current);
    const warn = (event: BeforeUnloadEvent) => {
      if (next.dirty) event.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => {
      window.removeEventListener('beforeunload', warn);
      next.dispose();
      saver.current = null;
    };
  }, [initialSpec, persistence]);

  useEffect(() => {
    if (settled) saver.current?.update(spec);
  }, [settled, spec]);

  const controls = useMemo(
    () => ({
      retry: () => saver.current?.retry(),
      keepMine: () => saver.current?.keepMine(),
      flush: () => saver.current?.flush() ?? Promise.resolve(true),
      adopt: (restored: GroomSpec, revision: number) => saver.current?.adopt(restored, revision),
    }),
    [],
  );
  return useMemo(() => ({ status, ...controls }), [controls, status]);
}
