// Small geometry the page needs on top of what the worker sends: the vertex a click lands on,
// guides as line segments, and the faces, edges and vertices a surface check points at.
import type { SurfaceProblem } from './api';
import { roundPoint, type Vec3 } from './features';
import type { GrownGuides } from './protocol';

/** The corner of a face nearest a point on it: where a click on the surface puts a singularity. */
export function nearestCorner(positions: ArrayLike<number>, triangles: ArrayLike<number>, face: number, point: readonly number[]): number {
  let best = triangles[3 * face];
  let bestDistance = Infinity;
  for (let k = 0; k < 3; k++) {
    const v = triangles[3 * face + k];
    const d = (positions[3 * v] - point[0]) ** 2 + (positions[3 * v + 1] - point[1]) ** 2 + (positions[3 * v + 2] - point[2]) ** 2;
    if (d < bestDistance) {
      bestDistance = d;
      best = v;
    }
  }
  return best;
}

/** A vertex's place, rounded for the spec. */
export function vertexPoint(positions: ArrayLike<number>, vertex: number): Vec3 {
  return roundPoint([positions[3 * vertex], positions[3 * vertex + 1], positions[3 * vertex + 2]]);
}

/** Another vertex of a face that uses `vertex` (a neighbour), or `vertex` itself when none does. */
export function neighbourOf(triangles: ArrayLike<number>, vertex: number): number {
  for (let h = 0; h < triangles.length; h++) {
    if (triangles[h] === vertex) {
      const face = h - (h % 3);
      return triangles[face + ((h % 3) + 1) % 3];
    }
  }
  return vertex;
}

/** Guides (polylines of equal length) as line segments, shaded from root (0) to tip (1). */
export function guideSegments(guides: Pick<GrownGuides, 'count' | 'pointsPerGuide' | 'points'>): { lines: Float32Array; shade: Float32Array } {
  const n = guides.pointsPerGuide;
  const segments = guides.count * (n - 1);
  const lines = new Float32Array(6 * segments);
  const shade = new Float32Array(2 * segments);
  let s = 0;
  for (let g = 0; g < guides.count; g++) {
    for (let i = 0; i + 1 < n; i++, s++) {
      const a = 3 * (g * n + i);
      lines.set(guides.points.subarray(a, a + 6), 6 * s);
      shade[2 * s] = i / (n - 1);
      shade[2 * s + 1] = (i + 1) / (n - 1);
    }
  }
  return { lines, shade };
}

/** What to mark on a surface for its problems: faces to fill, edges to draw, vertices to dot. */
export interface ProblemMarks {
  readonly faces: number[];
  /** Segment end points, x y z pairs. */
  readonly edges: number[];
  readonly vertices: number[];
  /** Problems whose examples could be marked, by code. */
  readonly marked: string[];
}

/**
 * Turns the `examples` of a surface check's problems into marks on the mesh the browser read from
 * the same file (same reader, same numbering). Examples outside the mesh are skipped, as are
 * problems that name file faces (`collapsed-faces`) or the whole file.
 */
export function problemMarks(problems: readonly SurfaceProblem[], positions: ArrayLike<number>, triangles: ArrayLike<number>): ProblemMarks {
  const vertexCount = positions.length / 3;
  const faceCount = triangles.length / 3;
  const faces = new Set<number>();
  const edges: number[] = [];
  const vertices = new Set<number>();
  const marked: string[] = [];
  const point = (v: number) => [positions[3 * v], positions[3 * v + 1], positions[3 * v + 2]];
  for (const problem of problems) {
    if (problem.code === 'collapsed-faces') continue;
    let any = false;
    if (problem.where === 'face') {
      for (const f of problem.examples) if (Number.isInteger(f) && f >= 0 && f < faceCount) (faces.add(f), (any = true));
    } else if (problem.where === 'vertex') {
      for (const v of problem.examples) if (Number.isInteger(v) && v >= 0 && v < vertexCount) (vertices.add(v), (any = true));
    } else if (problem.where === 'edge') {
      for (let i = 0; i + 1 < problem.examples.length; i += 2) {
        const a = problem.examples[i], b = problem.examples[i + 1];
        if (a < 0 || b < 0 || a >= vertexCount || b >= vertexCount) continue;
        edges.push(...point(a), ...point(b));
        vertices.add(a);
        vertices.add(b);
        any = true;
      }
    }
    if (any) marked.push(problem.code);
  }
  return { faces: [...faces], edges, vertices: [...vertices], marked };
}

/** The centre and radius of a surface's bounding box, for framing a view; non-finite coordinates are skipped, an empty or flat box gets radius 1. */
export function surfaceBounds(positions: ArrayLike<number>): { center: Vec3; radius: number } {
  const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i += 3) {
    for (let k = 0; k < 3; k++) {
      const x = positions[i + k];
      if (!Number.isFinite(x)) continue;
      lo[k] = Math.min(lo[k], x);
      hi[k] = Math.max(hi[k], x);
    }
  }
  const center = [0, 1, 2].map((k) => (Number.isFinite(lo[k]) ? (lo[k] + hi[k]) / 2 : 0)) as unknown as Vec3;
  const radius = Math.hypot(hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]) / 2;
  return { center, radius: Number.isFinite(radius) && radius > 0 ? radius : 1 };
}

/**
 * True when a surface drawn in single precision (`drawn`: the surface as read, SurfacePreview) is
 * exactly the prepared surface: the same triangles in the same order, and each position the
 * prepared one rounded to single precision. The page then keeps what it already uploaded instead of
 * drawing the same million triangles a second time. Linear in the size, stops at the first difference.
 */
export function drawsSameSurface(drawn: { readonly positions: ArrayLike<number>; readonly triangles: ArrayLike<number> }, prepared: { readonly positions: ArrayLike<number>; readonly triangles: ArrayLike<number> }): boolean {
  if (drawn.triangles.length !== prepared.triangles.length || drawn.positions.length !== prepared.positions.length) return false;
  for (let i = 0; i < drawn.triangles.length; i++) if (drawn.triangles[i] !== prepared.triangles[i]) return false;
  for (let i = 0; i < drawn.positions.length; i++) if (drawn.positions[i] !== Math.fround(prepared.positions[i])) return false;
  return true;
}
