// Drawing a parting or a crest from clicked points: each click adds the vertex under it (the
// worker joins them along the mesh for the stage), a second click on the last point or Enter
// finishes the curve, Escape drops it, and leaving the tool finishes what was drawn.
import type { Vec3 } from '../features';
import type { CurveKind } from '../spec-edits';
import { clickHit, type Press } from './clicks';
import { NO_DRAFT, type Tool, type ToolContext, type ToolStep } from './tool';

export interface CurveDrawing {
  readonly press: Press | null;
  readonly points: readonly Vec3[];
}

const EMPTY: CurveDrawing = { press: null, points: NO_DRAFT };

function samePoint(a: Vec3 | undefined, b: Vec3): boolean {
  return !!a && a[0] === b[0] && a[1] === b[1] && a[2] === b[2];
}

/** The curve drawn so far becomes a feature when it has two points or more; the drawing is emptied either way. */
function finish(state: CurveDrawing, kind: CurveKind, context: ToolContext): ToolStep<CurveDrawing> {
  if (state.points.length < 2) return { state: { ...state, points: NO_DRAFT } };
  return { state: { ...state, points: NO_DRAFT }, changes: [{ type: 'apply', edit: { type: 'add-curve', kind, curve: { points: [...state.points], closed: context.options.closed } } }] };
}

/** The tool that draws curves of one kind. */
export function curveTool(kind: CurveKind, about: { label: string; shortcut: string }): Tool<CurveDrawing> {
  return {
    id: kind,
    ...about,
    hint: `Click points along the ${kind}; they are joined along the mesh. Enter or a second click on the last point finishes it.`,
    enter: () => EMPTY,
    pointerDown: (state, hit) => ({ state: { ...state, press: hit.screen } }),
    pointerMove: (state) => ({ state }),
    pointerUp(state, hit, context) {
      if (!state.press) return { state };
      const clicked = clickHit(state.press, hit);
      const released = { ...state, press: null };
      if (!clicked) return { state: released };
      if (samePoint(state.points[state.points.length - 1], clicked.vertexPoint)) return finish(released, kind, context);
      return { state: { ...released, points: [...state.points, clicked.vertexPoint] } };
    },
    key(state, key, context) {
      if (key === 'Enter' && state.points.length > 0) return finish(state, kind, context);
      if (key === 'Escape') return { state: { ...state, points: NO_DRAFT } };
      return null;
    },
    exit: (state, context) => ({ ...finish(state, kind, context), state: EMPTY }),
    draft: (state) => state.points,
    joinsDraft: true,
    picksMarkers: false,
    holds: () => false,
  };
}
