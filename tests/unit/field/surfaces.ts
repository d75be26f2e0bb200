import * as bunny from 'bunny';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';

/** The Stanford bunny as the `bunny` package stores it (Stanford 3D Scanning Repository). */
export function stanfordBunny(): TriangleMesh {
  return {
    positions: Float64Array.from(bunny.positions.flat()),
    triangles: Uint32Array.from(bunny.cells.flat()),
  };
}

/** Several meshes side by side as one mesh, vertex indices shifted. */
export function concatenate(...meshes: TriangleMesh[]): TriangleMesh {
  const positions: number[] = [];
  const triangles: number[] = [];
  for (const m of meshes) {
    const offset = positions.length / 3;
    positions.push(...m.positions);
    for (const v of m.triangles) triangles.push(v + offset);
  }
  return { positions: Float64Array.from(positions), triangles: Uint32Array.from(triangles) };
}
