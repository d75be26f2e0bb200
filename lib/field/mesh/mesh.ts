/**
 * The growth surface as the field engine sees it: a triangle mesh on typed arrays.
 *
 * Faces are counter-clockwise seen from the side the coat grows on, so a face normal
 * (right-hand rule) points out of the skin.
 */
/** A point or a direction in space: x, y, z in the surface's units. */
export type Vec3 = [number, number, number];

export interface TriangleMesh {
  /** x, y, z of each vertex, in the surface's declared units. */
  readonly positions: Float64Array;
  /** Three vertex indices per face. */
  readonly triangles: Uint32Array;
  /**
   * For each vertex as numbered in the source file, the welded vertex it became.
   * Present when the mesh came from a file; several file vertices may map to one.
   */
  readonly fileVertexToVertex?: Uint32Array;
  /** Named face groups (OBJ `g`/`o`), when the file had them. */
  readonly groups?: FaceGroups;
  /**
   * The file polygon (0-based, in file order) each triangle was cut from. Present when the mesh
   * came from a file; for STL and glTF, whose faces are triangles, the file's triangle.
   */
  readonly facePolygon?: Uint32Array;
  /**
   * For each triangle corner (3 per face, in the triangle's own order), which corner of its file
   * polygon it is (0 … n − 1 in the polygon's order as written). Present with `facePolygon`.
   */
  readonly faceCorners?: Uint32Array;
  /**
   * u, v of each triangle corner (6 numbers per face), when every corner of the file had a
   * texture coordinate: OBJ `vt`, PLY `s t` / `u v` / `texture_u texture_v`, glTF `TEXCOORD_0`
   * (glTF's v is turned to 1 − v, so that every format has its origin at the bottom left, as
   * OBJ and USD have). A UV-split vertex has one welded position but a UV per corner.
   */
  readonly cornerUvs?: Float32Array;
  /** The file's own polygons, for writing the surface back in the artist's numbering. */
  readonly polygons?: SourcePolygons;
}

/** The faces as the file lists them: polygons of any size, corners as file vertex numbers. */
export interface SourcePolygons {
  /** Polygon i has corners `corners[start[i]] … corners[start[i + 1] − 1]`. */
  readonly start: Uint32Array;
  /** File vertex (0-based) of each corner; `mesh.fileVertexToVertex` gives its welded vertex. */
  readonly corners: Uint32Array;
  /** u, v per polygon corner (2 per corner), when every corner had one; as `cornerUvs`. */
  readonly uvs?: Float32Array;
}

export interface FaceGroups {
  readonly names: readonly string[];
  /** Index into `names` for each face. */
  readonly groupOfFace: Uint16Array;
}

export function vertexCount(mesh: TriangleMesh): number {
  return mesh.positions.length / 3;
}

export function faceCount(mesh: TriangleMesh): number {
  return mesh.triangles.length / 3;
}
