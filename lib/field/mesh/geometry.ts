/**
 * What the surface's shape says, as opposed to its connectivity: corner angles, curvature (angle
 * defects), areas, normals, and the counts (χ, genus, components) that fix the index budget.
 */
import { faceCount, vertexCount, type TriangleMesh } from './mesh';
import { faceOfHalfedge, type Topology } from './topology';

/**
 * Interior angle of each face at each of its corners, indexed by halfedge: entry `h` is the angle
 * of face `h / 3` at vertex `triangles[h]`, between its two sides there.
 *
 * Guarantees: values in [0, π]; computed as atan2(|u × v|, u · v), which stays accurate for
 * angles near 0 and π where acos loses half its digits; the three angles of a face sum to π up to
 * rounding. A corner with a zero-length side gets 0.
 */
export function cornerAngles(mesh: TriangleMesh): Float64Array {
  const p = mesh.positions;
  const tri = mesh.triangles;
  const angles = new Float64Array(tri.length);
  for (let h = 0; h < tri.length; h += 3) {
    const a = 3 * tri[h];
    const b = 3 * tri[h + 1];
    const c = 3 * tri[h + 2];
    const abx = p[b] - p[a], aby = p[b + 1] - p[a + 1], abz = p[b + 2] - p[a + 2];
    const bcx = p[c] - p[b], bcy = p[c + 1] - p[b + 1], bcz = p[c + 2] - p[b + 2];
    const cax = p[a] - p[c], cay = p[a + 1] - p[c + 1], caz = p[a + 2] - p[c + 2];
    // |u × v| is twice the face's area at every corner, so one cross product serves all three
    const nx = aby * bcz - abz * bcy, ny = abz * bcx - abx * bcz, nz = abx * bcy - aby * bcx;
    const cross = Math.sqrt(nx * nx + ny * ny + nz * nz);
    angles[h] = Math.atan2(cross, -(abx * cax + aby * cay + abz * caz));
    angles[h + 1] = Math.atan2(cross, -(bcx * abx + bcy * aby + bcz * abz));
    angles[h + 2] = Math.atan2(cross, -(cax * bcx + cay * bcy + caz * bcz));
  }
  return angles;
}

/**
 * Angle defect per vertex: 2π − (sum of corner angles) at an interior vertex, the discrete
 * Gaussian curvature integrated over the vertex's area; π − (sum of corner angles) at a boundary
 * vertex, the discrete geodesic curvature of the boundary there. 0 at vertices no face uses.
 *
 * Guarantees (discrete Gauss–Bonnet): on a manifold, consistently oriented mesh the defects sum to
 * 2π × `eulerCharacteristic(topology)`, exactly in exact arithmetic, since the corner angles of
 * each face sum to π. `angles` may be passed when already computed (`cornerAngles(mesh)`).
 */
export function angleDefects(mesh: TriangleMesh, topology: Topology, angles: Float64Array = cornerAngles(mesh)): Float64Array {
  const nV = topology.vertexCount;
  const sum = new Float64Array(nV);
  const tri = mesh.triangles;
  for (let h = 0; h < tri.length; h++) sum[tri[h]] += angles[h];
  const defects = new Float64Array(nV);
  for (let v = 0; v < nV; v++) {
    if (topology.vertexHalfedge[v] === -1) continue;
    defects[v] = (topology.isBoundaryVertex[v] ? Math.PI : 2 * Math.PI) - sum[v];
  }
  return defects;
}

/** Twice the area vector (b − a) × (c − a) of face f, written into `out` at `3 * at`. */
function areaVector(p: Float64Array, tri: Uint32Array, f: number, out: Float64Array, at: number): void {
  const a = 3 * tri[3 * f];
  const b = 3 * tri[3 * f + 1];
  const c = 3 * tri[3 * f + 2];
  const ux = p[b] - p[a], uy = p[b + 1] - p[a + 1], uz = p[b + 2] - p[a + 2];
  const vx = p[c] - p[a], vy = p[c + 1] - p[a + 1], vz = p[c + 2] - p[a + 2];
  out[3 * at] = uy * vz - uz * vy;
  out[3 * at + 1] = uz * vx - ux * vz;
  out[3 * at + 2] = ux * vy - uy * vx;
}

/** Area of each face. Guarantees: non-negative; 0 for a face whose corners are collinear. */
export function faceAreas(mesh: TriangleMesh): Float64Array {
  const nF = faceCount(mesh);
  const areas = new Float64Array(nF);
  const n = new Float64Array(3);
  for (let f = 0; f < nF; f++) {
    areaVector(mesh.positions, mesh.triangles, f, n, 0);
    areas[f] = 0.5 * Math.hypot(n[0], n[1], n[2]);
  }
  return areas;
}

/**
 * Unit normal of each face (x, y, z per face), by the right-hand rule on the face's winding, so
 * it points out of the skin. Guarantees: unit length, or (0, 0, 0) for a face of zero area.
 */
export function faceNormals(mesh: TriangleMesh): Float64Array {
  const nF = faceCount(mesh);
  const normals = new Float64Array(3 * nF);
  for (let f = 0; f < nF; f++) {
    areaVector(mesh.positions, mesh.triangles, f, normals, f);
    const length = Math.hypot(normals[3 * f], normals[3 * f + 1], normals[3 * f + 2]);
    if (length > 0) for (let k = 0; k < 3; k++) normals[3 * f + k] /= length;
  }
  return normals;
}

/**
 * Unit normal per vertex (x, y, z per vertex): the face normals around it weighted by the face's
 * corner angle at the vertex, which, unlike area weighting, does not change when a face is split.
 * Guarantees: unit length, or (0, 0, 0) at a vertex no face of non-zero area uses or where the
 * weighted normals cancel.
 */
export function vertexNormals(mesh: TriangleMesh): Float64Array {
  const normals = new Float64Array(3 * vertexCount(mesh));
  const faces = faceNormals(mesh);
  const angles = cornerAngles(mesh);
  const tri = mesh.triangles;
  for (let h = 0; h < tri.length; h++) {
    const f = faceOfHalfedge(h);
    const v = tri[h];
    for (let k = 0; k < 3; k++) normals[3 * v + k] += angles[h] * faces[3 * f + k];
  }
  for (let v = 0; v < normals.length / 3; v++) {
    const length = Math.hypot(normals[3 * v], normals[3 * v + 1], normals[3 * v + 2]);
    if (length > 0) for (let k = 0; k < 3; k++) normals[3 * v + k] /= length;
  }
  return normals;
}

/** Sums with Neumaier's compensation, so totals over millions of faces keep their digits. */
function compensatedSum(values: Float64Array): number {
  let sum = 0;
  let carry = 0;
  for (const x of values) {
    const t = sum + x;
    carry += Math.abs(sum) >= Math.abs(x) ? sum - t + x : x - t + sum;
    sum = t;
  }
  return sum + carry;
}

/** Total area of the surface. Guarantees: the sum of `faceAreas`, accurate to a few ulps. */
export function surfaceArea(mesh: TriangleMesh): number {
  return compensatedSum(faceAreas(mesh));
}

export interface BoundingBox {
  readonly min: readonly [number, number, number];
  readonly max: readonly [number, number, number];
}

/**
 * Axis-aligned box around the vertices that faces use and whose coordinates are all finite.
 * Guarantees: null when there is no such vertex.
 */
export function boundingBox(mesh: TriangleMesh): BoundingBox | null {
  const p = mesh.positions;
  const used = new Uint8Array(vertexCount(mesh));
  for (const v of mesh.triangles) used[v] = 1;
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  let any = false;
  for (let v = 0; v < used.length; v++) {
    if (!used[v] || !Number.isFinite(p[3 * v]) || !Number.isFinite(p[3 * v + 1]) || !Number.isFinite(p[3 * v + 2])) continue;
    any = true;
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k], p[3 * v + k]);
      max[k] = Math.max(max[k], p[3 * v + k]);
    }
  }
  return any ? { min, max } : null;
}

/**
 * Euler characteristic V − E + F, counting only the vertices that faces use (an isolated vertex
 * is not part of the surface). Guarantees: the sum over `componentFacts`.
 */
export function eulerCharacteristic(topology: Topology): number {
  let used = 0;
  for (let v = 0; v < topology.vertexCount; v++) if (topology.vertexHalfedge[v] !== -1) used++;
  return used - topology.edgeCount + topology.faceCount;
}

export interface ComponentFacts {
  readonly faceCount: number;
  readonly vertexCount: number;
  readonly edgeCount: number;
  readonly boundaryLoopCount: number;
  readonly eulerCharacteristic: number;
  /** From χ = 2 − 2g − b: the number of handles. */
  readonly genus: number;
}

/**
 * Counts per connected component (as numbered by `topology.componentOfFace`): faces, used
 * vertices, edges, boundary loops, Euler characteristic and genus.
 *
 * Guarantees: the genus is a whole number ≥ 0 for every component, because `buildTopology` only
 * accepts manifold, consistently oriented meshes, and χ = 2 − 2g − b holds for each connected
 * orientable surface with b boundary loops.
 */
export function componentFacts(topology: Topology): ComponentFacts[] {
  const n = topology.componentCount;
  const faces = new Float64Array(n);
  const vertices = new Float64Array(n);
  const edges = new Float64Array(n);
  const loops = new Float64Array(n);
  const component = (h: number) => topology.componentOfFace[faceOfHalfedge(h)];
  for (let f = 0; f < topology.faceCount; f++) faces[topology.componentOfFace[f]]++;
  for (let v = 0; v < topology.vertexCount; v++) {
    const h = topology.vertexHalfedge[v];
    if (h !== -1) vertices[component(h)]++;
  }
  for (let e = 0; e < topology.edgeCount; e++) edges[component(topology.edgeHalfedge[e])]++;
  for (const loop of topology.boundaryLoops) loops[component(loop[0])]++;
  return Array.from({ length: n }, (_, c) => {
    const chi = vertices[c] - edges[c] + faces[c];
    return {
      faceCount: faces[c],
      vertexCount: vertices[c],
      edgeCount: edges[c],
      boundaryLoopCount: loops[c],
      eulerCharacteristic: chi,
      genus: (2 - chi - loops[c]) / 2,
    };
  });
}

/** Total genus: the sum of the components' genera (see `componentFacts`). */
export function genus(topology: Topology): number {
  return componentFacts(topology).reduce((sum, c) => sum + c.genus, 0);
}
