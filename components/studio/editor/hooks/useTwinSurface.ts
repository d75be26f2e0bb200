'use client';
// Twin sides mirror a twisted singularity exactly only when they know where the open surface fixes
// its twist (lib/studio/client/mirror-edits.ts, `TwinSurface`): once twin sides are on, the field
// worker is asked for it once per opened surface and it goes into the editor state, where every
// edit reads it.
import { useEffect, useRef } from 'react';
import { withTwinSurface, type EditorState } from '@/lib/studio/client/editor-state';
import { WorkerFailure, type FieldClient } from '@/lib/studio/client/field-client';
import { twinSurfaceOf } from '@/lib/studio/client/mirror-edits';
import type { OpenedSurface } from '@/lib/studio/client/protocol';

export function useTwinSurface({ client, surface, on, getEditor, setEditor, onFailure }: {
  client: FieldClient | null;
  surface: OpenedSurface | null;
  /** Whether twin sides are on: only then is the worker asked. */
  on: boolean;
  getEditor: () => EditorState;
  setEditor: (next: EditorState) => void;
  onFailure: (message: string) => void;
}): void {
  const asked = useRef<OpenedSurface | null>(null);
  useEffect(() => {
    if (!client || !surface || !on || asked.current === surface) return;
    asked.current = surface;
    // What was read of another surface no longer holds.
    if (getEditor().twinSurface) setEditor(withTwinSurface(getEditor(), null));
    client
      .request({ type: 'twist-faces' })
      .then((faces) => {
        if (asked.current === surface) setEditor(withTwinSurface(getEditor(), twinSurfaceOf(surface, faces)));
      })
      .catch((error: unknown) => {
        if (error instanceof WorkerFailure && (error.error.code === 'closed' || error.error.code === 'no-surface')) return;
        asked.current = null;
        onFailure(`Twin sides could not read where the surface fixes a twist, so a twisted whorl's twin may not be its exact mirror image: ${error instanceof Error ? error.message : 'the field worker failed'}.`);
      });
  }, [client, getEditor, on, onFailure, setEditor, surface]);
}
