'use client';
// "Twin sides": the surface's mirror plane found by the field worker (with how far the surface is
// from its own mirror image), and the switch that makes every feature edit happen on both sides
// (lib/studio/client/mirror-edits.ts, through the spec's `symmetry`). Off, the two sides stay
// as they are, each feature on its own.
import { useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { WorkerFailure, type FieldClient } from '@/lib/studio/client/field-client';
import { planeWords, symmetryOfPlane } from '@/lib/studio/client/mirror-edits';
import type { FoundMirror } from '@/lib/studio/client/protocol';
import type { EditorActions } from './editor-actions';

function percent(share: number): string {
  return `${(share * 100).toFixed(share < 0.001 ? 3 : 2)} %`;
}

export function TwinSidesPanel({ spec, client, actions }: { spec: GroomSpec; client: FieldClient | null; actions: EditorActions }) {
  const [found, setFound] = useState<FoundMirror | null>(null);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const on = !!spec.symmetry;

  const turn = async (wanted: boolean) => {
    setProblem(null);
    if (!wanted) {
      setProblem(actions.edit({ type: 'set-symmetry', symmetry: null }));
      return;
    }
    let plane = found;
    if (!plane) {
      if (!client) return;
      // Shown on while the plane is looked for, so the switch answers the click at once.
      setBusy(true);
      try {
        plane = await client.request({ type: 'find-mirror' });
        setFound(plane);
      } catch (failure) {
        if (!(failure instanceof WorkerFailure && failure.error.code === 'closed')) setProblem(failure instanceof Error ? failure.message : 'No mirror plane could be found.');
        return;
      } finally {
        setBusy(false);
      }
    }
    setProblem(actions.edit({ type: 'set-symmetry', symmetry: symmetryOfPlane(plane) }));
  };

  return (
    <fieldset className="flex flex-col gap-1.5 rounded-xl border-2 border-vellum px-3 py-2" aria-label="Twin sides">
      <label className="flex items-center gap-2 text-sm font-semibold text-loam">
        <input type="checkbox" checked={on || busy} disabled={busy || !client} onChange={(event) => void turn(event.target.checked)} className="accent-bracken" />
        Twin sides — every feature placed, moved or deleted on one side is mirrored on the other
      </label>
      {busy && <p className="text-xs text-loam-soft">Looking for the surface’s mirror plane…</p>}
      {on && (
        <p className="text-xs text-loam-soft" data-testid="twin-plane">
          Mirror plane <span className="font-semibold text-loam">{planeWords(spec.symmetry!)}</span>
          {found && (
            <>
              {' '}· the surface misses its own mirror image by at most <span className="tabular-nums">{percent(found.mismatch)}</span> of its size
            </>
          )}
        </p>
      )}
      {found && !found.symmetric && <p className="text-xs font-medium text-hawthorn">This surface is not symmetric: mirrored features land where the surface is, not where the other side would be.</p>}
      {problem && <p className="text-xs font-medium text-hawthorn">{problem}</p>}
    </fieldset>
  );
}
