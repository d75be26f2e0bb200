// What the page draws of a solved field, computed in the worker: short strokes spread evenly
// over the surface (their places chosen once per density and kept), streamlines traced from the
// same places, and curves along mesh edges. Drawing only: solving is field-engine.ts's.
import { createTracer, type GroomSurface } from '@/lib/groom';
import type { DirectionField } from '@/lib/field';
import type { DisplayOptions } from './protocol';

/** Most strokes the field drawing uses, whatever the density asked. */
const MAX_STROKES = 60_000;
const TRACE_POINTS = 12;

/** A solved field as the drawing needs it: directions per face, the placed indices and the cut. */
export interface DrawableField {
  readonly field: DirectionField;
  readonly requestedIndex: Float64Array;
  readonly cutEdge: Uint8Array;
}

/** The faces that carry a stroke of the field drawing, spread evenly, and where each stroke sits. */
interface StrokeLayout {
  readonly faces: Uint32Array;
  /** Centre of each stroke (lifted off the skin a little). */
  readonly centers: Float32Array;
  readonly halfLength: number;
  /** Length of one spacing cell, in surface units. */
  readonly cell: number;
}

/** A deterministic shuffle of 0 … n − 1, so the strokes of a density do not follow the face order. */
function shuffledOrder(n: number): Uint32Array {
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  let seed = 0x9e3779b9;
  for (let i = n - 1; i > 0; i--) {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    const j = seed % (i + 1);
    const t = order[i];
    order[i] = order[j];
    order[j] = t;
  }
  return order;
}

/**
 * The drawing of fields on one prepared surface. The stroke places of each density are computed
 * once and re-used by every solve.
 */
export class FieldDrawing {
  private readonly centroids: Float32Array;
  private readonly order: Uint32Array;
  /** The surface's whole area, in its own units squared. */
  readonly totalArea: number;
  private readonly layouts = new Map<number, StrokeLayout>();
  /** Where streamlines are traced before they are copied out, kept from one drawing to the next. */
  private traceScratch: { lines: Float32Array; shade: Float32Array } | null = null;

  constructor(private readonly surface: GroomSurface) {
    const { mesh } = surface;
    const faces = mesh.triangles.length / 3;
    const tri = mesh.triangles;
    const p = mesh.positions;
    const centroids = new Float32Array(tri.length);
    for (let f = 0; f < faces; f++) {
      for (let k = 0; k < 3; k++) {
        centroids[3 * f + k] = (p[3 * tri[3 * f] + k] + p[3 * tri[3 * f + 1] + k] + p[3 * tri[3 * f + 2] + k]) / 3;
      }
    }
    this.centroids = centroids;
    this.order = shuffledOrder(faces);
    this.totalArea = surface.faceArea.reduce((sum, a) => sum + a, 0);
  }

  /** A chain of vertices as points lifted a little off the skin, for drawing a curve along the mesh. */
  chainPoints(vertices: readonly number[]): Float32Array {
    const surface = this.surface;
    const p = surface.mesh.positions;
    const n = surface.vertexNormal;
    const lift = 0.15 * surface.meanEdge;
    const out = new Float32Array(3 * vertices.length);
    vertices.forEach((v, i) => {
      for (let k = 0; k < 3; k++) out[3 * i + k] = p[3 * v + k] + lift * n[3 * v + k];
    });
    return out;
  }


  /** The faces that carry strokes at a density: one per cell of a grid whose cells hold about equal areas. */
  private layout(density: number): StrokeLayout {
    const surface = this.surface;
    const wanted = Math.max(50, Math.min(MAX_STROKES, Math.round(density)));
    const cached = this.layouts.get(wanted);
    if (cached) return cached;
    const centroids = this.centroids;
    const order = this.order;
    const faces = order.length;
    const cell = Math.sqrt(this.totalArea / wanted);
    const taken = new Set<number>();
    const chosen: number[] = [];
    const span = 1 << 20;
    for (let i = 0; i < faces; i++) {
      const f = order[i];
      const ix = Math.floor(centroids[3 * f] / cell) + span / 2;
      const iy = Math.floor(centroids[3 * f + 1] / cell) + span / 2;
      const iz = Math.floor(centroids[3 * f + 2] / cell) + span / 2;
      const key = (ix * span + iy) * span + iz;
      if (taken.has(key)) continue;
      taken.add(key);
      chosen.push(f);
    }
    const normal = surface.field.frames.normal;
    const lift = 0.08 * surface.meanEdge;
    const centers = new Float32Array(3 * chosen.length);
    chosen.forEach((f, i) => {
      for (let k = 0; k < 3; k++) centers[3 * i + k] = centroids[3 * f + k] + lift * normal[3 * f + k];
    });
    const layout = { faces: Uint32Array.from(chosen), centers, halfLength: 0.38 * cell, cell };
    if (this.layouts.size > 8) this.layouts.clear();
    this.layouts.set(wanted, layout);
    return layout;
  }

  /**
   * The field drawing at the page's display options: short strokes along the field (no shade:
   * tail and head alternate), or streamlines traced through it (shaded along each line). The
   * lines are new arrays each time, made to be moved to the page, which keeps no reference back.
   */
  draw(solved: DrawableField, display: DisplayOptions): { lines: Float32Array; shade: Float32Array | null } {
    if (display.drawing === 'streamlines') return this.streamlines(solved, display.density / 6);
    const { faces, centers, halfLength } = this.layout(display.density);
    // Each stroke's direction from its face's angle, as DirectionField.faceDirection has it: while
    // a whorl is dragged the field's directions over the whole surface are never worked out.
    const angle = solved.field.faceAngle;
    const { frameX, frameY } = this.surface.field.frames;
    const lines = new Float32Array(6 * faces.length);
    for (let i = 0; i < faces.length; i++) {
      const f = faces[i];
      const c = Math.cos(angle[f]), s = Math.sin(angle[f]);
      for (let k = 0; k < 3; k++) {
        const d = c * frameX[3 * f + k] + s * frameY[3 * f + k];
        lines[6 * i + k] = centers[3 * i + k] - halfLength * d;
        lines[6 * i + 3 + k] = centers[3 * i + k] + halfLength * d;
      }
    }
    return { lines, shade: null };
  }

  private streamlines(solved: DrawableField, seeds: number): { lines: Float32Array; shade: Float32Array } {
    const surface = this.surface;
    const { faces, centers, cell } = this.layout(seeds);
    const singular = new Uint8Array(surface.field.topology.vertexCount);
    solved.requestedIndex.forEach((index, v) => {
      if (index !== 0) singular[v] = 1;
    });
    const tracer = createTracer(surface.field, solved.field, singular, solved.cutEdge);
    const length = 3.2 * cell;
    const targets = new Float64Array(TRACE_POINTS);
    for (let i = 0; i < TRACE_POINTS; i++) targets[i] = ((i + 1) * length) / TRACE_POINTS;
    const out = new Float64Array(3 * (TRACE_POINTS + 1));
    const outFace = new Uint32Array(TRACE_POINTS + 1);
    const normal = surface.field.frames.normal;
    const lift = 0.08 * surface.meanEdge;
    // Written into kept buffers of the largest size the layout can need, then copied out at the
    // size reached: one copy per update instead of growing lists point by point.
    const most = 2 * TRACE_POINTS * faces.length;
    if (!this.traceScratch || this.traceScratch.shade.length < most) this.traceScratch = { lines: new Float32Array(3 * most), shade: new Float32Array(most) };
    const { lines, shade } = this.traceScratch;
    let points = 0;
    const put = (q: number, face: number) => {
      for (let k = 0; k < 3; k++) lines[3 * points + k] = out[3 * q + k] + lift * normal[3 * face + k];
      shade[points++] = q / TRACE_POINTS;
    };
    for (let i = 0; i < faces.length; i++) {
      const f = faces[i];
      const x = centers[3 * i] - lift * normal[3 * f], y = centers[3 * i + 1] - lift * normal[3 * f + 1], z = centers[3 * i + 2] - lift * normal[3 * f + 2];
      out[0] = x; out[1] = y; out[2] = z;
      outFace[0] = f;
      const reached = tracer.trace(f, x, y, z, targets, TRACE_POINTS, out, outFace, 1);
      for (let j = 0; j < reached; j++) {
        put(j, outFace[j]);
        put(j + 1, outFace[j + 1]);
      }
    }
    return { lines: lines.slice(0, 3 * points), shade: shade.slice(0, points) };
  }
}
