import type { TriangleMesh } from '@/lib/field';
import { growGuides } from '@/lib/groom/grow/guides';
import { solveGroomField } from '@/lib/groom/place/request';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { mirrorPoint, planeDistance, type MirrorPlane } from '@/lib/groom/spec/symmetry';

/** Prepares, solves and grows a spec on a mesh, as the app does. */
export function groomOn(mesh: TriangleMesh, input: GroomSpecInput) {
  const spec = parseGroomSpec(input);
  const surface = prepareGroomSurface(mesh, { boundary: spec.field.boundary });
  const solved = solveGroomField(spec, surface);
  return { spec, surface, solved, ...growGuides(surface, solved, spec) };
}

/** The same mesh with its faces split into named groups by a rule. */
export function withGroups(mesh: TriangleMesh, names: string[], groupOf: (cx: number, cy: number, cz: number) => number): TriangleMesh {
  const nF = mesh.triangles.length / 3;
  const groupOfFace = new Uint16Array(nF);
  const p = mesh.positions;
  for (let f = 0; f < nF; f++) {
    const c = [0, 1, 2].map((k) => [0, 1, 2].reduce((s, j) => s + p[3 * mesh.triangles[3 * f + j] + k], 0) / 3);
    groupOfFace[f] = groupOf(c[0], c[1], c[2]);
  }
  return { ...mesh, groups: { names, groupOfFace } };
}

/** Distance from each of the first `sample` points to its nearest other point. */
export function nearestNeighbourDistances(position: Float64Array, sample: number): Float64Array {
  const n = position.length / 3;
  const out = new Float64Array(Math.min(sample, n));
  for (let i = 0; i < out.length; i++) {
    let best = Infinity;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      const d = Math.hypot(position[3 * i] - position[3 * j], position[3 * i + 1] - position[3 * j + 1], position[3 * i + 2] - position[3 * j + 2]);
      if (d < best) best = d;
    }
    out[i] = best;
  }
  return out;
}

/** A GLB's JSON and the values of an accessor (float or unsigned int components). */
export function readGlb(bytes: Uint8Array) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const jsonLength = view.getUint32(12, true);
  const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
  const bin = bytes.subarray(28 + jsonLength);
  const values = (index: number): number[] => {
    const accessor = json.accessors[index];
    const bufferView = json.bufferViews[accessor.bufferView];
    const width = { SCALAR: 1, VEC2: 2, VEC3: 3 }[accessor.type as 'SCALAR'];
    const data = new DataView(bin.buffer, bin.byteOffset + bufferView.byteOffset, bufferView.byteLength);
    return Array.from({ length: accessor.count * width }, (_x, i) => (accessor.componentType === 5126 ? data.getFloat32(4 * i, true) : data.getUint32(4 * i, true)));
  };
  return { json, values };
}

/**
 * For every guide rooted off the plane (of guides of n points, stored guide after guide), the largest distance over ALL its points to the mirror
 * image of the guide rooted nearest its root's mirror image; and how many were paired.
 */
export function worstMirrorGap(points: ArrayLike<number>, count: number, n: number, plane: MirrorPlane): { gap: number; paired: number } {
  const root = (g: number) => [points[3 * n * g], points[3 * n * g + 1], points[3 * n * g + 2]];
  let gap = 0, paired = 0;
  for (let g = 0; g < count; g++) {
    if (Math.abs(planeDistance(plane, root(g))) <= 1e-9) continue;
    const m = mirrorPoint(plane, root(g));
    let best = -1, bestDistance = Infinity;
    for (let h = 0; h < count; h++) {
      const r = root(h);
      const d = Math.hypot(r[0] - m[0], r[1] - m[1], r[2] - m[2]);
      if (d < bestDistance) [best, bestDistance] = [h, d];
    }
    for (let i = 0; i < n; i++) {
      const a = mirrorPoint(plane, [points[3 * (n * g + i)], points[3 * (n * g + i) + 1], points[3 * (n * g + i) + 2]]);
      const b = 3 * (n * best + i);
      gap = Math.max(gap, Math.hypot(a[0] - points[b], a[1] - points[b + 1], a[2] - points[b + 2]));
    }
    paired++;
  }
  return { gap, paired };
}
