// The tint brush: a drag over the surface paints the map (or mask) picked in the Tints panel.
// A stroke decodes the painted values once when the pointer is pressed, dabs on them in place
// while it is dragged (the stage shows them as they change), and writes them back into the spec
// in its compact form once, when the pointer is let go: one history entry per stroke, saved like
// every edit. With twin sides on, every dab is also made at its mirror image, in the same stroke.
import { applyDab, dabReach, MAP_PAINT_RANGE, MASK_PAINT_RANGE, type BrushSettings, type DabReach, type PaintRange } from '@/lib/groom/place/paint';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { mirrorPoint, planeOfSymmetry } from '@/lib/groom/spec/symmetry';
import type { Vec3 } from '../features';
import { paintedValues, targetLabel, writeValues, type PaintSurface, type PaintTarget } from '../paint';
import { NO_DRAFT, type SurfaceHit, type Tool, type ToolContext, type ToolStep } from './tool';

interface Stroke {
  readonly target: PaintTarget;
  /** The painted values, one per vertex, changed in place by each dab. */
  readonly values: Float64Array;
  readonly range: PaintRange;
  /** Where the last dab was made. */
  readonly last: Vec3;
  /** Dabs made, and values they changed (none: the stroke writes nothing). */
  readonly dabs: number;
  readonly changed: number;
}

export interface TintState {
  readonly stroke: Stroke | null;
}

const IDLE: TintState = { stroke: null };

/** Dabs are made a quarter of the radius apart along the drag, so a stroke is even at any pointer speed. */
export const DAB_SPACING = 0.25;

/**
 * The vertices a dab at `hit` reaches — and, with the spec's twin sides on, those its mirror image
 * reaches (the mirrored point on the face of the vertex nearest it) — each once, at its nearer distance.
 */
export function strokeReach(paint: PaintSurface, spec: GroomSpec, hit: Pick<SurfaceHit, 'point' | 'face'>, radius: number): DabReach {
  const own = dabReach(paint.mesh, paint.around, hit.face, hit.point, radius);
  if (!spec.symmetry) return own;
  const image = mirrorPoint(planeOfSymmetry(spec.symmetry), hit.point);
  const face = faceAround(paint, paint.nearest.find(image[0], image[1], image[2]).vertex, image);
  if (face < 0) return own;
  const mirrored = dabReach(paint.mesh, paint.around, face, image, radius);
  const nearest = new Map<number, number>();
  for (const reach of [own, mirrored]) reach.vertices.forEach((v, i) => nearest.set(v, Math.min(nearest.get(v) ?? Infinity, reach.distances[i])));
  return { vertices: Int32Array.from(nearest.keys()), distances: Float64Array.from(nearest.values()) };
}

/**
 * The face round `vertex` that holds `point` best: the one whose barycentric coordinates of the
 * point (projected into its plane) have the largest smallest weight — inside it when any face is.
 * The mirrored dab starts from the face its point lies in, as the pointer's own dab does, so on a
 * symmetric mesh the two dabs reach mirror vertices at the same distances. −1 for a lone vertex.
 */
function faceAround(paint: PaintSurface, vertex: number, point: readonly number[]): number {
  const p = paint.mesh.positions, tri = paint.mesh.triangles;
  let best = -1, bestWeight = -Infinity;
  for (let i = paint.around.start[vertex]; i < paint.around.start[vertex + 1]; i++) {
    const f = paint.around.faces[i];
    const [a, b, c] = [0, 1, 2].map((k) => 3 * tri[3 * f + k]);
    const e1 = [0, 1, 2].map((k) => p[b + k] - p[a + k]), e2 = [0, 1, 2].map((k) => p[c + k] - p[a + k]), w = [0, 1, 2].map((k) => point[k] - p[a + k]);
    const dot = (u: number[], v: number[]) => u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
    const d11 = dot(e1, e1), d12 = dot(e1, e2), d22 = dot(e2, e2), det = d11 * d22 - d12 * d12;
    if (!(det > 0)) continue;
    const s = (d22 * dot(w, e1) - d12 * dot(w, e2)) / det, t = (d11 * dot(w, e2) - d12 * dot(w, e1)) / det;
    const weight = Math.min(1 - s - t, s, t);
    if (weight > bestWeight) (best = f), (bestWeight = weight);
  }
  return best;
}

function dab(stroke: Stroke, hit: SurfaceHit, brush: BrushSettings, paint: PaintSurface, spec: GroomSpec): Stroke {
  const reach = strokeReach(paint, spec, hit, brush.radius);
  const changed = applyDab(stroke.values, reach, brush, stroke.range, paint.mesh, paint.around);
  return { ...stroke, last: hit.point, dabs: stroke.dabs + 1, changed: stroke.changed + changed };
}

/** The stroke written into the spec as one edit; nothing when no value changed. */
function finish(state: TintState, paint: PaintSurface | undefined): ToolStep<TintState> {
  const stroke = state.stroke;
  if (!stroke || stroke.changed === 0 || !paint) return { state: IDLE };
  return { state: IDLE, changes: [{ type: 'apply', edit: writeValues(stroke.target, stroke.values, paint.mesh, `Tint ${targetLabel(stroke.target)}`) }] };
}

function start(hit: SurfaceHit, context: ToolContext): ToolStep<TintState> {
  const brush = context.options.brush;
  const paint = context.paint;
  if (!brush?.paints) return { state: IDLE, notice: 'Pick the map or mask to tint in the Tints panel (Guides tab) first.' };
  if (!paint) return { state: IDLE, notice: 'The surface is still opening.' };
  const spec = context.editor.present.spec;
  let values: Float64Array;
  try {
    values = paintedValues(spec, brush.paints, paint.mesh);
  } catch (error) {
    return { state: IDLE, notice: (error as Error).message };
  }
  const range = brush.paints.kind === 'map' ? MAP_PAINT_RANGE : MASK_PAINT_RANGE;
  const stroke: Stroke = { target: brush.paints, values, range, last: hit.point, dabs: 0, changed: 0 };
  return { state: { stroke: dab(stroke, hit, brush, paint, spec) } };
}

export const tintTool: Tool<TintState> = {
  id: 'tint',
  label: 'Tint',
  shortcut: 'T',
  hint: 'Drag over the surface to tint the map or mask picked in the Tints panel; one drag is one undo step.',
  enter: () => IDLE,
  pointerDown: (_state, hit, context) => start(hit, context),
  pointerMove(state, hit, context) {
    const stroke = state.stroke;
    const brush = context.options.brush;
    if (!stroke || !brush || !context.paint) return { state };
    const [x, y, z] = stroke.last;
    if (Math.hypot(hit.point[0] - x, hit.point[1] - y, hit.point[2] - z) < DAB_SPACING * brush.radius) return { state };
    return { state: { stroke: dab(stroke, hit, brush, context.paint, context.editor.present.spec) } };
  },
  pointerUp: (state, _hit, context) => finish(state, context.paint),
  key: (state, key) => (key === 'Escape' && state.stroke ? { state: IDLE } : null),
  exit: (state, context) => finish(state, context.paint),
  draft: () => NO_DRAFT,
  joinsDraft: false,
  picksMarkers: false,
  holds: (state) => state.stroke !== null,
};

/** The values of the stroke being dragged (changed in place; `dabs` tells when), for the stage to show; null between strokes. */
export function strokeInView(state: TintState): { readonly target: PaintTarget; readonly values: Float64Array; readonly dabs: number } | null {
  return state.stroke ? { target: state.stroke.target, values: state.stroke.values, dabs: state.stroke.dabs } : null;
}
