import {
  boundingBox,
  faceAreas,
  now,
  prepareHarmonic,
  prepareSurface,
  vertexNormals,
  type PrepareSurfaceOptions,
  type FieldSurface,
  type HarmonicInterpolator,
  type TriangleMesh,
} from '../../field';
import { buildNearestVertex, type NearestVertex } from './nearest-vertex';
import { buildSkin, type Skin } from './skin';

/**
 * A growth surface made ready for grooming: the field engine's prepared surface, the skin's
 * spatial index, areas and normals. Prepare once per surface and boundary mode; every spec and
 * every guide set on it reuses this.
 */
export interface GroomSurface {
  readonly mesh: TriangleMesh;
  readonly field: FieldSurface;
  readonly skin: Skin;
  readonly faceArea: Float64Array;
  /** Unit angle-weighted normal per vertex (3 per vertex). */
  readonly vertexNormal: Float64Array;
  /** Length of the bounding box diagonal, in surface units. */
  readonly diagonal: number;
  /** Mean edge length, in surface units. */
  readonly meanEdge: number;
  /** Nearest-vertex look-up (built on first use). */
  nearestVertex(): NearestVertex;
  /** Harmonic blending of pinned values (factored on first use). */
  harmonic(): HarmonicInterpolator;
  /** Seconds spent preparing, by step. */
  readonly setupSeconds: { readonly field: number; readonly skin: number };
}


/**
 * Prepares a surface for grooming.
 *
 * Guarantees: throws the field engine's FieldError for a surface it cannot work with
 * (non-manifold, inconsistent orientation, no faces); the mesh's arrays are not modified. The
 * options are prepareSurface's (a stored ordering, a check vouched for) and change no result.
 */
export function prepareGroomSurface(mesh: TriangleMesh, options: PrepareSurfaceOptions = {}): GroomSurface {
  const t0 = now();
  const field = prepareSurface(mesh, { ...options, boundary: options.boundary ?? 'free' });
  const t1 = now();
  const skin = buildSkin(mesh, field.topology);
  const t2 = now();
  const box = boundingBox(mesh) ?? { min: [0, 0, 0], max: [0, 0, 0] };
  const p = mesh.positions;
  const tri = mesh.triangles;
  let edgeSum = 0;
  for (let h = 0; h < tri.length; h++) {
    const a = 3 * tri[h], b = 3 * tri[h - (h % 3) + ((h + 1) % 3)];
    edgeSum += Math.hypot(p[b] - p[a], p[b + 1] - p[a + 1], p[b + 2] - p[a + 2]);
  }
  let nearest: NearestVertex | undefined;
  let harmonic: HarmonicInterpolator | undefined;
  return {
    mesh,
    field,
    skin,
    faceArea: faceAreas(mesh),
    vertexNormal: vertexNormals(mesh),
    diagonal: Math.hypot(box.max[0] - box.min[0], box.max[1] - box.min[1], box.max[2] - box.min[2]),
    meanEdge: edgeSum / Math.max(1, tri.length),
    nearestVertex: () => (nearest ??= buildNearestVertex(p)),
    harmonic: () => (harmonic ??= prepareHarmonic(mesh)),
    setupSeconds: { field: (t1 - t0) / 1000, skin: (t2 - t1) / 1000 },
  };
}
