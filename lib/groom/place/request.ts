import { solveField, type CurveFeature, type FaceAlignment, type FieldRequest, type PointSingularity, type SolvedField } from '../../field';
import { GroomError } from '../errors';
import { edgePath, surfacePointOf, vertexOfPlace } from './place';
import type { CurveSpec, GroomSpec, StrokeSpec } from '../spec/spec';
import type { GroomSurface } from './surface';

/** Most samples one flow stroke becomes: each is a row of the field solve's small dense system. */
const MAX_SAMPLES_PER_STROKE = 32;

const RADIANS_PER_DEGREE = Math.PI / 180;

/** Straight down for the spec's up axis: the direction hair falls when nothing else decides it. */
export function downOf(upAxis: GroomSpec['upAxis']): [number, number, number] {
  return upAxis === 'z' ? [0, 0, -1] : [0, -1, 0];
}

/**
 * The welded vertices a parting or crest passes, anchors joined along mesh edges (closed curves end where they start).
 *
 * Guarantees: consecutive vertices share an edge; a GroomError naming `path` for places off the surface or too close together.
 */
export function curveVertices(surface: GroomSurface, curve: CurveSpec, path: string): number[] {
  const anchors = curve.points
    ? curve.points.map((point, i) => vertexOfPlace(surface, { point }, `${path}.points[${i}]`))
    : curve.vertices!.map((vertex, i) => vertexOfPlace(surface, { vertex }, `${path}.vertices[${i}]`));
  if (curve.closed) anchors.push(anchors[0]);
  const chain: number[] = [anchors[0]];
  for (let i = 1; i < anchors.length; i++) {
    if (anchors[i] === chain[chain.length - 1]) continue;
    chain.push(...edgePath(surface, chain[chain.length - 1], anchors[i], path).slice(1));
  }
  if (chain.length < (curve.closed ? 4 : 2)) {
    throw new GroomError('curve-too-short', `${path}: its points all snap to ${chain.length === 1 ? 'one vertex' : 'too few vertices'}; spread them further apart.`, path);
  }
  return chain;
}

function strokeAlignments(surface: GroomSurface, stroke: StrokeSpec, path: string): FaceAlignment[] {
  const pts = stroke.points;
  let total = 0;
  for (let i = 1; i < pts.length; i++) total += Math.hypot(pts[i][0] - pts[i - 1][0], pts[i][1] - pts[i - 1][1], pts[i][2] - pts[i - 1][2]);
  if (total === 0) throw new GroomError('stroke-too-short', `${path}: all its points are the same point.`, path);
  const step = Math.max(2 * surface.meanEdge, total / MAX_SAMPLES_PER_STROKE);
  const used = new Set<number>();
  const samples: FaceAlignment[] = [];
  let along = 0;
  let next = 0;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1], b = pts[i];
    const length = Math.hypot(b[0] - a[0], b[1] - a[1], b[2] - a[2]);
    if (length === 0) continue;
    const direction: [number, number, number] = [(b[0] - a[0]) / length, (b[1] - a[1]) / length, (b[2] - a[2]) / length];
    while (next <= along + length && samples.length < MAX_SAMPLES_PER_STROKE) {
      const t = next - along;
      const { face } = surfacePointOf(surface, [a[0] + t * direction[0], a[1] + t * direction[1], a[2] + t * direction[2]], `${path}.points[${i - 1}]`);
      // A stroke that comes back over a face it already fixed would fix it twice.
      if (!used.has(face)) {
        used.add(face);
        samples.push({ face, direction });
      }
      next += step;
    }
    along += length;
  }
  return samples;
}

/**
 * Turns the spec's field decisions into the field engine's request: singularities and curves
 * snapped to vertices, strokes to faces with directions, angles in radians, the reference
 * direction defaulting to straight down.
 *
 * Guarantees: every vertex and face in the request exists on the surface; a GroomError naming
 * the spec path for places the surface cannot hold (off the surface, unknown file vertex, curve
 * points not joined by any path).
 */
export function fieldRequestFromSpec(spec: GroomSpec, surface: GroomSurface): FieldRequest {
  const f = spec.field;
  const singularities: PointSingularity[] = f.singularities.map((s, i) => {
    const vertex = vertexOfPlace(surface, s, `field.singularities[${i}]`);
    if (s.twist === undefined) return { vertex, index: s.index };
    const sign = s.handedness === 'clockwise' ? -1 : 1;
    const orientation = sign * s.twist * RADIANS_PER_DEGREE;
    return s.twistFrom ? { vertex, index: s.index, orientation, twistDirection: s.twistFrom } : { vertex, index: s.index, orientation };
  });
  const curves: CurveFeature[] = [
    ...f.partings.map((c, i) => ({ kind: 'parting' as const, vertices: curveVertices(surface, c, `field.partings[${i}]`) })),
    ...f.crests.map((c, i) => ({ kind: 'crest' as const, vertices: curveVertices(surface, c, `field.crests[${i}]`) })),
  ];
  const strokes = f.strokes.map((s, i) => strokeAlignments(surface, s, `field.strokes[${i}]`));
  return {
    order: f.order,
    singularities,
    curves,
    strokes,
    rotation: f.rotation * RADIANS_PER_DEGREE,
    referenceDirection: f.referenceDirection ?? downOf(spec.upAxis),
  };
}

/**
 * Solves the spec's field on the surface.
 *
 * Guarantees: as `solveField` — the field has exactly the spec's singularities, or a FieldError
 * (infeasible request, e.g. an unbalanced index budget) or GroomError (bad place) says why not.
 */
export function solveGroomField(spec: GroomSpec, surface: GroomSurface): SolvedField {
  if (surface.field.boundary !== spec.field.boundary) {
    throw new GroomError('boundary-mismatch', `field.boundary: the spec holds the boundary ${spec.field.boundary}, but the surface was prepared with ${surface.field.boundary}.`, 'field.boundary');
  }
  return solveField(surface.field, fieldRequestFromSpec(spec, surface));
}
