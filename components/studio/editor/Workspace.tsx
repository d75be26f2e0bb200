'use client';
// The groom editor: the stage with the surface, field, guides and features; the tools that place
// and draw on it; the side list where every feature is also a set of numbers; the index budget and
// the measured indices always in view; undo and redo; autosave, versions and exports. Every solve
// runs in the field worker, so the page stays responsive while the field follows each edit. This
// file only wires the hooks (hooks/) and panels together; the tools are in lib/studio/client/tools.
import { useCallback, useMemo, useRef, useState } from 'react';
import type { Mesh } from 'three';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { applyEdit, createEditorState, redo, undo } from '@/lib/studio/client/editor-state';
import { featureExists, featureOfPath } from '@/lib/studio/client/features';
import { prewarmFieldWorker } from '@/lib/studio/client/field-client';
import { takeMark } from '@/lib/studio/client/grain-marks';
import { featurePlace } from '@/lib/studio/client/marker-places';
import { codedOf, decodeTarget, defaultBrush, type BrushOptions, type PaintTarget } from '@/lib/studio/client/paint';
import type { DisplayOptions, OpenedSurface, RootsSource, SurfaceSource } from '@/lib/studio/client/protocol';
import { toolOfKey, type ToolOptions } from '@/lib/studio/client/tools';
import { Stage, type StageApi } from '../scene/Stage';
import { SurfaceMesh } from '../scene/SurfaceMesh';
import { BudgetCard } from './BudgetCard';
import { EditorHeader } from './EditorHeader';
import { EditorScene } from './EditorScene';
import { ExportPanel } from './ExportPanel';
import { FeatureList } from './FeatureList';
import { FieldPanel } from './FieldPanel';
import { GrainPanel } from './GrainPanel';
import { GuidePanel } from './GuidePanel';
import { MarkerCard, ScreenAnchor } from './MarkerCard';
import { PanelTabs, type PanelTab } from './PanelTabs';
import { StageMessages } from './StageMessages';
import { TintsPanel } from './TintsPanel';
import { SurfaceMovePanel } from './SurfaceMovePanel';
import { ToolRail } from './ToolRail';
import { TwinSidesPanel } from './TwinSidesPanel';
import { VersionPanel } from './VersionPanel';
import { useAutosave, type Persistence } from './hooks/useAutosave';
import { useDraftPath } from './hooks/useDraftPath';
import { useEditorActions } from './hooks/useEditorActions';
import { useFieldSession } from './hooks/useFieldSession';
import { useGrain } from './hooks/useGrain';
import { useGuides } from './hooks/useGuides';
import { useLiveState } from './hooks/useLiveState';
import { useShortcuts } from './hooks/useShortcuts';
import { useToolDriver, type ToolDriver } from './hooks/useToolDriver';
import { useTwinSurface } from './hooks/useTwinSurface';
import { useSteadyFrame } from './hooks/useSteadyFrame';
import { useDrawnSurface } from './hooks/useDrawnSurface';

// The field worker's code starts loading as soon as the editor's code runs, before the page is
// hydrated: it is the longest wait before the surface can be opened.
prewarmFieldWorker();

export function Workspace({ title, subtitle, source, rootsFrom, initialSpec, persistence }: { title: string; subtitle: string; source: SurfaceSource; rootsFrom?: RootsSource; initialSpec: GroomSpec; persistence: Persistence | null }) {
  const [editor, getEditor, setEditor] = useLiveState(() => createEditorState(initialSpec));
  const spec = editor.present.spec;
  const gesture = editor.gestureBase !== null;
  const stage = useRef<StageApi | null>(null);
  const meshRef = useRef<Mesh | null>(null);
  const cardRef = useRef<HTMLDivElement | null>(null);
  const [display, setDisplay] = useState<DisplayOptions>({ drawing: 'strokes', density: 5000 });
  const [showGuides, setShowGuides] = useState(true);
  const [toolOptions, setToolOptions] = useState<ToolOptions>({ index: 2, attribute: 'length', value: 1.5, closed: false });
  const [tab, setTab] = useState<PanelTab>('features');
  const [notice, setNotice] = useState<string | null>(null);

  const field = useFieldSession({ source, initialSpec, spec, display, quick: gesture, onFailure: setNotice });
  const { surface, solve } = field;
  // What the stage frames: the prepared surface, or the surface as read while it is prepared (the
  // same centre and radius, so the view does not jump when the prepared surface replaces it).
  const view = useSteadyFrame(surface ?? field.preview);
  // One geometry for both: the prepared surface replaces the surface as read without being drawn anew.
  const surfaceShape = useDrawnSurface(field.preview, surface);
  const actions = useEditorActions({ getEditor, setEditor, surface, solve, stage, onAdded: () => setTab('features') });
  useTwinSurface({ client: field.client, surface, on: !!spec.symmetry, getEditor, setEditor, onFailure: setNotice });
  // The brush starts eight mean edges across once the surface is open; the groomer's choices are kept in the tool options.
  const brush = useMemo(() => toolOptions.brush ?? (surface ? defaultBrush(surface.meanEdge) : null), [surface, toolOptions.brush]);
  const options = useMemo(() => (brush && !toolOptions.brush ? { ...toolOptions, brush } : toolOptions), [brush, toolOptions]);
  const setBrush = useCallback((next: BrushOptions) => setToolOptions((old) => ({ ...old, brush: next })), []);
  const tools = useToolDriver({ getEditor, setEditor, surface, solve, options, stage, onNotice: setNotice, onDragMove: field.solveNow });
  const tint = useTintView(surface, spec, tools.tool === 'tint' ? (brush?.paints ?? null) : null, tools.painting);
  const dragging = tools.dragging !== null;
  const guides = useGuides({ client: field.client, surface, spec, rootsFrom, show: showGuides, paused: dragging });
  const draftPath = useDraftPath({ client: field.client, points: tools.draft, joined: tools.joinsDraft, closed: toolOptions.closed, onFailure: setNotice });
  const autosave = useAutosave(persistence, initialSpec, spec, !gesture);
  const grain = useGrain({ client: field.client, spec });

  const doUndo = useCallback(() => setEditor(undo(getEditor())), [getEditor, setEditor]);
  const doRedo = useCallback(() => setEditor(redo(getEditor())), [getEditor, setEditor]);
  useShortcuts({
    undo: doUndo,
    redo: doRedo,
    onKey(key) {
      if (tools.key(key)) return;
      const selection = getEditor().selection;
      if ((key === 'Delete' || key === 'Backspace') && selection) {
        if (featureExists(getEditor().present.spec, selection)) actions.edit({ type: 'remove', feature: selection });
      } else if (key === 'Home') {
        stage.current?.frameAll();
      } else {
        const shortcut = toolOfKey(key);
        if (shortcut) tools.choose(shortcut.id);
      }
    },
  });

  const selectedPoint = useMemo(() => {
    const selection = editor.selection;
    if (!surface || !selection || (selection.kind !== 'singularity' && selection.kind !== 'pin')) return null;
    return featurePlace(surface, spec, solve, selection)?.point ?? null;
  }, [editor.selection, solve, spec, surface]);

  const { flush: flushSaves, adopt: adoptSaved } = autosave;
  const versionsApi = useMemo(
    () =>
      persistence && {
        groomId: persistence.groomId,
        surfaceId: persistence.surfaceId,
        flush: flushSaves,
        adopt: (restored: GroomSpec, revision: number, label: string) => {
          adoptSaved(restored, revision);
          setEditor(applyEdit(getEditor(), { type: 'replace', spec: restored, label }, restored));
        },
      },
    [adoptSaved, flushSaves, getEditor, persistence, setEditor],
  );

  const errorFeature = solve?.error?.path ? featureOfPath(solve.error.path) : null;
  const fieldError = solve?.error ?? null;

  return (
    <div className="flex flex-col gap-3" style={{ width: 'calc(100vw - 2rem)', marginLeft: 'calc(50% - 50vw + 1rem)' }} data-testid="groom-editor">
      <EditorHeader title={title} subtitle={subtitle} editor={editor} autosave={autosave} practice={!persistence} onUndo={doUndo} onRedo={doRedo} />

      <div className="grid min-h-[620px] gap-3 lg:grid-cols-[minmax(0,1fr)_26rem]" style={{ height: 'calc(100vh - 12rem)' }}>
        <section aria-label="Surface view" className="relative min-h-[420px] overflow-hidden rounded-2xl bg-tarn-deep">
          {view ? (
            <Stage label={surface ? `The growth surface with the field${showGuides ? ' and guides' : ''}` : 'The growth surface, while the field solver is prepared'} center={view.center} radius={view.radius} upAxis={spec.upAxis} apiRef={stage} pickTarget={meshRef} lighter={dragging}>
              {!surface && field.preview && surfaceShape && <SurfaceMesh positions={field.preview.positions} triangles={field.preview.triangles} geometry={surfaceShape} onDrawn={field.onSurfaceDrawn} />}
              {surface && <EditorScene
                surface={surface}
                surfaceGeometry={surfaceShape ?? undefined}
                // While a marker is dragged the stage shows the spec of the field it draws: the
                // marker moves with its field, and a pointer move alone draws no frame (each one
                // costs the software renderer as much as a field update, on the worker's cores).
                spec={dragging && field.solvedSpec ? field.solvedSpec : spec}
                solve={solve}
                fieldLines={field.drawing?.lines ?? null}
                fieldShade={field.drawing?.shade ?? null}
                fieldFaded={!solve?.lines}
                guides={guides.grown}
                guidesFaded={!guides.current}
                showGuides={showGuides && !dragging}
                selection={editor.selection}
                draft={tools.draft}
                draftPath={draftPath}
                meshRef={meshRef}
                handlers={tools.markers}
                pointer={tools.pointer}
                onFieldDrawn={field.onFieldDrawn}
                tint={tint}
                grainMarks={grain.left}
                onTakeMark={(mark) => {
                  const refused = actions.edit(takeMark(mark));
                  if (refused) setNotice(refused);
                }}
                onSurfaceDrawn={field.onSurfaceDrawn}
              />}
              <ScreenAnchor point={selectedPoint} element={cardRef} />
            </Stage>
          ) : null}
          {surface && !dragging && <MarkerCard spec={spec} feature={editor.selection} actions={actions} element={cardRef} onNotice={setNotice} />}
          {surface && <ToolRail tool={tools.tool} onTool={tools.choose} options={options} onOptions={setToolOptions} order={spec.field.order} draftLength={tools.draft.length} onFinish={tools.finishDraft} onCancel={tools.discardDraft} onFrameAll={() => stage.current?.frameAll()} />}
          <StageMessages
            opened={!!surface}
            previewed={!!field.preview}
            solved={!!solve}
            stages={field.stages}
            opening={field.task}
            openError={field.openError}
            fieldError={fieldError}
            staleDrawing={!!field.drawing && !solve?.lines}
            errorFeature={errorFeature}
            spec={spec}
            notice={notice}
            onCloseNotice={() => setNotice(null)}
            guideTask={showGuides ? guides.task : null}
          />
        </section>

        <aside aria-label="Groom" className="flex min-h-0 flex-col gap-3 overflow-hidden">
          <BudgetCard spec={spec} surface={surface} solve={solve} placing={tools.tool === 'remainder'} onPlaceRemainder={() => tools.choose('remainder')} onPlaceRemainderAtCentre={tools.placeRemainderAtCentre} />
          <PanelTabs tab={tab} onTab={setTab} saved={!!persistence}>
            {tab === 'features' && (
              <div className="flex flex-col gap-3">
                {surface && <TwinSidesPanel spec={spec} client={field.client} actions={actions} />}
                <FeatureList
                  spec={dragging && editor.gestureBase ? editor.gestureBase.spec : spec}
                  selection={editor.selection}
                  solve={tools.dragging ? tools.dragging.solveBefore : solve}
                  errorFeature={errorFeature}
                  errorMessage={fieldError?.message ?? null}
                  actions={actions}
                />
              </div>
            )}
            {tab === 'guides' && (
              <div className="flex flex-col gap-3">
                <GuidePanel spec={spec} groups={surface?.groups ?? []} actions={actions} guides={guides.grown} current={guides.current} error={guides.error} show={showGuides} onShow={setShowGuides} surfaceId={persistence?.surfaceId} />
                <TintsPanel spec={spec} surface={surface} actions={actions} brush={brush} onBrush={setBrush} onPaint={() => tools.choose('tint')} />
              </div>
            )}
            {tab === 'field' && (
              <div className="flex flex-col gap-5">
                {surface && <GrainPanel spec={spec} grain={grain} actions={actions} onLookAt={(mark) => stage.current?.lookAt(mark.point, mark.normal)} />}
                <FieldPanel spec={spec} surface={surface} actions={actions} display={display} onDisplay={setDisplay} />
              </div>
            )}
            {tab === 'versions' && versionsApi && persistence && <VersionPanel api={versionsApi} initial={persistence.versions} />}
            {tab === 'export' && versionsApi && <ExportPanel groomId={versionsApi.groomId} flush={versionsApi.flush} />}
            {tab === 'surface' && versionsApi && persistence?.surfaceId && (
              <SurfaceMovePanel groomId={versionsApi.groomId} surfaceId={persistence.surfaceId} maxUploadBytes={persistence.maxUploadBytes ?? 0} flush={versionsApi.flush} groomSurface={surface} upAxis={spec.upAxis} />
            )}
          </PanelTabs>
        </aside>
      </div>
    </div>
  );
}

/**
 * What the stage tints the surface with: the stroke being dragged (its values, changed in place),
 * else the picked map or mask as the spec holds it (decoded once per change of its coded values),
 * else nothing.
 */
function useTintView(surface: OpenedSurface | null, spec: GroomSpec, paints: PaintTarget | null, painting: ToolDriver['painting']) {
  const found = paints ? codedOf(spec, paints) : undefined;
  const coded = found?.coded;
  const saved = useMemo(() => {
    if (!surface || !paints) return null;
    try {
      return decodeTarget(coded ? { coded, path: '' } : undefined, paints.kind, { positions: surface.positions, triangles: surface.triangles });
    } catch {
      return null;
    }
  }, [surface, coded, paints]);
  if (painting) return { values: painting.values, kind: painting.target.kind, version: painting.dabs };
  return paints && saved ? { values: saved, kind: paints.kind, version: -1 } : null;
}
