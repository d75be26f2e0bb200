// The active tool of an editor and a marker being dragged, as one plain value. Pressing a marker
// picks it and dragging moves it, with any tool but those that draw lines (so a marker can be
// moved without leaving the whorl tool); everything else goes to the active tool. Each step returns the next session and
// the changes for the editor state, which `applyChanges` carries out.
import { applyCheckedEdit, endGesture, previewEdit, select, type EditorState } from '../editor-state';
import type { FeatureRef, Vec3 } from '../features';
import { moveFeature } from '../spec-edits';
import { TOOLS } from './index';
import type { EditorChange, SurfaceHit, ToolContext, ToolId, ToolStep } from './tool';

/** A marker held by the pointer: the feature, and the vertex it was last moved to. */
export interface MarkerDrag {
  readonly feature: FeatureRef;
  readonly vertex: number | null;
}

export interface ToolSession {
  readonly tool: ToolId;
  readonly state: unknown;
  readonly drag: MarkerDrag | null;
}

export interface SessionStep {
  readonly session: ToolSession;
  readonly changes: readonly EditorChange[];
  /** Words to show the groomer; null clears what is shown, undefined leaves it. */
  readonly notice?: string | null;
}

export function startSession(tool: ToolId = 'look'): ToolSession {
  return { tool, state: TOOLS[tool].enter(), drag: null };
}

/** Goes on with another tool: the active one finishes or drops what it holds first. */
function switchTo(session: ToolSession, next: ToolId, context: ToolContext): SessionStep {
  const left = TOOLS[session.tool].exit(session.state, context);
  return { session: { ...session, tool: next, state: TOOLS[next].enter() }, changes: left.changes ?? [], notice: left.notice };
}

/** A step of the active tool, with the switch it asks for. */
function follow(session: ToolSession, step: ToolStep<unknown>, context: ToolContext): SessionStep {
  const moved: SessionStep = { session: step.state === session.state ? session : { ...session, state: step.state }, changes: step.changes ?? [], notice: step.notice };
  if (!step.then) return moved;
  const switched = switchTo(moved.session, step.then, context);
  return { session: switched.session, changes: [...moved.changes, ...switched.changes], notice: moved.notice ?? switched.notice };
}

/** The groomer picks a tool (again, if it is the active one: what it holds is finished). Any notice is cleared. */
export function chooseTool(session: ToolSession, tool: ToolId, context: ToolContext): SessionStep {
  const step = switchTo(session, tool, context);
  return { ...step, notice: step.notice ?? null };
}

/**
 * A marker pressed: it is selected, and the pointer holds it until let go — except with a tool
 * that draws lines, which says how to go on instead.
 */
export function pressMarker(session: ToolSession, feature: FeatureRef): SessionStep {
  if (session.drag) return { session, changes: [] };
  const tool = TOOLS[session.tool];
  if (!tool.picksMarkers) {
    return { session, changes: [], notice: `${tool.label} draws on the surface: click beside the marker. To pick a marker, use Turn & pick.` };
  }
  return { session: { ...session, drag: { feature, vertex: null } }, changes: [{ type: 'select', feature }] };
}

export function pointerDown(session: ToolSession, hit: SurfaceHit, context: ToolContext): SessionStep {
  if (session.drag) return { session, changes: [] };
  return follow(session, TOOLS[session.tool].pointerDown(session.state, hit, context), context);
}

/** The pointer over the surface: a held marker follows it from vertex to vertex (shown, not yet in the history). */
export function pointerMove(session: ToolSession, hit: SurfaceHit, context: ToolContext): SessionStep {
  const drag = session.drag;
  if (!drag) return follow(session, TOOLS[session.tool].pointerMove(session.state, hit, context), context);
  if (hit.vertex === drag.vertex) return { session, changes: [] };
  const moved = moveFeature(context.editor.present.spec, drag.feature, hit.vertexPoint);
  return { session: { ...session, drag: { ...drag, vertex: hit.vertex } }, changes: moved ? [{ type: 'preview', edit: moved }] : [] };
}

/** The pointer let go over the surface (`hit`) or anywhere (null): a drag becomes one history entry. */
export function pointerUp(session: ToolSession, hit: SurfaceHit | null, context: ToolContext): SessionStep {
  if (session.drag) return { session: { ...session, drag: null }, changes: [{ type: 'end-gesture' }] };
  return follow(session, TOOLS[session.tool].pointerUp(session.state, hit, context), context);
}

/** A click at a place (a press and release there), as when the budget card places its remainder mid-view. */
export function clickAt(session: ToolSession, hit: SurfaceHit, context: ToolContext): SessionStep {
  const down = pointerDown(session, hit, context);
  const up = pointerUp(down.session, hit, context);
  return { session: up.session, changes: [...down.changes, ...up.changes], notice: up.notice ?? down.notice };
}

/**
 * A key for the tools: Escape drops what the tool holds and goes back to looking; other keys go
 * to the active tool. Null when nothing took the key (the page's own shortcuts may).
 */
export function toolKey(session: ToolSession, key: string, context: ToolContext): SessionStep | null {
  const tool = TOOLS[session.tool];
  const step = tool.key(session.state, key, context);
  if (key === 'Escape') {
    const dropped = switchTo({ ...session, state: step ? step.state : session.state }, 'look', context);
    return { ...dropped, changes: [...(step?.changes ?? []), ...dropped.changes] };
  }
  return step ? follow(session, step, context) : null;
}

/** The groomer drops what the tool has drawn and not finished, and stays with the tool. */
export function discardDraft(session: ToolSession, context: ToolContext): SessionStep {
  const step = TOOLS[session.tool].key(session.state, 'Escape', context);
  return step ? follow(session, step, context) : { session, changes: [] };
}

/** The groomer finishes what the tool has drawn (as Enter does). */
export function finishDraft(session: ToolSession, context: ToolContext): SessionStep {
  const step = TOOLS[session.tool].key(session.state, 'Enter', context);
  return step ? follow(session, step, context) : { session, changes: [] };
}

/** The points drawn and not yet a feature. */
export function sessionDraft(session: ToolSession): readonly Vec3[] {
  return TOOLS[session.tool].draft(session.state);
}

/** Whether the pointer is held by a drag or a stroke: the view must not turn. */
export function holdsPointer(session: ToolSession): boolean {
  return session.drag !== null || TOOLS[session.tool].holds(session.state);
}

/** Carries out a step's changes on the editor state; the first refusal comes back in words (later changes still run). */
export function applyChanges(editor: EditorState, changes: readonly EditorChange[]): { editor: EditorState; refused: string | null } {
  let refused: string | null = null;
  for (const change of changes) {
    switch (change.type) {
      case 'apply': {
        const step = applyCheckedEdit(editor, change.edit);
        editor = step.state;
        refused ??= step.refused;
        break;
      }
      case 'preview':
        editor = previewEdit(editor, change.edit);
        break;
      case 'end-gesture':
        editor = endGesture(editor);
        break;
      case 'select':
        editor = select(editor, change.feature);
        break;
    }
  }
  return { editor, refused };
}
