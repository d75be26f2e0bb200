import type { TriangleMesh } from '../../field';
import type { SurfacePosition } from '../spec/spec';

/**
 * A surface's identity in the artist's own numbering: which polygon of the file each triangle
 * came from, which of that polygon's corners it joins, and the UV of every polygon corner when
 * the file has UVs. Places stated this way (polygon + corners + barycentric) survive anything
 * that keeps the polygons — a sculpt pass, a re-export that triangulates differently.
 *
 * `identityOfMesh` reads it from the mesh: from the reader's record of the file's polygons and UVs
 * when the mesh carries one (`ReaderPolygons`), else from the triangles alone (every triangle its
 * own polygon, no UVs).
 */
export interface SurfaceIdentity {
  /** Polygon p has corners `polygonStart[p] … polygonStart[p + 1] − 1` (indices into the corner arrays). */
  readonly polygonStart: Uint32Array;
  /** Welded vertex of each polygon corner (what the geometry uses). */
  readonly cornerVertex: Uint32Array;
  /** Vertex as numbered in the file, per polygon corner, when known: what "same topology" compares. */
  readonly cornerFileVertex?: Uint32Array;
  /** Polygon of each triangle of the mesh. */
  readonly polygonOfFace: Uint32Array;
  /** Per triangle corner (3 per face): its corner's index within the polygon (0-based, polygon order). */
  readonly faceCorner: Uint32Array;
  /** u, v of each polygon corner, when the surface has UVs. */
  readonly cornerUv?: Float64Array;
}

/**
 * What the surface reader records beside the welded mesh (lib/field's TriangleMesh, once it keeps
 * the file's polygons): per triangle its file polygon and which of the polygon's corners it joins,
 * and the file's polygons with their corners' file vertices and UVs. Read structurally, so a mesh
 * without them is simply a mesh without them.
 */
export interface ReaderPolygons {
  readonly facePolygon?: Uint32Array;
  readonly faceCorners?: ArrayLike<number>;
  readonly polygons?: { readonly start: Uint32Array; readonly corners: Uint32Array; readonly uvs?: ArrayLike<number> };
}

/**
 * The identity of a mesh: the file's own polygons and UVs when the reader recorded them
 * (`ReaderPolygons`), else each triangle a polygon of three corners in its own order, with
 * `faceUv` (u, v per triangle corner, 6 per face) as UVs when the caller has them.
 *
 * Guarantees: a valid identity of `mesh` (every face's corners name its own vertices); UVs only
 * when the reader recorded one per polygon corner, or `faceUv` has exactly 6 values per face.
 */
export function identityOfMesh(mesh: TriangleMesh & ReaderPolygons, faceUv?: Float64Array): SurfaceIdentity {
  const nF = mesh.triangles.length / 3;
  const read = mesh.polygons;
  if (read && mesh.facePolygon?.length === nF && mesh.faceCorners?.length === 3 * nF) {
    const map = mesh.fileVertexToVertex;
    return {
      polygonStart: read.start,
      cornerVertex: map ? read.corners.map((v) => map[v]) : read.corners,
      cornerFileVertex: read.corners,
      polygonOfFace: mesh.facePolygon,
      faceCorner: Uint32Array.from(mesh.faceCorners),
      ...(read.uvs && read.uvs.length === 2 * read.corners.length ? { cornerUv: Float64Array.from(read.uvs) } : {}),
    };
  }
  const polygonStart = new Uint32Array(nF + 1);
  for (let f = 0; f <= nF; f++) polygonStart[f] = 3 * f;
  const polygonOfFace = new Uint32Array(nF);
  const faceCorner = new Uint32Array(3 * nF);
  for (let f = 0; f < nF; f++) {
    polygonOfFace[f] = f;
    faceCorner.set([0, 1, 2], 3 * f);
  }
  return {
    polygonStart,
    cornerVertex: Uint32Array.from(mesh.triangles),
    polygonOfFace,
    faceCorner,
    ...(faceUv && faceUv.length === 6 * nF ? { cornerUv: Float64Array.from(faceUv) } : {}),
  };
}

/** The identity without its UVs (what a surface exported without `vt` would give). */
export function withoutUv(identity: SurfaceIdentity): SurfaceIdentity {
  const { cornerUv: _dropped, ...rest } = identity;
  return rest;
}

/**
 * Whether two identities number the same polygons the same way: equal polygon sizes and equal
 * corner vertices (file numbers when both know them, welded numbers otherwise).
 */
export function sameTopology(a: SurfaceIdentity, b: SurfaceIdentity): boolean {
  if (!equalArrays(a.polygonStart, b.polygonStart)) return false;
  return a.cornerFileVertex && b.cornerFileVertex ? equalArrays(a.cornerFileVertex, b.cornerFileVertex) : equalArrays(a.cornerVertex, b.cornerVertex);
}

function equalArrays(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * A point of face `face` (given by its barycentric weights over the face's corners) in the file's
 * numbering. Guarantees: the position names the face's polygon and three of its corners; the
 * weights are copied (they sum to 1 when the input did); `uv` is interpolated when there are UVs.
 */
export function positionOnFace(identity: SurfaceIdentity, face: number, weights: readonly number[]): SurfacePosition {
  const polygon = identity.polygonOfFace[face];
  const corners: [number, number, number] = [identity.faceCorner[3 * face], identity.faceCorner[3 * face + 1], identity.faceCorner[3 * face + 2]];
  const barycentric: [number, number, number] = [weights[0], weights[1], weights[2]];
  const position: SurfacePosition = { polygon, corners, barycentric };
  const uv = identity.cornerUv;
  if (!uv) return position;
  const start = identity.polygonStart[polygon];
  let u = 0, v = 0;
  for (let k = 0; k < 3; k++) {
    u += barycentric[k] * uv[2 * (start + corners[k])];
    v += barycentric[k] * uv[2 * (start + corners[k]) + 1];
  }
  return { ...position, uv: [u, v] };
}

/**
 * The world point a surface position names on `mesh`, or null when the identity has no such
 * polygon or corner. Guarantees: the barycentric combination of the named corners' welded positions.
 */
export function pointOfPosition(identity: SurfaceIdentity, mesh: TriangleMesh, position: SurfacePosition): [number, number, number] | null {
  const p = position.polygon;
  if (p + 1 >= identity.polygonStart.length) return null;
  const start = identity.polygonStart[p];
  const size = identity.polygonStart[p + 1] - start;
  const out: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) {
    const corner = position.corners[k];
    if (corner >= size) return null;
    const v = identity.cornerVertex[start + corner];
    for (let i = 0; i < 3; i++) out[i] += position.barycentric[k] * mesh.positions[3 * v + i];
  }
  return out;
}

/**
 * Barycentric weights of `point` over triangle `face`'s corners, the point first projected onto
 * the triangle's plane. Guarantees: weights sum to 1; all ≥ 0 (up to rounding) when the
 * projection falls inside the triangle; [1/3, 1/3, 1/3] for a degenerate triangle.
 */
export function barycentricOnFace(mesh: TriangleMesh, face: number, point: readonly number[]): [number, number, number] {
  const p = mesh.positions;
  const a = 3 * mesh.triangles[3 * face], b = 3 * mesh.triangles[3 * face + 1], c = 3 * mesh.triangles[3 * face + 2];
  const e0 = [p[b] - p[a], p[b + 1] - p[a + 1], p[b + 2] - p[a + 2]];
  const e1 = [p[c] - p[a], p[c + 1] - p[a + 1], p[c + 2] - p[a + 2]];
  const q = [point[0] - p[a], point[1] - p[a + 1], point[2] - p[a + 2]];
  const d00 = dot(e0, e0), d01 = dot(e0, e1), d11 = dot(e1, e1), d20 = dot(q, e0), d21 = dot(q, e1);
  const det = d00 * d11 - d01 * d01;
  if (!(det > 0)) return [1 / 3, 1 / 3, 1 / 3];
  const v = (d11 * d20 - d01 * d21) / det;
  const w = (d00 * d21 - d01 * d20) / det;
  return [1 - v - w, v, w];
}

function dot(a: readonly number[], b: readonly number[]): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}
