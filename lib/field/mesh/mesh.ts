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
