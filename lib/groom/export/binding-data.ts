/**
 * What every export may carry besides the curves, so a pipeline can bind the guides to the skin:
 * the growth surface in the file's own numbering and where the groom came from. Each writer puts
 * it in its own format's idiom (USD primvars and a Mesh prim, glTF accessors named in `extras`,
 * OBJ objects and comment records); lib/groom/README.md describes each.
 */
import type { TriangleMesh } from '../../field';

/** Where a file came from, written into it (USD `customLayerData`, glTF `asset.extras`, an OBJ comment). */
export interface Provenance {
  readonly groomId?: string;
  readonly specRevision?: number;
  /** The Whorlwind release that wrote the file (package.json's version). */
  readonly whorlwindVersion: string;
}

export interface BindingExportOptions {
  /** Write the growth surface too (USD `Mesh` prim, glTF mesh, OBJ object), so the roots can be rebuilt from the file alone. */
  readonly surface?: TriangleMesh;
  readonly provenance?: Provenance;
}

/** The surface as the USD and OBJ writers write it: the file's vertices and polygons. */
export interface WrittenSurface {
  /** x, y, z of every file vertex (its welded position), numbered as in the file. */
  readonly points: Float64Array;
  /** Corners of each written polygon. */
  readonly counts: Uint32Array;
  /** File vertex of each corner, polygon after polygon. */
  readonly indices: Uint32Array;
  /** u, v per corner (same order as `indices`), when the surface has UVs. */
  readonly uvs?: Float32Array;
  /**
   * The file polygon each written polygon is, present only when the file had polygons of fewer
   * than three corners (left out, as no format accepts them), so that written faces and file
   * polygons differ in numbering.
   */
  readonly sourcePolygon?: Uint32Array;
}

/**
 * The file's polygons in its own numbering. A mesh not read from a file (no `polygons`) is
 * written as its triangles over its vertices.
 *
 * Guarantees: polygon i of the file is written face i (unless `sourcePolygon` says otherwise);
 * corner k of a written polygon is corner k of the file's polygon; a file vertex that welding
 * merged is written at its welded position, so faces that shared it in space still do.
 */
export function writtenSurface(mesh: TriangleMesh): WrittenSurface {
  const source = mesh.polygons;
  if (!source || !mesh.fileVertexToVertex) {
    const counts = new Uint32Array(mesh.triangles.length / 3).fill(3);
    return { points: mesh.positions, counts, indices: mesh.triangles, ...(mesh.cornerUvs ? { uvs: mesh.cornerUvs } : {}) };
  }
  const map = mesh.fileVertexToVertex;
  const points = new Float64Array(3 * map.length);
  for (let v = 0; v < map.length; v++) points.set(mesh.positions.subarray(3 * map[v], 3 * map[v] + 3), 3 * v);
  const nPolygons = source.start.length - 1;
  let kept = 0;
  let keptCorners = 0;
  for (let f = 0; f < nPolygons; f++) {
    const n = source.start[f + 1] - source.start[f];
    if (n >= 3) {
      kept++;
      keptCorners += n;
    }
  }
  if (kept === nPolygons) {
    const counts = new Uint32Array(nPolygons);
    for (let f = 0; f < nPolygons; f++) counts[f] = source.start[f + 1] - source.start[f];
    return { points, counts, indices: source.corners, ...(source.uvs ? { uvs: source.uvs } : {}) };
  }
  const counts = new Uint32Array(kept);
  const indices = new Uint32Array(keptCorners);
  const uvs = source.uvs ? new Float32Array(2 * keptCorners) : undefined;
  const sourcePolygon = new Uint32Array(kept);
  for (let f = 0, i = 0, c = 0; f < nPolygons; f++) {
    const start = source.start[f], n = source.start[f + 1] - start;
    if (n < 3) continue;
    counts[i] = n;
    sourcePolygon[i++] = f;
    indices.set(source.corners.subarray(start, start + n), c);
    if (uvs) uvs.set(source.uvs!.subarray(2 * start, 2 * (start + n)), 2 * c);
    c += n;
  }
  return { points, counts, indices, sourcePolygon, ...(uvs ? { uvs } : {}) };
}

/**
 * Each triangle of the mesh with its corners turned to start at its lowest polygon corner: the
 * reader cuts polygons into triangles whose polygon corners rise cyclically, so after the turn
 * they rise outright, the order in which a root's weights are given, and the winding is kept.
 * Returns, per face, which of its corners (0, 1, 2) comes first.
 */
export function firstCornerByPolygonOrder(mesh: TriangleMesh): Uint8Array {
  const nF = mesh.triangles.length / 3;
  const first = new Uint8Array(nF);
  const corners = mesh.faceCorners;
  if (!corners) return first;
  for (let f = 0; f < nF; f++) {
    const a = corners[3 * f], b = corners[3 * f + 1], c = corners[3 * f + 2];
    first[f] = a < b && a < c ? 0 : b < c ? 1 : 2;
  }
  return first;
}
