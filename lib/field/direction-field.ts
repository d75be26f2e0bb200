/**
 * The field a groomer sees: one direction carried over the surface with a solved connection,
 * so that it turns exactly as the connection says and nowhere else, plus a blended direction per
 * vertex for drawing and for growing hair between faces.
 */
import { dualPieces, type ConnectionResult, type FieldSurface } from './connection';
import { crossingSign } from './mesh/dual-chains';
import { faceAreas, vertexNormals } from './mesh/geometry';
import { faceOfHalfedge } from './mesh/topology';
import { angleInFace } from './mesh/transport';

/** A direction field on the faces, and its smoothed version at the vertices. */
export interface DirectionField {
  readonly order: number;
  /** Angle of the (first) direction in each face's frame. */
  readonly faceAngle: Float64Array;
  /**
   * Unit tangent direction per face (3 per face); for order n > 1 the first of its n directions:
   * cos(faceAngle)·frameX + sin(faceAngle)·frameY, worked out on first use and kept (a drawing
   * of a few thousand strokes needs only its own faces' directions).
   */
  readonly faceDirection: Float64Array;
  /**
   * Unit tangent direction per vertex (3 per vertex), blended from the faces around it; 0 where no
   * face uses the vertex. Blended on first use and kept: a field drawn while a feature is dragged
   * never needs it, and blending costs more than carrying the field over the surface.
   */
  readonly vertexDirection: Float64Array;
}

export interface FieldStart {
  /** Rotation (radians) of the whole field where nothing fixes its direction. */
  readonly rotation?: number;
  /** World direction the field starts from where nothing fixes it. */
  readonly referenceDirection?: readonly [number, number, number];
}

/**
 * Builds the field by carrying one direction from a root face of each piece of surface through a
 * spanning tree of the dual graph with the solved connection.
 *
 * Guarantees: every face gets a unit tangent vector; the fixed faces (strokes, curves, twists,
 * held boundaries) get exactly their fixed direction (up to the field's symmetry); within a piece,
 * crossing any interior edge not on a curve changes the direction by exactly the connection's
 * rotation, modulo 2π/order — because the connection is trivial, the tree chosen does not matter.
 * The per-face and per-vertex directions are worked out when first read (the same values either way).
 */
export function buildDirectionField(surface: FieldSurface, connection: ConnectionResult, start: FieldStart = {}): DirectionField {
  const topology = surface.topology;
  const frames = surface.frames;
  const nF = topology.faceCount;
  const piece = connection.cutEdge.includes(1) ? dualPieces(topology, connection.cutEdge) : topology.componentOfFace;
  const rootOfPiece = new Map<number, number>();
  for (const face of connection.fixedFaces.keys()) if (!rootOfPiece.has(piece[face])) rootOfPiece.set(piece[face], face);

  const faceAngle = new Float64Array(nF);
  const seen = new Uint8Array(nF);
  const queue = new Int32Array(nF);
  const rotation = start.rotation ?? 0;
  for (let f0 = 0; f0 < nF; f0++) {
    if (seen[f0]) continue;
    const root = rootOfPiece.get(piece[f0]) ?? f0;
    if (connection.fixedFaces.has(root)) faceAngle[root] = connection.fixedFaces.get(root)!;
    else {
      const d = start.referenceDirection;
      const projected = d ? angleInFace(frames, root, d[0], d[1], d[2]) : 0;
      faceAngle[root] = (Number.isFinite(projected) ? projected : 0) + rotation;
    }
    let head = 0, tail = 0;
    queue[tail++] = root;
    seen[root] = 1;
    while (head < tail) {
      const f = queue[head++];
      for (let k = 0; k < 3; k++) {
        const h = 3 * f + k;
        const t = topology.twin[h];
        const e = topology.edgeOf[h];
        if (t === -1 || connection.cutEdge[e]) continue;
        const g = faceOfHalfedge(t);
        if (seen[g]) continue;
        seen[g] = 1;
        faceAngle[g] = faceAngle[f] + crossingSign(topology, h) * (frames.edgeRotation[e] + connection.angles[e]);
        queue[tail++] = g;
      }
    }
  }

  let directions: Float64Array | null = null;
  let blended: Float64Array | null = null;
  const faceDirection = () => (directions ??= faceDirections(surface, faceAngle));
  return {
    order: connection.order,
    faceAngle,
    get faceDirection() {
      return faceDirection();
    },
    get vertexDirection() {
      return (blended ??= blendAtVertices(surface, faceDirection(), connection.order));
    },
  };
}

/** cos(angle)·frameX + sin(angle)·frameY in every face. */
function faceDirections(surface: FieldSurface, faceAngle: Float64Array): Float64Array {
  const { frameX, frameY } = surface.frames;
  const out = new Float64Array(3 * faceAngle.length);
  for (let f = 0; f < faceAngle.length; f++) {
    const c = Math.cos(faceAngle[f]), s = Math.sin(faceAngle[f]);
    for (let i = 0; i < 3; i++) out[3 * f + i] = c * frameX[3 * f + i] + s * frameY[3 * f + i];
  }
  return out;
}

/** Per-vertex tangent bases and face areas, the same for every field on a surface. */
interface VertexFrames {
  readonly basisU: Float64Array;
  readonly basisW: Float64Array;
  readonly areas: Float64Array;
}
const vertexFramesOf = new WeakMap<FieldSurface, VertexFrames>();

function vertexFrames(surface: FieldSurface): VertexFrames {
  const cached = vertexFramesOf.get(surface);
  if (cached) return cached;
  const nV = surface.topology.vertexCount;
  const normals = vertexNormals(surface.mesh);
  const basisU = new Float64Array(3 * nV);
  const basisW = new Float64Array(3 * nV);
  for (let v = 0; v < nV; v++) {
    const nx = normals[3 * v], ny = normals[3 * v + 1], nz = normals[3 * v + 2];
    // Any axis not close to the normal gives a well-conditioned tangent basis.
    const ax = Math.abs(nx) < 0.6 ? 1 : 0, ay = ax ? 0 : 1;
    let ux = ay * nz, uy = -ax * nz, uz = ax * ny - ay * nx;
    const ul = Math.hypot(ux, uy, uz) || 1;
    ux /= ul; uy /= ul; uz /= ul;
    basisU[3 * v] = ux; basisU[3 * v + 1] = uy; basisU[3 * v + 2] = uz;
    basisW[3 * v] = ny * uz - nz * uy; basisW[3 * v + 1] = nz * ux - nx * uz; basisW[3 * v + 2] = nx * uy - ny * ux;
  }
  const frames = { basisU, basisW, areas: faceAreas(surface.mesh) };
  vertexFramesOf.set(surface, frames);
  return frames;
}

/**
 * Blends face directions into each vertex's tangent plane, weighted by face area. An n-direction
 * field is blended through its n-th power (angles times n), so directions that differ by 2π/n
 * agree instead of cancelling.
 */
function blendAtVertices(surface: FieldSurface, faceDirection: Float64Array, order: number): Float64Array {
  const { topology } = surface;
  const nV = topology.vertexCount;
  const { basisU, basisW, areas } = vertexFrames(surface);
  const sumC = new Float64Array(nV);
  const sumS = new Float64Array(nV);
  const fallback = new Float64Array(nV).fill(NaN);
  const tri = topology.triangles;
  for (let f = 0; f < topology.faceCount; f++) {
    const dx = faceDirection[3 * f], dy = faceDirection[3 * f + 1], dz = faceDirection[3 * f + 2];
    for (let k = 0; k < 3; k++) {
      const v = tri[3 * f + k];
      const a = Math.atan2(dx * basisW[3 * v] + dy * basisW[3 * v + 1] + dz * basisW[3 * v + 2], dx * basisU[3 * v] + dy * basisU[3 * v + 1] + dz * basisU[3 * v + 2]);
      sumC[v] += areas[f] * Math.cos(order * a);
      sumS[v] += areas[f] * Math.sin(order * a);
      if (Number.isNaN(fallback[v])) fallback[v] = a;
    }
  }
  const out = new Float64Array(3 * nV);
  for (let v = 0; v < nV; v++) {
    if (Number.isNaN(fallback[v])) continue;
    // Around a singularity the blend cancels out; any one face's direction is then as good as another.
    const a = Math.hypot(sumC[v], sumS[v]) > 1e-12 ? Math.atan2(sumS[v], sumC[v]) / order : fallback[v];
    const c = Math.cos(a), s = Math.sin(a);
    for (let i = 0; i < 3; i++) out[3 * v + i] = c * basisU[3 * v + i] + s * basisW[3 * v + i];
  }
  return out;
}
