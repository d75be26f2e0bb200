import { describe, expect, it } from 'vitest';
import { ringLaplacian } from '@/lib/field/connection/ring-solver';
import { symmetricFromTriplets } from '@/lib/field/linalg/sparse';
import { buildTopology, nextHalfedge, type Topology } from '@/lib/field/mesh/topology';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, genusTwoSurface, icosphere, torus } from '@/tests/fixtures/shapes';

/** The matrix from one (a, a, 1), (b, b, 1), (a, b, −1) triplet per interior edge: C Cᵀ by its definition. */
function fromTriplets(topology: Topology, rowOfVertex: Int32Array, n: number) {
  const rows: number[] = [];
  const cols: number[] = [];
  const values: number[] = [];
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    const a = rowOfVertex[topology.triangles[h]];
    const b = rowOfVertex[topology.triangles[nextHalfedge(h)]];
    if (a >= 0) rows.push(a), cols.push(a), values.push(1);
    if (b >= 0) rows.push(b), cols.push(b), values.push(1);
    if (a >= 0 && b >= 0) rows.push(a), cols.push(b), values.push(-1);
  }
  return symmetricFromTriplets(n, rows, cols, values);
}

/** Rows for the vertices `keep` says, numbered in vertex order. */
function rowsWhere(topology: Topology, keep: (v: number) => boolean): { rowOfVertex: Int32Array; n: number } {
  const rowOfVertex = new Int32Array(topology.vertexCount).fill(-1);
  let n = 0;
  for (let v = 0; v < topology.vertexCount; v++) if (keep(v)) rowOfVertex[v] = n++;
  return { rowOfVertex, n };
}

describe('ringLaplacian', () => {
  const cases: [string, TriangleMesh, (t: Topology) => (v: number) => boolean][] = [
    ['a torus, one vertex dropped', torus(3, 1, 24, 12), (t) => (v) => v !== t.vertexCount - 1],
    ['an icosphere, one vertex dropped', icosphere(2), () => (v) => v !== 0],
    ['a disc, interior vertices only (free boundary)', disc(6, 20), (t) => (v) => !t.isBoundaryVertex[v]],
    ['a disc, boundary rows too (held boundary)', disc(6, 20), () => (v) => v !== 0],
    ['a genus-two surface, every other vertex', genusTwoSurface(), () => (v) => v % 2 === 0],
  ];
  for (const [label, mesh, keep] of cases) {
    it(`is entry for entry the matrix of the triplets on ${label}`, () => {
      const topology = buildTopology(mesh);
      const { rowOfVertex, n } = rowsWhere(topology, keep(topology));
      const direct = ringLaplacian(topology, rowOfVertex, n);
      const reference = fromTriplets(topology, rowOfVertex, n);
      expect(direct.n).toBe(reference.n);
      expect(Array.from(direct.colPtr)).toEqual(Array.from(reference.colPtr));
      expect(Array.from(direct.rowIdx)).toEqual(Array.from(reference.rowIdx));
      expect(Array.from(direct.values)).toEqual(Array.from(reference.values));
    });
  }
});
