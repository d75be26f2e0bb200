'use client';
// "Read the grain" as the page runs it: one request to the field worker (its own lane, after any
// solve in flight), the reading kept while it still fits the spec (same order and boundary), and
// the marks still to take worked out from the spec (lib/studio/client/grain-marks.ts).
import { useCallback, useMemo, useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { SUPERSEDED, WorkerFailure, type FieldClient } from '@/lib/studio/client/field-client';
import { marksLeft } from '@/lib/studio/client/grain-marks';
import type { GrainFollow, GrainMark, GrainReading } from '@/lib/studio/client/protocol';

export interface GrainSession {
  /** The reading in view, or null (none asked for, dismissed, or no longer fitting the spec). */
  readonly reading: GrainReading | null;
  /** Its marks not yet taken into the spec. */
  readonly left: readonly GrainMark[];
  readonly busy: boolean;
  readonly error: string | null;
  read(follow: GrainFollow): void;
  dismiss(): void;
}

export function useGrain({ client, spec }: { client: FieldClient | null; spec: GroomSpec }): GrainSession {
  const [held, setHeld] = useState<{ reading: GrainReading; boundary: GroomSpec['field']['boundary'] } | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const read = useCallback(
    (follow: GrainFollow) => {
      if (!client) return;
      setBusy(true);
      setError(null);
      const boundary = spec.field.boundary;
      client
        .latest('grain', 1, { type: 'read-grain', spec, follow })
        .then((reading) => {
          if (reading === SUPERSEDED) return;
          setHeld({ reading, boundary });
          performance.mark('whorlwind:grain-read', { detail: { milliseconds: reading.milliseconds, marks: reading.marks.length } });
        })
        .catch((failure: unknown) => {
          if (failure instanceof WorkerFailure && failure.error.code === 'closed') return;
          setError(failure instanceof Error ? failure.message : 'The grain could not be read.');
        })
        .finally(() => setBusy(false));
    },
    [client, spec],
  );
  const dismiss = useCallback(() => setHeld(null), []);
  const fits = !!held && held.reading.order === spec.field.order && held.boundary === spec.field.boundary;
  const reading = fits ? held.reading : null;
  const left = useMemo(() => (reading ? marksLeft(spec, reading.marks) : []), [reading, spec]);
  return { reading, left, busy, error, read, dismiss };
}
