/**
 * What a caller asks of the connection solve — singularities, strokes, curves, boundary mode —
 * and what it gets back. Types only, so the studio's client code can name them freely.
 */
import type { DualChain } from '../mesh/dual-chains';

/**
 * What the field does along the surface's boundary loops: `free` leaves it to the smoothest
 * solution; `tangent` holds it along the boundary (in the loop's direction, surface on the left);
 * `normal` holds it across the boundary, pointing into the surface.
 */
export type BoundaryMode = 'free' | 'tangent' | 'normal';

/** A point singularity: a whorl (index +1), a saddle (−1) or any multiple of 1/order. */
export interface PointSingularity {
  readonly vertex: number;
  readonly index: number;
  /**
   * Optional twist: the field's angle (radians) in the vertex's first face, measured from the
   * direction pointing from the vertex into that face. For a whorl, 0 is outflow, π inflow,
   * ±π/2 a spiral.
   */
  readonly orientation?: number;
  /**
   * Optional: a world direction the twist is measured from instead of the first face. The twist
   * is then fixed in the ring face this direction, laid into the faces' planes, points into, and
   * measured from the direction there (connection/twist.ts) — chosen by geometry, not by the face
   * order, so a mirrored singularity with the mirrored direction fixes the mirrored face.
   */
  readonly twistDirection?: readonly [number, number, number];
}

/** A face whose direction is fixed: one sample of a flow stroke. */
export interface FaceAlignment {
  readonly face: number;
  /** A 3D direction; its projection onto the face plane is what the field follows. */
  readonly direction: readonly [number, number, number];
}

/**
 * A curve along mesh edges, given as the vertices it passes through (consecutive ones share an
 * edge; first = last for a closed curve). A parting sends the flow away from the curve on both
 * sides, a crest brings it in from both sides; either way perpendicular to the curve.
 */
export interface CurveFeature {
  readonly kind: 'parting' | 'crest';
  readonly vertices: readonly number[];
}

export interface FieldRequest {
  /** n of an n-direction field: 1 for hair direction. */
  readonly order?: number;
  readonly singularities?: readonly PointSingularity[];
  /** Flow strokes, each a chain of faces with the direction to follow there. */
  readonly strokes?: readonly (readonly FaceAlignment[])[];
  readonly curves?: readonly CurveFeature[];
  /**
   * Holonomy (radians, a multiple of 2π/order) around each homology generator, in the order
   * `FieldSurface.generators` lists them (they belong to the prepared surface and never change);
   * `null` or missing picks the multiple of 2π/order nearest to what the smoothest field turns
   * there. Refused while curves cut the surface.
   */
  readonly generatorHolonomies?: readonly (number | null)[];
  /** Rotation (radians) of the whole field where no alignment fixes its direction. */
  readonly rotation?: number;
  /** World direction the field starts from where no alignment fixes it (projected onto the surface). */
  readonly referenceDirection?: readonly [number, number, number];
  /** A vertex that receives whatever index the surface still demands (see `indexBudget`). */
  readonly remainderAt?: number;
}

/**
 * How the field turns around one curve vertex on one side of the curve: from one side face to the
 * next (`preferred` 0: no extra turn), or half a circle round an open curve's end (`preferred` π).
 */
export interface CurveLink {
  readonly from: number;
  readonly to: number;
  readonly chain: DualChain;
  readonly preferred: number;
  /** Index of the curve in the request, and the curve vertex the link turns around. */
  readonly curve: number;
  readonly vertex: number;
}

/** A face beside a curve: the curve's halfedge in that face, and +1 (parting: flow leaves) or −1 (crest). */
export interface CurveSide {
  readonly face: number;
  readonly halfedge: number;
  readonly sense: 1 | -1;
}

/** How the placed indices stand against what one piece of the surface demands. */
export interface PieceBudget {
  /** Piece number (from 0): the surface's components, split further by closed curves. */
  readonly piece: number;
  readonly component: number;
  /** Closed curves bordering the piece, by name ("parting 1"), to tell the pieces apart. */
  readonly borderedBy: readonly string[];
  /** Σ index the piece demands (its Euler characteristic), or null when a free boundary absorbs any sum. */
  readonly demanded: number | null;
  /** Σ index placed on the piece: point singularities, plus 1 for every open parting or crest. */
  readonly placed: number;
  /** demanded − placed, or null when free. */
  readonly remainder: number | null;
}

/** How the placed indices stand against what each piece demands. */
export interface IndexBudget {
  readonly pieces: readonly PieceBudget[];
  /** True when every budgeted piece is balanced. */
  readonly balanced: boolean;
  /** The piece of each vertex; −1 for vertices on a curve (on two pieces at once) and unused ones. */
  readonly pieceOfVertex: Int32Array;
}

/** The connection found by a solve: rotation angles per edge on top of Levi-Civita transport. */
export interface ConnectionResult {
  readonly order: number;
  /** Extra rotation per edge (0 on boundary and curve edges); crossing sign as in `DualChain`. */
  readonly angles: Float64Array;
  /** Index asked for at each vertex (after `remainderAt`). */
  readonly requestedIndex: Float64Array;
  /** 1 where the index is defined and was prescribed: interior vertices off curves (and boundary vertices when held). */
  readonly constrainedVertex: Uint8Array;
  /** Edges that the field does not cross continuously (the curves). */
  readonly cutEdge: Uint8Array;
  /** Faces whose direction is fixed, with the fixed angle in the face frame. */
  readonly fixedFaces: ReadonlyMap<number, number>;
  /** How the field must turn round each curve vertex on each side (the proof checks every one). */
  readonly curveLinks: readonly CurveLink[];
  /** The faces beside the curves, with the direction each must take across its curve edge. */
  readonly curveSides: readonly CurveSide[];
  /** How the placed indices stand against what each piece demands (as `indexBudget` gives it). */
  readonly budget: IndexBudget;
  /** Largest |angle| over all edges: below π/order, the index measurement sees exactly the prescribed indices. */
  readonly largestAngle: number;
  readonly solveMilliseconds: number;
}
