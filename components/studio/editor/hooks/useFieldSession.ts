'use client';
// The editor's field worker: started with the page, the surface opened once (with progress), the
// field solved again on every change of the spec or the display (quickly while a drag runs), and
// the moments a groomer waits on marked for the browser benchmarks.
import { useCallback, useEffect, useRef, useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { askOf, markFieldDrawn } from '@/lib/studio/client/drag-timing';
import { SUPERSEDED, WorkerFailure, startFieldWorker, type FieldClient } from '@/lib/studio/client/field-client';
import { endStage, enterStage, stageOfReport, type OpeningStages } from '@/lib/studio/client/opening-stages';
import { solvePart, type DisplayOptions, type OpenedSurface, type SolveReport, type SurfacePreview, type SurfaceSource } from '@/lib/studio/client/protocol';
import { useLatest } from './useLiveState';
import { useTask, type Task } from './useTask';

export interface FieldSession {
  readonly client: FieldClient | null;
  readonly surface: OpenedSurface | null;
  /** The surface as read, to draw while it is prepared (null once `surface` is there, or before it is read). */
  readonly preview: SurfacePreview | null;
  /** The opening's stages (download, read, prepare, first solve), until the first solve has come. */
  readonly stages: OpeningStages;
  readonly openError: string | null;
  /** The opening of the surface while it runs. */
  readonly task: Task | null;
  readonly solve: SolveReport | null;
  /** The spec `solve` was solved for (while a marker is dragged, the one the stage shows). */
  readonly solvedSpec: GroomSpec | null;
  /** The newest field drawing: the last solve's, or the one before while a solve brings none. */
  readonly drawing: { readonly lines: Float32Array; readonly shade: Float32Array | null } | null;
  /** For the stage to call when it has drawn the field. */
  readonly onFieldDrawn: () => void;
  /** For the stage to call when it has drawn the surface (its preview or the prepared surface). */
  readonly onSurfaceDrawn: () => void;
  /**
   * Asks at once for the quick solve of a spec a dragged marker just made, from the pointer's own
   * handler: the request reaches the worker before the page renders or draws anything for the
   * move, instead of after (the render that follows sends nothing more for the same spec).
   */
  readonly solveNow: (spec: GroomSpec) => void;
}

/** A field drawing with the drag ask it answers (null when no drag asked for it). */
interface Shown {
  readonly lines: Float32Array;
  readonly shade: Float32Array | null;
  readonly ask: number | null;
  readonly quick: boolean;
}

/**
 * Runs the worker for one page. `onFailure` hears a solve that failed for a reason other than the
 * page closing; a spec that cannot be solved is no failure (its reason is in `solve.error`).
 */
export function useFieldSession({ source, initialSpec, spec, display, quick, onFailure }: {
  source: SurfaceSource;
  initialSpec: GroomSpec;
  spec: GroomSpec;
  display: DisplayOptions;
  quick: boolean;
  onFailure: (message: string) => void;
}): FieldSession {
  const [client, setClient] = useState<FieldClient | null>(null);
  const [surface, setSurface] = useState<OpenedSurface | null>(null);
  const [preview, setPreview] = useState<SurfacePreview | null>(null);
  const [stages, setStages] = useState<OpeningStages>({});
  const [openError, setOpenError] = useState<string | null>(null);
  const [task, reportOpening, clearOpening] = useTask();
  const [solve, setSolve] = useState<SolveReport | null>(null);
  const [lastDrawing, setLastDrawing] = useState<Shown | null>(null);
  /** The spec and the drag ask (drag-timing.ts) each report answers. */
  const askOfReport = useRef(new WeakMap<SolveReport, number | null>());
  const specOfReport = useRef(new WeakMap<SolveReport, GroomSpec>());
  const failure = useLatest(onFailure);
  const firstDisplay = useLatest(display);

  // What was last sent, so that a render with nothing new sends nothing; and the first solve's mark.
  const sent = useRef<{ spec: GroomSpec; display: DisplayOptions; quick: boolean } | null>(null);
  const solvedOnce = useRef(false);
  const requestSolve = useCallback(
    (worker: FieldClient, next: GroomSpec, shown: DisplayOptions, fast: boolean) => {
      const last = sent.current;
      if (last && last.spec === next && last.display === shown && last.quick === fast) return;
      sent.current = { spec: next, display: shown, quick: fast };
      const ask = askOf(next);
      worker
        .latest('field', 0, { type: 'solve', spec: solvePart(next), display: shown, quick: fast })
        .then((report) => {
          if (report === SUPERSEDED) return;
          performance.mark('whorlwind:solved', { detail: { milliseconds: report.milliseconds, quick: report.quick, ask, stages: report.stages } });
          if (!solvedOnce.current) {
            solvedOnce.current = true;
            performance.mark('whorlwind:first-solve', { detail: { milliseconds: report.milliseconds } });
            setStages((now) => endStage(now, 'solve', performance.now()));
          }
          askOfReport.current.set(report, ask);
          specOfReport.current.set(report, next);
          setSolve(report);
          if (report.lines) setLastDrawing({ lines: report.lines, shade: report.lineShade, ask, quick: report.quick });
        })
        .catch((error: unknown) => {
          if (error instanceof WorkerFailure && (error.error.code === 'closed' || error.error.code === 'no-surface')) return;
          failure.current(error instanceof Error ? error.message : 'The field could not be solved.');
        });
    },
    [failure],
  );

  useEffect(() => {
    performance.mark('whorlwind:editor-mounted');
    // The worker the page's inline script started (with this opening already under way), when there is one.
    const worker = startFieldWorker({ adoptEarly: true });
    setClient(worker);
    if (performance.getEntriesByName('whorlwind:worker-starting').length === 0) performance.mark('whorlwind:worker-starting');
    let heard = false;
    const opening = worker.open({ type: 'open', source, boundary: initialSpec.field.boundary }, (progress) => {
      // The worker's first word: its code is loaded and it has started on the surface.
      if (!heard) performance.mark('whorlwind:worker-working');
      heard = true;
      if (progress.preview) {
        // The surface as read: drawn at once, while the solver is prepared.
        performance.mark('whorlwind:surface-read');
        setPreview(progress.preview);
        return;
      }
      const stage = stageOfReport(progress.stage);
      // The worker's own time of the report: an opening the page's inline script started is replayed late.
      const at = progress.at !== undefined ? Math.min(performance.now(), progress.at - performance.timeOrigin) : performance.now();
      if (stage) setStages((now) => enterStage(now, stage, at));
      reportOpening(progress);
    });
    // The first solve waits in the worker right behind the opening, so it runs while this page
    // builds its own copy of the surface for drawing.
    sent.current = null;
    requestSolve(worker, initialSpec, firstDisplay.current, false);
    opening
      .then((opened) => {
        performance.mark('whorlwind:surface-opened', { detail: opened.timings });
        setSurface(opened);
        setPreview(null);
        if (!solvedOnce.current) setStages((now) => enterStage(now, 'solve', performance.now()));
        clearOpening();
      })
      .catch((error: unknown) => {
        if (error instanceof WorkerFailure && error.error.code === 'closed') return;
        clearOpening();
        setOpenError(error instanceof Error ? error.message : 'The surface could not be opened.');
      });
    return () => {
      worker.terminate();
      setClient(null);
    };
  }, [clearOpening, firstDisplay, initialSpec, reportOpening, requestSolve, source]);

  useEffect(() => {
    if (surface && client) requestSolve(client, spec, display, quick);
  }, [client, display, quick, requestSolve, spec, surface]);

  const live = useLatest({ client, surface, display });
  const solveNow = useCallback(
    (next: GroomSpec) => {
      const { client: worker, surface: opened, display: shown } = live.current;
      if (worker && opened) requestSolve(worker, next, shown, true);
    },
    [live, requestSolve],
  );

  const drawing: Shown | null = solve?.lines ? { lines: solve.lines, shade: solve.lineShade, ask: askOfReport.current.get(solve) ?? null, quick: solve.quick } : lastDrawing;
  // The drawing of this render is the one the stage's next "drawn" call is about.
  const shown = useRef(drawing);
  shown.current = drawing;
  const drawnCount = useRef(0);
  const onFieldDrawn = useCallback(() => {
    markFieldDrawn(shown.current?.ask ?? null, shown.current?.quick ?? false);
    if (drawnCount.current++ === 0) performance.mark('whorlwind:first-field');
  }, []);
  const surfaceDrawn = useRef(false);
  const onSurfaceDrawn = useCallback(() => {
    if (surfaceDrawn.current) return;
    surfaceDrawn.current = true;
    performance.mark('whorlwind:surface-shown');
  }, []);

  return { client, surface, preview, stages, openError, task, solve, solvedSpec: solve ? (specOfReport.current.get(solve) ?? null) : null, drawing, onFieldDrawn, onSurfaceDrawn, solveNow };
}
