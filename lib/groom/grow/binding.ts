import { faceAreas, type TriangleMesh } from '../../field';
import { GroomError } from '../errors';
import type { Roots } from './roots';

/**
 * Where each guide grows, in the terms of the surface file the groomer uploaded, so a pipeline
 * can bind the guides to the skin (simulation, a deformed or re-sculpted character) without
 * knowing how Whorlwind triangulated and welded it.
 */
export interface RootBinding {
  /** The file polygon (0-based, file order) each root lies in. */
  readonly polygon: Uint32Array;
  /** Which triangle of that polygon (0 … n − 3, in the order the reader cut it). */
  readonly triangle: Uint32Array;
  /** The three polygon corners (0-based, ascending) of that triangle, 3 per root. */
  readonly corners: Uint32Array;
  /** The root's weights on those corners, in the same order (3 per root, summing to 1). */
  readonly weights: Float64Array;
  /** u, v at the root, interpolated from its triangle's corner UVs, when the surface has UVs (2 per root). */
  readonly uv?: Float64Array;
}

/**
 * States roots (a face of `mesh` and weights on its corners) in the file's numbering.
 *
 * Guarantees: for every root, Σ weights[i] · (position of polygon corner corners[i]) is the
 * root's position on the welded mesh (up to rounding), and `uv` is the same combination of the
 * corners' UVs. A mesh not read from a file (no `facePolygon`) has its triangles as polygons:
 * polygon = face, corners 0, 1, 2.
 */
export function bindRoots(mesh: TriangleMesh, face: Uint32Array, barycentric: Float64Array): RootBinding {
  const n = face.length;
  const polygon = new Uint32Array(n);
  const triangle = new Uint32Array(n);
  const corners = new Uint32Array(3 * n);
  const weights = new Float64Array(3 * n);
  const uvs = mesh.cornerUvs;
  const uv = uvs ? new Float64Array(2 * n) : undefined;
  const nF = mesh.triangles.length / 3;
  // A polygon's triangles are consecutive faces, so a face's place among them is a running count.
  const triangleOfFace = new Uint32Array(nF);
  if (mesh.facePolygon) for (let f = 1; f < nF; f++) if (mesh.facePolygon[f] === mesh.facePolygon[f - 1]) triangleOfFace[f] = triangleOfFace[f - 1] + 1;
  const order = [0, 1, 2];
  for (let g = 0; g < n; g++) {
    const f = face[g];
    polygon[g] = mesh.facePolygon ? mesh.facePolygon[f] : f;
    triangle[g] = triangleOfFace[f];
    const cornerOf = (k: number) => (mesh.faceCorners ? mesh.faceCorners[3 * f + k] : k);
    order.sort((a, b) => cornerOf(a) - cornerOf(b));
    for (let i = 0; i < 3; i++) {
      corners[3 * g + i] = cornerOf(order[i]);
      weights[3 * g + i] = barycentric[3 * g + order[i]];
    }
    if (uv && uvs) {
      for (let k = 0; k < 3; k++) {
        uv[2 * g] += barycentric[3 * g + k] * uvs[6 * f + 2 * k];
        uv[2 * g + 1] += barycentric[3 * g + k] * uvs[6 * f + 2 * k + 1];
      }
    }
  }
  return { polygon, triangle, corners, weights, ...(uv ? { uv } : {}) };
}

/**
 * Roots sampled on `from` and placed on `to` by face and barycentric weights: the roots of a groom
 * after a sculpt pass, which moves vertices and keeps the topology, so every guide keeps its
 * number, polygon and weights while its root follows the skin.
 *
 * Guarantees: the same faces and weights as `sample(from)`, positions evaluated on `to`; or a
 * GroomError `roots-surface-mismatch` when the two meshes do not have the same triangles over the
 * same vertex numbers (a retopology, or a sculpt that changed how a polygon is cut), which needs
 * a transfer instead.
 */
export function rootsOnSculpt(from: TriangleMesh, to: TriangleMesh, sample: (mesh: TriangleMesh, faceArea: Float64Array) => Roots): Roots {
  const same =
    from.positions.length === to.positions.length &&
    from.triangles.length === to.triangles.length &&
    from.triangles.every((v, i) => v === to.triangles[i]) &&
    (!from.facePolygon || !to.facePolygon || from.facePolygon.every((v, i) => v === to.facePolygon![i]));
  if (!same) {
    throw new GroomError(
      'roots-surface-mismatch',
      'The surface the roots were sampled on does not have the same polygons and vertices as this one, so the guides cannot keep their places; move the groom with a transfer instead.',
    );
  }
  const roots = sample(from, faceAreas(from));
  const position = new Float64Array(3 * roots.count);
  const p = to.positions;
  for (let g = 0; g < roots.count; g++) {
    const f = roots.face[g];
    for (let k = 0; k < 3; k++) {
      const v = 3 * to.triangles[3 * f + k];
      const w = roots.barycentric[3 * g + k];
      position[3 * g] += w * p[v];
      position[3 * g + 1] += w * p[v + 1];
      position[3 * g + 2] += w * p[v + 2];
    }
  }
  return { ...roots, position };
}
