// The flow stroke tool: one drag across the surface the way the hair should lie. The stroke takes
// a point each time the pointer has gone one and a half mean edges from the last, and becomes a
// feature when the pointer is let go, wherever that is.
import { roundPoint, type Vec3 } from '../features';
import { NO_DRAFT, type Tool } from './tool';

export interface FlowStroke {
  /** The points of the stroke being dragged, or null between strokes. */
  readonly points: readonly Vec3[] | null;
}

/** Distance between the points of a stroke, in mean edges of the surface. */
export const STROKE_STEP = 1.5;

const IDLE: FlowStroke = { points: null };

export const flowTool: Tool<FlowStroke> = {
  id: 'flow',
  label: 'Flow stroke',
  shortcut: 'F',
  hint: 'Drag across the surface the way the hair should lie.',
  enter: () => IDLE,
  pointerDown: (_state, hit) => ({ state: { points: [roundPoint(hit.point)] } }),
  pointerMove(state, hit, context) {
    const points = state.points;
    if (!points) return { state };
    const last = points[points.length - 1];
    const p = hit.point;
    if (Math.hypot(p[0] - last[0], p[1] - last[1], p[2] - last[2]) < STROKE_STEP * context.surface.meanEdge) return { state };
    return { state: { points: [...points, roundPoint(p)] } };
  },
  pointerUp(state) {
    const points = state.points;
    if (!points) return { state };
    if (points.length < 2) return { state: IDLE, notice: 'A flow stroke needs a longer drag across the surface.' };
    return { state: IDLE, changes: [{ type: 'apply', edit: { type: 'add-stroke', stroke: { points: [...points] } } }] };
  },
  key: () => null,
  exit: () => ({ state: IDLE }),
  draft: (state) => state.points ?? NO_DRAFT,
  joinsDraft: false,
  picksMarkers: false,
  holds: (state) => state.points !== null,
};
