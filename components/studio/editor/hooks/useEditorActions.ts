'use client';
// The editor's actions for the panels (EditorActions): edits checked with the groom schema and
// made undoable steps, the selection, the view turned to a feature, and features added from the
// side list in the middle of the view.
import { useMemo, type RefObject } from 'react';
import { applyCheckedEdit, endGesture, previewCheckedEdit, select, type EditorState } from '@/lib/studio/client/editor-state';
import { featurePlace } from '@/lib/studio/client/marker-places';
import { listedFeatureEdit, needsSecondPoint } from '@/lib/studio/client/list-additions';
import type { OpenedSurface, SolveReport } from '@/lib/studio/client/protocol';
import { nearestCorner, neighbourOf, vertexPoint } from '@/lib/studio/client/surface-geometry';
import type { StageApi } from '../../scene/Stage';
import type { EditorActions } from '../editor-actions';
import { useLatest } from './useLiveState';

export function useEditorActions({ getEditor, setEditor, surface, solve, stage, onAdded }: {
  getEditor: () => EditorState;
  setEditor: (next: EditorState) => void;
  surface: OpenedSurface | null;
  solve: SolveReport | null;
  stage: RefObject<StageApi | null>;
  /** Called when a feature was added from the list (the side list is then shown). */
  onAdded: () => void;
}): EditorActions {
  const latest = useLatest({ surface, solve, onAdded });
  return useMemo<EditorActions>(() => {
    const edit = (change: Parameters<EditorActions['edit']>[0]) => {
      const step = applyCheckedEdit(getEditor(), change);
      if (!step.refused) setEditor(step.state);
      return step.refused;
    };
    return {
      edit,
      preview(change) {
        const step = previewCheckedEdit(getEditor(), change);
        if (!step.refused) setEditor(step.state);
        return step.refused;
      },
      finish: () => setEditor(endGesture(getEditor())),
      select: (feature) => setEditor(select(getEditor(), feature)),
      lookAt(feature) {
        const opened = latest.current.surface;
        const at = opened && featurePlace(opened, getEditor().present.spec, latest.current.solve, feature);
        if (at) stage.current?.lookAt(at.point, at.normal);
        setEditor(select(getEditor(), feature));
      },
      addFromList(kind) {
        const opened = latest.current.surface;
        if (!opened) return;
        const vertexAt = (x: number, y: number) => {
          const hit = stage.current?.pickAt(x, y);
          return hit ? nearestCorner(opened.positions, opened.triangles, hit.face, hit.point) : null;
        };
        const first = vertexAt(0.5, 0.5) ?? 0;
        let second = first;
        if (needsSecondPoint(kind)) {
          const beside = vertexAt(0.62, 0.5) ?? vertexAt(0.38, 0.5) ?? vertexAt(0.5, 0.62);
          second = beside === null || beside === first ? neighbourOf(opened.triangles, first) : beside;
        }
        edit(listedFeatureEdit(kind, vertexPoint(opened.positions, first), vertexPoint(opened.positions, second)));
        latest.current.onAdded();
      },
    };
  }, [getEditor, latest, setEditor, stage]);
}
