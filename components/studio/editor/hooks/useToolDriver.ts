'use client';
// Drives the active editor tool (lib/studio/client/tools) from the stage: pointer events on the
// surface and its markers become surface hits, the tool session's steps are carried out on the
// editor state, and the view stops turning while the pointer holds a marker or a stroke.
import type { ThreeEvent } from '@react-three/fiber';
import { useCallback, useEffect, useMemo, useRef, type RefObject } from 'react';
import type { EditorState } from '@/lib/studio/client/editor-state';
import type { FeatureRef, Vec3 } from '@/lib/studio/client/features';
import { markAsked, startDragTiming } from '@/lib/studio/client/drag-timing';
import { preparePaintSurface, type PaintSurface } from '@/lib/studio/client/paint';
import type { OpenedSurface, SolveReport } from '@/lib/studio/client/protocol';
import { nearestCorner, vertexPoint } from '@/lib/studio/client/surface-geometry';
import { TOOLS, type SurfaceHit, type ToolContext, type ToolId, type ToolOptions } from '@/lib/studio/client/tools';
import {
  applyChanges,
  chooseTool,
  clickAt,
  discardDraft,
  finishDraft,
  holdsPointer,
  pointerDown,
  pointerMove,
  pointerUp,
  pressMarker,
  sessionDraft,
  startSession,
  toolKey,
  type SessionStep,
  type ToolSession,
} from '@/lib/studio/client/tools/session';
import { strokeInView, type TintState } from '@/lib/studio/client/tools/tint';
import type { StageApi } from '../../scene/Stage';
import type { MarkerHandlers } from '../EditorScene';
import { useLatest, useLiveState } from './useLiveState';

export interface ToolDriver {
  readonly tool: ToolId;
  readonly draft: readonly Vec3[];
  /** Whether the stage joins the draft along the mesh. */
  readonly joinsDraft: boolean;
  /** A marker is being dragged: the solve from before the drag, for lists that should not jump meanwhile. */
  readonly dragging: { readonly solveBefore: SolveReport | null } | null;
  readonly pointer: { down(event: ThreeEvent<PointerEvent>): void; move(event: ThreeEvent<PointerEvent>): void; up(event: ThreeEvent<PointerEvent>): void };
  readonly markers: MarkerHandlers;
  choose(tool: ToolId): void;
  /** Hands a plain key to the tools; false when they did nothing with it. */
  key(key: string): boolean;
  finishDraft(): void;
  discardDraft(): void;
  /** Puts the index budget's remainder at the surface point in the middle of the view. */
  placeRemainderAtCentre(): void;
  /** The tint stroke being dragged: its values (changed in place; `dabs` counts the changes), or null. */
  readonly painting: ReturnType<typeof strokeInView>;
}

export function useToolDriver({ getEditor, setEditor, surface, solve, options, stage, onNotice, onDragMove }: {
  getEditor: () => EditorState;
  setEditor: (next: EditorState) => void;
  surface: OpenedSurface | null;
  solve: SolveReport | null;
  options: ToolOptions;
  stage: RefObject<StageApi | null>;
  onNotice: (words: string | null) => void;
  /** A held marker moved: the spec it made, handed over at once (for the field to be asked for without waiting on a render). */
  onDragMove?: (spec: EditorState['present']['spec']) => void;
}): ToolDriver {
  const [session, getSession, setSession] = useLiveState<ToolSession>(() => startSession());
  // The brush's view of the surface is prepared once per surface, when the brush is first used.
  const paintSurface = useRef<{ surface: OpenedSurface; paint: PaintSurface } | null>(null);
  const paintOf = useCallback((opened: OpenedSurface): PaintSurface => {
    if (paintSurface.current?.surface !== opened) paintSurface.current = { surface: opened, paint: preparePaintSurface({ positions: opened.positions, triangles: opened.triangles }) };
    return paintSurface.current.paint;
  }, []);
  const latest = useLatest({ surface, solve, options, onNotice, onDragMove });
  const solveBefore = useRef<SolveReport | null>(null);

  /** Runs one step of the session (none before the surface is open) and carries it out; false when nothing took it. */
  const run = useCallback(
    (make: (session: ToolSession, context: ToolContext) => SessionStep | null): boolean => {
      const { surface: opened, solve: solved, options: chosen, onNotice: say } = latest.current;
      if (!opened) return false;
      const before = getSession();
      const paint = before.tool === 'tint' ? paintOf(opened) : undefined;
      const step = make(before, { editor: getEditor(), options: chosen, surface: opened, solve: solved, ...(paint ? { paint } : {}) });
      if (!step) return false;
      if (!before.drag && step.session.drag) {
        solveBefore.current = solved;
        startDragTiming();
      }
      if (step.session !== before) setSession(step.session);
      const done = applyChanges(getEditor(), step.changes);
      if (done.editor !== getEditor()) setEditor(done.editor);
      const words = done.refused ?? step.notice;
      if (words !== undefined) say(words);
      const holds = holdsPointer(step.session);
      if (holds !== holdsPointer(before)) stage.current?.setNavigation(!holds);
      return true;
    },
    [getEditor, getSession, latest, paintOf, setEditor, setSession, stage],
  );

  const hitOf = useCallback(
    (event: ThreeEvent<PointerEvent>): SurfaceHit | null => {
      const opened = latest.current.surface;
      if (!opened || event.faceIndex == null) return null;
      const point: Vec3 = [event.point.x, event.point.y, event.point.z];
      const vertex = nearestCorner(opened.positions, opened.triangles, event.faceIndex, point);
      return { point, face: event.faceIndex, vertex, vertexPoint: vertexPoint(opened.positions, vertex), screen: { x: event.nativeEvent.clientX, y: event.nativeEvent.clientY } };
    },
    [latest],
  );

  const pointer = useMemo(
    () => ({
      down(event: ThreeEvent<PointerEvent>) {
        const hit = event.nativeEvent.button === 0 ? hitOf(event) : null;
        if (hit) run((s, c) => pointerDown(s, hit, c));
      },
      move(event: ThreeEvent<PointerEvent>) {
        const hit = hitOf(event);
        if (!hit) return;
        const before = getEditor().present.spec;
        run((s, c) => pointerMove(s, hit, c));
        // A held marker that moved: the field now owes the groomer this position (timed from the event).
        const after = getEditor().present.spec;
        if (after !== before && getSession().drag) {
          markAsked(after, event.nativeEvent.timeStamp);
          latest.current.onDragMove?.(after);
        }
      },
      up(event: ThreeEvent<PointerEvent>) {
        const hit = hitOf(event);
        if (hit) run((s, c) => pointerUp(s, hit, c));
      },
    }),
    [getEditor, getSession, hitOf, latest, run],
  );

  // A release anywhere on the page ends a drag or a stroke (the surface hears only releases over it).
  useEffect(() => {
    const release = () => run((s, c) => pointerUp(s, null, c));
    window.addEventListener('pointerup', release);
    window.addEventListener('pointercancel', release);
    return () => {
      window.removeEventListener('pointerup', release);
      window.removeEventListener('pointercancel', release);
    };
  }, [run]);

  const markers = useMemo<MarkerHandlers>(
    () => ({
      onMarkerDown(feature: FeatureRef, event: ThreeEvent<PointerEvent>) {
        if (event.nativeEvent.button !== 0) return;
        event.stopPropagation();
        run((s) => pressMarker(s, feature));
      },
    }),
    [run],
  );

  const placeRemainderAtCentre = useCallback(() => {
    const opened = latest.current.surface;
    if (!opened) return;
    const pick = stage.current?.pickAt(0.5, 0.5) ?? null;
    const vertex = pick ? nearestCorner(opened.positions, opened.triangles, pick.face, pick.point) : 0;
    const place = vertexPoint(opened.positions, vertex);
    const hit: SurfaceHit = { point: pick?.point ?? place, face: pick?.face ?? -1, vertex, vertexPoint: place, screen: { x: 0, y: 0 } };
    run((s, c) => chooseTool(s, 'remainder', c));
    run((s, c) => clickAt(s, hit, c));
  }, [latest, run, stage]);

  const draft = sessionDraft(session);
  return {
    tool: session.tool,
    draft,
    joinsDraft: TOOLS[session.tool].joinsDraft,
    dragging: session.drag ? { solveBefore: solveBefore.current } : null,
    pointer,
    markers,
    choose: useCallback((tool: ToolId) => void run((s, c) => chooseTool(s, tool, c)), [run]),
    key: useCallback((key: string) => run((s, c) => toolKey(s, key, c)), [run]),
    finishDraft: useCallback(() => void run((s, c) => finishDraft(s, c)), [run]),
    discardDraft: useCallback(() => void run((s, c) => discardDraft(s, c)), [run]),
    placeRemainderAtCentre,
    painting: session.tool === 'tint' ? strokeInView(session.state as TintState) : null,
  };
}
