'use client';
// The groom editor: the stage with the surface, field, guides and features; the tools that place
// and draw on it; the side list where every feature is also a set of numbers; the index budget and
// the measured indices always in view; undo and redo; autosave, versions and exports. Every solve
// runs in the field worker, so the page stays responsive while the field follows each edit.
import type { ThreeEvent } from '@react-three/fiber';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { Mesh } from 'three';
import type { GroomSpec } from '@/lib/groom/spec';
import { Autosaver, type SaveStatus } from '@/lib/studio/client/autosave';
import { studioApi, type GroomVersion } from '@/lib/studio/client/api';
import {
  applyEdit,
  canRedo,
  canUndo,
  createEditorState,
  endGesture,
  previewEdit,
  redo,
  redoLabel,
  select,
  undo,
  undoLabel,
  type EditorState,
} from '@/lib/studio/client/editor-state';
import { featureExists, featureLabel, featureOfPath, roundPoint, type FeatureRef, type Vec3 } from '@/lib/studio/client/features';
import { SUPERSEDED, WorkerFailure, prewarmFieldWorker, startFieldWorker, type FieldClient } from '@/lib/studio/client/field-client';
import type { DisplayOptions, GrownGuides, OpenedSurface, ProgressReport, SolveReport, SurfaceSource } from '@/lib/studio/client/protocol';
import { applySpecEdit, checkedSpecEdit, type SpecEdit } from '@/lib/studio/client/spec-edits';
import { nearestCorner, neighbourOf } from '@/lib/studio/client/surface-geometry';
import { Stage, type StageApi } from '../scene/Stage';
import { ProgressBar } from '../ui/ProgressBar';
import { BudgetCard } from './BudgetCard';
import type { EditorActions } from './editor-actions';
import { EditorScene, placeOnSurface } from './EditorScene';
import { ExportPanel } from './ExportPanel';
import { FeatureList } from './FeatureList';
import { FieldPanel } from './FieldPanel';
import { MarkerCard, ScreenAnchor } from './MarkerCard';
import { GuidePanel } from './GuidePanel';
import { SaveStatusLine } from './SaveStatusLine';
import { ToolRail } from './ToolRail';
import { TOOLS, type Tool, type ToolOptions } from './tools';
import { VersionPanel } from './VersionPanel';

// The field worker's code starts loading as soon as the editor's code runs, before the page is
// hydrated: it is the longest wait before the surface can be opened.
prewarmFieldWorker();

export interface Persistence {
  readonly groomId: string;
  readonly revision: number;
  readonly versions: readonly GroomVersion[];
}

type Tab = 'features' | 'guides' | 'field' | 'versions' | 'export';

interface Task {
  readonly progress: ProgressReport;
  readonly startedAt: number;
}

function problemText(problems: readonly { path: string; message: string }[]): string {
  const first = problems[0];
  return first ? first.message.replace(/^Too (big|small): expected number to be ([<>]=?)(.*)$/, (_, __, op, n) => `Use a value ${op.startsWith('<') ? 'up to' : 'from'} ${n}.`) : 'This change was refused.';
}

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName);
}

export function Workspace({
  title,
  subtitle,
  source,
  initialSpec,
  persistence,
}: {
  title: string;
  subtitle: string;
  source: SurfaceSource;
  initialSpec: GroomSpec;
  persistence: Persistence | null;
}) {
  const [editor, setEditorState] = useState<EditorState>(() => createEditorState(initialSpec));
  const editorRef = useRef(editor);
  const setEditor = useCallback((next: EditorState) => {
    editorRef.current = next;
    setEditorState(next);
  }, []);
  const spec = editor.present.spec;
  const gesture = editor.gestureBase !== null;

  const clientRef = useRef<FieldClient | null>(null);
  const stageApi = useRef<StageApi | null>(null);
  const meshRef = useRef<Mesh | null>(null);
  const [surface, setSurface] = useState<OpenedSurface | null>(null);
  const [openError, setOpenError] = useState<string | null>(null);
  const [task, setTask] = useState<Task | null>(null);
  const [guideTask, setGuideTask] = useState<Task | null>(null);
  const [solve, setSolve] = useState<SolveReport | null>(null);
  const [lastDrawing, setLastDrawing] = useState<{ lines: Float32Array; shade: Float32Array | null } | null>(null);
  const [guides, setGuides] = useState<{ grown: GrownGuides; key: string } | null>(null);
  const [guideError, setGuideError] = useState<string | null>(null);
  const [display, setDisplay] = useState<DisplayOptions>({ drawing: 'strokes', density: 5000 });
  const [showGuides, setShowGuides] = useState(true);
  const [tool, setTool] = useState<Tool>('look');
  const [toolOptions, setToolOptions] = useState<ToolOptions>({ index: 2, attribute: 'length', value: 1.5, closed: false });
  const [draft, setDraft] = useState<Vec3[]>([]);
  const [draftPath, setDraftPath] = useState<Float32Array | null>(null);
  const [tab, setTab] = useState<Tab>('features');
  const [notice, setNotice] = useState<string | null>(null);
  /** A marker is being dragged: the guides, grown for where it was, are hidden until it is let go. */
  const [dragging, setDragging] = useState(false);
  const [saveStatus, setSaveStatus] = useState<SaveStatus | null>(null);
  const saverRef = useRef<Autosaver | null>(null);
  const specRef = useRef(spec);
  specRef.current = spec;

  const firstSolve = useRef(false);
  const displayRef = useRef(display);
  displayRef.current = display;
  // While a marker is dragged the side list keeps showing where it was (and its measured index)
  // until it is let go, so the page does not re-lay out its numbers at every step of the drag.
  const frozenSolve = useRef<SolveReport | null>(null);
  // ── solve on every change of the spec (quick while a drag runs) ─────────────────────────
  const sent = useRef<{ spec: GroomSpec; display: DisplayOptions; quick: boolean } | null>(null);
  const requestSolve = useCallback((client: FieldClient, next: GroomSpec, shown: DisplayOptions, quick: boolean) => {
    const last = sent.current;
    if (last && last.spec === next && last.display === shown && last.quick === quick) return;
    sent.current = { spec: next, display: shown, quick };
    client
      .latest('field', 0, { type: 'solve', spec: next, display: shown, quick })
      .then((report) => {
        if (report === SUPERSEDED) return;
        performance.mark('whorlwind:solved', { detail: { milliseconds: report.milliseconds, quick: report.quick } });
        if (!firstSolve.current) {
          firstSolve.current = true;
          performance.mark('whorlwind:first-solve', { detail: { milliseconds: report.milliseconds } });
        }
        setSolve(report);
        if (report.lines) setLastDrawing({ lines: report.lines, shade: report.lineShade });
      })
      .catch((error: unknown) => {
        if (error instanceof WorkerFailure && (error.error.code === 'closed' || error.error.code === 'no-surface')) return;
        setNotice(error instanceof Error ? error.message : 'The field could not be solved.');
      });
  }, []);

  // ── the worker: open the surface once ────────────────────────────────────────────────
  const taskStarted = useRef<{ stage: string; at: number } | null>(null);
  const track = useCallback((set: (task: Task | null) => void) => (progress: ProgressReport) => {
    const now = performance.now();
    if (taskStarted.current?.stage !== progress.stage) taskStarted.current = { stage: progress.stage, at: now };
    set({ progress, startedAt: taskStarted.current.at });
  }, []);

  useEffect(() => {
    performance.mark('whorlwind:editor-mounted');
    const client = startFieldWorker();
    clientRef.current = client;
    performance.mark('whorlwind:worker-starting');
    const report = track(setTask);
    let heard = false;
    const opening = client.request({ type: 'open', source, boundary: initialSpec.field.boundary }, (progress) => {
      // The worker's first word: its code is loaded and it has started on the surface.
      if (!heard) performance.mark('whorlwind:worker-working');
      heard = true;
      report(progress);
    });
    // The first solve waits in the worker right behind the opening, so it runs while this page
    // builds its own copy of the surface for drawing.
    sent.current = null;
    requestSolve(client, initialSpec, displayRef.current, false);
    opening
      .then((opened) => {
        performance.mark('whorlwind:surface-opened', { detail: opened.timings });
        setSurface(opened);
        setTask(null);
      })
      .catch((error: unknown) => {
        if (error instanceof WorkerFailure && error.error.code === 'closed') return;
        setTask(null);
        setOpenError(error instanceof Error ? error.message : 'The surface could not be opened.');
      });
    return () => {
      client.terminate();
      clientRef.current = null;
    };
  }, [initialSpec, requestSolve, source, track]);

  useEffect(() => {
    const client = clientRef.current;
    if (!surface || !client) return;
    requestSolve(client, spec, display, gesture);
  }, [display, gesture, requestSolve, spec, surface]);

  const drawnCount = useRef(0);
  const onFieldDrawn = useCallback(() => {
    performance.mark('whorlwind:field-drawn');
    if (drawnCount.current++ === 0) performance.mark('whorlwind:first-field');
  }, []);

  // ── guides: grown once the field settles ─────────────────────────────────────────────────
  const guideKey = useMemo(() => JSON.stringify([spec.field, spec.guides, spec.pins, spec.units, spec.upAxis]), [spec]);
  useEffect(() => {
    const client = clientRef.current;
    if (!surface || !client || !showGuides || dragging || guides?.key === guideKey) return;
    const timer = setTimeout(() => {
      client
        .latest('guides', 1, { type: 'grow', spec: specRef.current }, track(setGuideTask))
        .then((grown) => {
          if (grown === SUPERSEDED) return;
          setGuides({ grown, key: guideKey });
          setGuideError(null);
          setGuideTask(null);
        })
        .catch((error: unknown) => {
          if (error instanceof WorkerFailure && error.error.code === 'closed') return;
          setGuideTask(null);
          setGuideError(error instanceof Error ? error.message : 'The guides could not be grown.');
        });
    }, 300);
    return () => clearTimeout(timer);
  }, [dragging, guideKey, guides?.key, showGuides, surface, track]);

  // ── autosave ────────────────────────────────────────────────────────────────────────────
  useEffect(() => {
    if (!persistence) return;
    const saver = new Autosaver(initialSpec, persistence.revision, {
      save: (next, base) => studioApi.saveSpec(persistence.groomId, next, base),
      onStatus: setSaveStatus,
    });
    saverRef.current = saver;
    setSaveStatus(saver.current);
    const warn = (event: BeforeUnloadEvent) => {
      if (saver.dirty) event.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => {
      window.removeEventListener('beforeunload', warn);
      saver.dispose();
      saverRef.current = null;
    };
  }, [initialSpec, persistence]);

  useEffect(() => {
    if (!gesture) saverRef.current?.update(spec);
  }, [gesture, spec]);

  // ── edits ───────────────────────────────────────────────────────────────────────────────
  const actions = useMemo<EditorActions>(() => {
    const edit = (change: SpecEdit): string | null => {
      const state = editorRef.current;
      const checked = checkedSpecEdit(state.present.spec, change);
      if (!checked.ok) return problemText(checked.problems);
      setEditor(applyEdit(state, change, checked.spec));
      return null;
    };
    const preview = (change: SpecEdit): string | null => {
      const state = editorRef.current;
      const checked = checkedSpecEdit(state.present.spec, change);
      if (!checked.ok) return problemText(checked.problems);
      setEditor(previewEdit(state, change, checked.spec));
      return null;
    };
    const centre = (x = 0.5, y = 0.5) => {
      const hit = stageApi.current?.pickAt(x, y);
      return hit ?? null;
    };
    return {
      edit,
      preview,
      finish: () => setEditor(endGesture(editorRef.current)),
      select: (feature) => setEditor(select(editorRef.current, feature)),
      lookAt: (feature) => {
        const opened = surfaceRef.current;
        const at = opened && markerPlace(opened, editorRef.current.present.spec, solveRef.current, feature);
        if (at) stageApi.current?.lookAt(at.point, at.normal);
        setEditor(select(editorRef.current, feature));
      },
      addFromList: (kind) => {
        const opened = surfaceRef.current;
        if (!opened) return;
        const vertexAt = (x: number, y: number) => {
          const hit = centre(x, y);
          return hit ? nearestCorner(opened.positions, opened.triangles, hit.face, hit.point) : null;
        };
        const first = vertexAt(0.5, 0.5) ?? 0;
        const point = vertexPoint(opened, first);
        switch (kind) {
          case 'whorl':
          case 'saddle':
          case 'singularity':
            edit({ type: 'add-singularity', singularity: { point, index: kind === 'whorl' ? 1 : kind === 'saddle' ? -1 : 2, handedness: 'counterclockwise' } });
            break;
          case 'pin':
            edit({ type: 'add-pin', pin: { attribute: 'length', point, value: 1.5 } });
            break;
          case 'parting':
          case 'crest':
          case 'stroke': {
            let second = vertexAt(0.62, 0.5) ?? vertexAt(0.38, 0.5) ?? vertexAt(0.5, 0.62);
            if (second === null || second === first) second = neighbourOf(opened.triangles, first);
            const points: Vec3[] = [point, vertexPoint(opened, second)];
            if (kind === 'stroke') edit({ type: 'add-stroke', stroke: { points } });
            else edit({ type: 'add-curve', kind, curve: { points, closed: false } });
            break;
          }
        }
        setTab('features');
      },
    };
  }, [setEditor]);

  const surfaceRef = useRef(surface);
  surfaceRef.current = surface;
  const solveRef = useRef(solve);
  solveRef.current = solve;

  const doUndo = useCallback(() => setEditor(undo(editorRef.current)), [setEditor]);
  const doRedo = useCallback(() => setEditor(redo(editorRef.current)), [setEditor]);

  // ── pointer work on the surface ─────────────────────────────────────────────────────────
  const press = useRef<{ x: number; y: number; feature?: FeatureRef; stroke?: Vec3[]; lastVertex?: number } | null>(null);

  const finishDraft = useCallback(() => {
    const points = draftRef.current;
    const kind = toolRef.current;
    if ((kind === 'parting' || kind === 'crest') && points.length >= 2) {
      const refused = actions.edit({ type: 'add-curve', kind, curve: { points, closed: toolOptionsRef.current.closed } });
      if (refused) setNotice(refused);
    }
    setDraft([]);
    setDraftPath(null);
  }, [actions]);

  const draftRef = useRef(draft);
  draftRef.current = draft;
  const toolRef = useRef(tool);
  toolRef.current = tool;
  const toolOptionsRef = useRef(toolOptions);
  toolOptionsRef.current = toolOptions;

  const placeAt = useCallback(
    (vertex: number) => {
      const opened = surfaceRef.current;
      if (!opened) return;
      const point = vertexPoint(opened, vertex);
      const options = toolOptionsRef.current;
      let refused: string | null = null;
      switch (toolRef.current) {
        case 'whorl':
          refused = actions.edit({ type: 'add-singularity', singularity: { point, index: 1, handedness: 'counterclockwise' } });
          break;
        case 'saddle':
          refused = actions.edit({ type: 'add-singularity', singularity: { point, index: -1, handedness: 'counterclockwise' } });
          break;
        case 'singularity':
          refused = actions.edit({ type: 'add-singularity', singularity: { point, index: options.index, handedness: 'counterclockwise' } });
          break;
        case 'pin':
          refused = actions.edit({ type: 'add-pin', pin: { attribute: options.attribute, point, value: options.value } });
          break;
        case 'remainder': {
          const component = opened.componentOfVertex[vertex];
          const remainder = solveRef.current?.budget?.components.find((c) => c.component === component)?.remainder ?? null;
          if (remainder === null || remainder === 0) refused = 'Nothing remains to be placed on this piece of the surface.';
          else refused = actions.edit({ type: 'add-singularity', singularity: { point, index: remainder, handedness: 'counterclockwise' } });
          setTool('look');
          break;
        }
        case 'parting':
        case 'crest': {
          const last = draftRef.current[draftRef.current.length - 1];
          if (last && last[0] === point[0] && last[1] === point[1] && last[2] === point[2]) finishDraft();
          else setDraft([...draftRef.current, point]);
          break;
        }
        case 'look':
        case 'flow':
          actions.select(null);
          break;
      }
      if (refused) setNotice(refused);
    },
    [actions, finishDraft],
  );

  const pointer = useMemo(() => {
    const vertexOf = (event: ThreeEvent<PointerEvent>) => {
      const opened = surfaceRef.current;
      if (!opened || event.faceIndex == null) return null;
      return nearestCorner(opened.positions, opened.triangles, event.faceIndex, [event.point.x, event.point.y, event.point.z]);
    };
    return {
      down(event: ThreeEvent<PointerEvent>) {
        if (event.nativeEvent.button !== 0 || press.current?.feature) return;
        press.current = { x: event.nativeEvent.clientX, y: event.nativeEvent.clientY };
        if (toolRef.current === 'flow') {
          stageApi.current?.setNavigation(false);
          press.current.stroke = [roundPoint([event.point.x, event.point.y, event.point.z])];
          setDraft(press.current.stroke);
        }
      },
      move(event: ThreeEvent<PointerEvent>) {
        const current = press.current;
        if (!current) return;
        const opened = surfaceRef.current;
        if (current.feature && opened) {
          const vertex = vertexOf(event);
          if (vertex === null || vertex === current.lastVertex) return;
          current.lastVertex = vertex;
          const moved = moveEdit(editorRef.current.present.spec, current.feature, vertexPoint(opened, vertex));
          if (moved) setEditor(previewEdit(editorRef.current, moved, applySpecEdit(editorRef.current.present.spec, moved)));
        } else if (current.stroke && opened) {
          const last = current.stroke[current.stroke.length - 1];
          const p = event.point;
          if (Math.hypot(p.x - last[0], p.y - last[1], p.z - last[2]) >= 1.5 * opened.meanEdge) {
            current.stroke = [...current.stroke, roundPoint([p.x, p.y, p.z])];
            setDraft(current.stroke);
          }
        }
      },
      up(event: ThreeEvent<PointerEvent>) {
        const current = press.current;
        if (!current || current.feature || current.stroke) return;
        const moved = Math.hypot(event.nativeEvent.clientX - current.x, event.nativeEvent.clientY - current.y);
        if (moved > 5) return;
        const vertex = vertexOf(event);
        if (vertex !== null) placeAt(vertex);
      },
    };
  }, [placeAt, setEditor]);

  useEffect(() => {
    const release = () => {
      const current = press.current;
      press.current = null;
      if (!current) return;
      stageApi.current?.setNavigation(true);
      if (current.feature) {
        setEditor(endGesture(editorRef.current));
        setDragging(false);
      }
      if (current.stroke) {
        const points = current.stroke;
        setDraft([]);
        if (points.length >= 2) {
          const refused = actions.edit({ type: 'add-stroke', stroke: { points } });
          if (refused) setNotice(refused);
        } else {
          setNotice('A flow stroke needs a longer drag across the surface.');
        }
      }
    };
    window.addEventListener('pointerup', release);
    window.addEventListener('pointercancel', release);
    return () => {
      window.removeEventListener('pointerup', release);
      window.removeEventListener('pointercancel', release);
    };
  }, [actions, setEditor]);

  const markerHandlers = useMemo(
    () => ({
      onMarkerDown(feature: FeatureRef, event: ThreeEvent<PointerEvent>) {
        if (event.nativeEvent.button !== 0) return;
        event.stopPropagation();
        setEditor(select(editorRef.current, feature));
        press.current = { x: event.nativeEvent.clientX, y: event.nativeEvent.clientY, feature };
        stageApi.current?.setNavigation(false);
        frozenSolve.current = solveRef.current;
        setDragging(true);
      },
    }),
    [setEditor],
  );

  // The path of a curve being drawn, joined along the mesh by the worker.
  useEffect(() => {
    const client = clientRef.current;
    if (!client || draft.length < 2 || (tool !== 'parting' && tool !== 'crest')) {
      setDraftPath(null);
      return;
    }
    client
      .latest('draft', 0, { type: 'curve-path', points: draft, closed: toolOptions.closed })
      .then((path) => {
        if (path !== SUPERSEDED) setDraftPath(path.points);
      })
      .catch((error: unknown) => setNotice(error instanceof Error ? error.message : 'That path cannot be drawn.'));
  }, [draft, tool, toolOptions.closed]);

  const chooseTool = useCallback(
    (next: Tool) => {
      if (draftRef.current.length > 0) finishDraft();
      setTool(next);
      setNotice(null);
    },
    [finishDraft],
  );

  // ── keyboard ────────────────────────────────────────────────────────────────────────────
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      const mod = event.ctrlKey || event.metaKey;
      if (mod && event.key.toLowerCase() === 'z' && !isTyping(event.target)) {
        event.preventDefault();
        if (event.shiftKey) doRedo();
        else doUndo();
        return;
      }
      if (mod && event.key.toLowerCase() === 'y' && !isTyping(event.target)) {
        event.preventDefault();
        doRedo();
        return;
      }
      if (isTyping(event.target) || mod || event.altKey) return;
      if (event.key === 'Escape') {
        setDraft([]);
        setDraftPath(null);
        setTool('look');
      } else if (event.key === 'Enter' && draftRef.current.length > 0) {
        finishDraft();
      } else if ((event.key === 'Delete' || event.key === 'Backspace') && editorRef.current.selection) {
        const selection = editorRef.current.selection;
        if (featureExists(editorRef.current.present.spec, selection)) actions.edit({ type: 'remove', feature: selection });
      } else if (event.key === 'Home') {
        stageApi.current?.frameAll();
      } else {
        const shortcut = TOOLS.find((t) => t.key.toLowerCase() === event.key.toLowerCase());
        if (shortcut) chooseTool(shortcut.id);
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [actions, chooseTool, doRedo, doUndo, finishDraft]);

  const cardRef = useRef<HTMLDivElement | null>(null);
  const selectedPoint = useMemo(() => {
    const selection = editor.selection;
    if (!surface || !selection || (selection.kind !== 'singularity' && selection.kind !== 'pin')) return null;
    return markerPlace(surface, spec, solve, selection)?.point ?? null;
  }, [editor.selection, solve, spec, surface]);

  // ── what the panels show ────────────────────────────────────────────────────────────────
  const errorFeature = solve?.error?.path ? featureOfPath(solve.error.path) : null;
  const fieldError = solve?.error ?? null;
  const drawing = solve?.lines ? { lines: solve.lines, shade: solve.lineShade } : lastDrawing;
  const guidesCurrent = guides?.key === guideKey;

  const versionsApi = useMemo(
    () =>
      persistence && {
        groomId: persistence.groomId,
        flush: () => saverRef.current?.flush() ?? Promise.resolve(true),
        adopt: (restored: GroomSpec, revision: number, label: string) => {
          saverRef.current?.adopt(restored, revision);
          setEditor(applyEdit(editorRef.current, { type: 'replace', spec: restored, label }, restored));
        },
      },
    [persistence, setEditor],
  );

  return (
    <div className="flex flex-col gap-3" style={{ width: 'calc(100vw - 2rem)', marginLeft: 'calc(50% - 50vw + 1rem)' }} data-testid="groom-editor">
      <header className="flex flex-wrap items-center gap-x-6 gap-y-2 rounded-2xl bg-vellum px-4 py-3">
        <div className="min-w-0 flex-1">
          <h1 className="truncate text-2xl font-extrabold tracking-tight">{title}</h1>
          <p className="truncate text-sm text-loam-soft">{subtitle}</p>
        </div>
        <SaveStatusLine status={saveStatus} practice={!persistence} onRetry={() => saverRef.current?.retry()} onKeepMine={() => saverRef.current?.keepMine()} />
        <div className="flex gap-2" role="group" aria-label="History">
          <button type="button" onClick={doUndo} disabled={!canUndo(editor)} title={undoLabel(editor) ? `Undo: ${undoLabel(editor)} (Ctrl+Z)` : 'Nothing to undo'} className="rounded-full border-2 border-tarn/30 px-4 py-1.5 text-sm font-semibold text-tarn hover:border-tarn disabled:opacity-40">
            Undo
          </button>
          <button type="button" onClick={doRedo} disabled={!canRedo(editor)} title={redoLabel(editor) ? `Redo: ${redoLabel(editor)} (Ctrl+Shift+Z)` : 'Nothing to redo'} className="rounded-full border-2 border-tarn/30 px-4 py-1.5 text-sm font-semibold text-tarn hover:border-tarn disabled:opacity-40">
            Redo
          </button>
        </div>
        <p className="sr-only" aria-live="polite">
          {undoLabel(editor) ? `Last change: ${undoLabel(editor)}` : ''}
        </p>
      </header>

      <div className="grid min-h-[620px] gap-3 lg:grid-cols-[minmax(0,1fr)_26rem]" style={{ height: 'calc(100vh - 12rem)' }}>
        <section aria-label="Surface view" className="relative min-h-[420px] overflow-hidden rounded-2xl bg-tarn-deep">
          {surface ? (
            <Stage label={`The growth surface with the field${showGuides ? ' and guides' : ''}`} center={surface.center} radius={surface.radius} upAxis={spec.upAxis} apiRef={stageApi} pickTarget={meshRef}>
              <EditorScene
                surface={surface}
                spec={spec}
                solve={solve}
                fieldLines={drawing?.lines ?? null}
                fieldShade={drawing?.shade ?? null}
                fieldFaded={!solve?.lines}
                guides={guides?.grown ?? null}
                guidesFaded={!guidesCurrent}
                showGuides={showGuides && !dragging}
                selection={editor.selection}
                draft={draft}
                draftPath={draftPath}
                meshRef={meshRef}
                handlers={markerHandlers}
                pointer={pointer}
                onFieldDrawn={onFieldDrawn}
              />
              <ScreenAnchor point={selectedPoint} element={cardRef} />
            </Stage>
          ) : null}
          {surface && !dragging && <MarkerCard spec={spec} feature={editor.selection} actions={actions} element={cardRef} />}
          {surface && <ToolRail tool={tool} onTool={chooseTool} options={toolOptions} onOptions={setToolOptions} order={spec.field.order} draftLength={draft.length} onFinish={finishDraft} onCancel={() => (setDraft([]), setDraftPath(null))} onFrameAll={() => stageApi.current?.frameAll()} />}
          {(task || (!surface && !openError)) && (
            <div className="absolute inset-0 flex items-center justify-center p-8">
              <div className="w-full max-w-md rounded-2xl bg-tarn/90 p-5 shadow-xl" data-testid="opening-progress">
                <ProgressBar tone="dark" label={task ? capitaliseFirst(task.progress.stage) : 'Starting the field worker'} fraction={task?.progress.fraction ?? null} expectedMilliseconds={task?.progress.expectedMilliseconds} startedAt={task?.startedAt} />
              </div>
            </div>
          )}
          {openError && (
            <div className="absolute inset-0 flex items-center justify-center p-8">
              <div role="alert" className="max-w-lg rounded-2xl border-l-4 border-hawthorn bg-hawthorn-pale p-5 text-hawthorn">
                <p className="font-bold">The surface could not be opened.</p>
                <p className="text-sm">{openError}</p>
              </div>
            </div>
          )}
          {fieldError && surface && (
            <div role="alert" className="absolute inset-x-3 top-3 z-10 ml-auto max-w-xl rounded-xl border-l-4 border-hawthorn bg-hawthorn-pale/95 px-4 py-2.5 text-sm text-hawthorn shadow" data-testid="field-error">
              <strong>The field cannot be solved as placed{errorFeature && featureExists(spec, errorFeature) ? ` (${featureLabel(spec, errorFeature)})` : ''}.</strong> {fieldError.message}
            </div>
          )}
          {notice && (
            <div role="status" className="absolute bottom-16 left-1/2 z-10 flex max-w-lg -translate-x-1/2 items-start gap-3 rounded-xl bg-chalk px-4 py-2.5 text-sm text-loam shadow-lg">
              <span>{notice}</span>
              <button type="button" className="font-semibold text-tarn underline" onClick={() => setNotice(null)}>
                Close
              </button>
            </div>
          )}
          {surface && guideTask && showGuides && (
            <div className="absolute bottom-3 right-3 w-72 rounded-xl bg-tarn/90 p-3 shadow" data-testid="guide-progress">
              <ProgressBar tone="dark" label={capitaliseFirst(guideTask.progress.stage)} fraction={guideTask.progress.fraction} expectedMilliseconds={guideTask.progress.expectedMilliseconds} startedAt={guideTask.startedAt} />
            </div>
          )}
        </section>

        <aside aria-label="Groom" className="flex min-h-0 flex-col gap-3 overflow-hidden">
          <BudgetCard
            spec={spec}
            surface={surface}
            solve={solve}
            placing={tool === 'remainder'}
            onPlaceRemainder={() => chooseTool('remainder')}
            onPlaceRemainderAtCentre={() => {
              const opened = surfaceRef.current;
              const hit = stageApi.current?.pickAt(0.5, 0.5);
              if (!opened) return;
              setTool('remainder');
              toolRef.current = 'remainder';
              placeAt(hit ? nearestCorner(opened.positions, opened.triangles, hit.face, hit.point) : 0);
            }}
          />
          <div role="tablist" aria-label="Panels" className="flex flex-wrap gap-1 rounded-2xl bg-vellum p-1">
            {(
              [
                ['features', 'Features'],
                ['guides', 'Guides'],
                ['field', 'Field & view'],
                ...(persistence ? ([['versions', 'Versions'], ['export', 'Export']] as const) : []),
              ] as const
            ).map(([id, label]) => (
              <button
                key={id}
                type="button"
                role="tab"
                id={`tab-${id}`}
                aria-selected={tab === id}
                aria-controls={`panel-${id}`}
                onClick={() => setTab(id)}
                className={`flex-1 rounded-xl px-2.5 py-1.5 text-sm font-semibold ${tab === id ? 'bg-tarn text-chalk' : 'text-tarn hover:bg-chalk'}`}
              >
                {label}
              </button>
            ))}
          </div>
          <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`} className="min-h-0 flex-1 overflow-y-auto rounded-2xl bg-vellum/60 p-3">
            {tab === 'features' && <FeatureList spec={dragging && editor.gestureBase ? editor.gestureBase.spec : spec} selection={editor.selection} solve={dragging ? frozenSolve.current : solve} errorFeature={errorFeature} errorMessage={fieldError?.message ?? null} actions={actions} />}
            {tab === 'guides' && (
              <GuidePanel
                spec={spec}
                groups={surface?.groups ?? []}
                actions={actions}
                guides={guides?.grown ?? null}
                current={guidesCurrent}
                error={guideError}
                show={showGuides}
                onShow={setShowGuides}
              />
            )}
            {tab === 'field' && <FieldPanel spec={spec} surface={surface} actions={actions} display={display} onDisplay={setDisplay} />}
            {tab === 'versions' && versionsApi && <VersionPanel api={versionsApi} initial={persistence!.versions} />}
            {tab === 'export' && versionsApi && <ExportPanel groomId={versionsApi.groomId} flush={versionsApi.flush} />}
          </div>
        </aside>
      </div>
    </div>
  );
}

function capitaliseFirst(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function vertexPoint(surface: OpenedSurface, vertex: number): Vec3 {
  const p = surface.positions;
  return roundPoint([p[3 * vertex], p[3 * vertex + 1], p[3 * vertex + 2]]);
}

/** The edit that moves a feature to a point (a place by file vertex becomes a place by point). */
function moveEdit(spec: GroomSpec, feature: FeatureRef, point: Vec3): SpecEdit | null {
  if (feature.kind === 'singularity') {
    const s = spec.field.singularities[feature.index];
    if (!s) return null;
    const { vertex: _vertex, ...rest } = s;
    return { type: 'update-singularity', index: feature.index, singularity: { ...rest, point }, moved: true };
  }
  if (feature.kind === 'pin') {
    const pin = spec.pins[feature.index];
    if (!pin) return null;
    const { vertex: _vertex, ...rest } = pin;
    return { type: 'update-pin', index: feature.index, pin: { ...rest, point }, moved: true };
  }
  return null;
}

/** Where the view should look to show a feature. */
function markerPlace(surface: OpenedSurface, spec: GroomSpec, solve: SolveReport | null, feature: FeatureRef): { point: [number, number, number]; normal: [number, number, number] } | null {
  switch (feature.kind) {
    case 'singularity':
      return placeOnSurface(surface, solve?.singularities.length === spec.field.singularities.length ? solve.singularities[feature.index]?.vertex : undefined, spec.field.singularities[feature.index]?.point);
    case 'pin':
      return placeOnSurface(surface, solve?.pinVertices.length === spec.pins.length ? solve.pinVertices[feature.index] : undefined, spec.pins[feature.index]?.point);
    case 'parting':
    case 'crest': {
      const curve = (feature.kind === 'parting' ? spec.field.partings : spec.field.crests)[feature.index];
      const points = curve?.points;
      return points ? placeOnSurface(surface, undefined, points[Math.floor(points.length / 2)]) : null;
    }
    case 'stroke': {
      const points = spec.field.strokes[feature.index]?.points;
      return points ? placeOnSurface(surface, undefined, points[Math.floor(points.length / 2)]) : null;
    }
  }
}
