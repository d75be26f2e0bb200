'use client';
// Guides grown in the field worker once the field settles: 300 ms after the last change of what
// they depend on, never while a marker is dragged or while they are hidden. The last grown guides
// stay shown (faded) until the new ones come.
import { useEffect, useMemo, useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { SUPERSEDED, WorkerFailure, type FieldClient } from '@/lib/studio/client/field-client';
import type { GrownGuides, OpenedSurface, RootsSource } from '@/lib/studio/client/protocol';
import { useLatest } from './useLiveState';
import { useTask, type Task } from './useTask';

// Painted maps and masks run to megabytes of text and the spec changes many times a second during a
// drag: they enter the key by identity (edits replace the array only when a map or mask changes; undo
// brings back the earlier array), so the key is not rebuilt from their bytes on every change.
const paintedIds = new WeakMap<object, number>();
let nextPaintedId = 1;
function paintedKey(painted: readonly unknown[] | undefined): number {
  if (!painted) return 0;
  let id = paintedIds.get(painted);
  if (id === undefined) paintedIds.set(painted, (id = nextPaintedId++));
  return id;
}

/** How long the spec must rest before guides are grown for it. */
const SETTLE_MILLISECONDS = 300;

export interface Guides {
  readonly grown: GrownGuides | null;
  /** Whether the grown guides belong to the spec as it is now. */
  readonly current: boolean;
  readonly error: string | null;
  readonly task: Task | null;
}

export function useGuides({ client, surface, spec, rootsFrom, show, paused }: { client: FieldClient | null; surface: OpenedSurface | null; spec: GroomSpec; rootsFrom?: RootsSource; show: boolean; paused: boolean }): Guides {
  const [guides, setGuides] = useState<{ grown: GrownGuides; key: string } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [task, report, clear] = useTask();
  const latestSpec = useLatest(spec);
  const latestRoots = useLatest(rootsFrom);
  const key = useMemo(
    () => JSON.stringify([spec.field, spec.guides, spec.guideSets, spec.pins, paintedKey(spec.maps), paintedKey(spec.masks), spec.units, spec.upAxis, spec.symmetry, rootsFrom?.key]),
    [spec, rootsFrom?.key],
  );

  useEffect(() => {
    if (!surface || !client || !show || paused || guides?.key === key) return;
    const timer = setTimeout(() => {
      client
        .latest('guides', 1, { type: 'grow', spec: latestSpec.current, rootsFrom: latestRoots.current }, report)
        .then((grown) => {
          if (grown === SUPERSEDED) return;
          setGuides({ grown, key });
          setError(null);
          clear();
        })
        .catch((failure: unknown) => {
          if (failure instanceof WorkerFailure && failure.error.code === 'closed') return;
          clear();
          setError(failure instanceof Error ? failure.message : 'The guides could not be grown.');
        });
    }, SETTLE_MILLISECONDS);
    return () => clearTimeout(timer);
  }, [clear, client, guides?.key, key, latestRoots, latestSpec, paused, report, show, surface]);

  return { grown: guides?.grown ?? null, current: guides?.key === key, error, task };
}
