import { describe, expect, it } from 'vitest';
import { faceAreas, faceNormals } from '@/lib/field/mesh/geometry';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, genusTwoSurface, gridPlane, icosphere, latitudeRingVertices, torus, uvSphere } from '@/tests/fixtures/shapes';
import { buildTopology } from '@/lib/field/mesh/topology';

/** Signed volume enclosed by a closed mesh; positive when its faces wind counter-clockwise seen from outside. */
function signedVolume(mesh: TriangleMesh): number {
  // Source: the divergence theorem applied to the tetrahedra spanned by the origin and each face,
  // V = (1/6) Σ a · (b × c) (e.g. Zhang and Chen, "Efficient feature extraction for 2D/3D objects
  // in mesh representation", ICIP 2001).
  const p = mesh.positions;
  const t = mesh.triangles;
  let volume = 0;
  for (let f = 0; f < t.length / 3; f++) {
    const [a, b, c] = [0, 1, 2].map((k) => 3 * t[3 * f + k]);
    volume +=
      p[a] * (p[b + 1] * p[c + 2] - p[b + 2] * p[c + 1]) -
      p[a + 1] * (p[b] * p[c + 2] - p[b + 2] * p[c]) +
      p[a + 2] * (p[b] * p[c + 1] - p[b + 1] * p[c]);
  }
  return volume / 6;
}

function counts(mesh: TriangleMesh): [number, number] {
  return [mesh.positions.length / 3, mesh.triangles.length / 3];
}

describe('test surfaces', () => {
  it('have the promised sizes', () => {
    // Source: an icosahedron has 12 vertices and 20 faces, and each split into four adds a vertex
    // per edge (E = 3F/2) and quadruples the faces; the other counts follow from Euler's formula
    // V − E + F = χ for the sphere (2), torus (0) and disc (1).
    expect(counts(icosphere(0))).toEqual([12, 20]);
    expect(counts(icosphere(3))).toEqual([10 * 64 + 2, 20 * 64]);
    expect(counts(uvSphere(6, 10))).toEqual([2 + 5 * 10, 2 * 5 * 10]);
    expect(counts(torus(2, 1, 9, 7))).toEqual([63, 126]);
    expect(counts(disc(3, 8))).toEqual([1 + 24, 5 * 8]);
    expect(counts(gridPlane(4, 3))).toEqual([20, 24]);
  });

  it('are manifold, connected and wind counter-clockwise seen from outside', () => {
    for (const mesh of [icosphere(2), uvSphere(6, 10), torus(2, 1, 9, 7), genusTwoSurface(), genusTwoSurface({ resolution: 1, smoothingSteps: 0 })]) {
      const topology = buildTopology(mesh);
      expect(topology.componentCount).toBe(1);
      expect(topology.boundaryLoops.length).toBe(0);
      expect(signedVolume(mesh)).toBeGreaterThan(0);
    }
    for (const mesh of [disc(3, 8), gridPlane(4, 3, 2, 1)]) {
      expect(buildTopology(mesh).boundaryLoops.length).toBe(1);
      const normals = faceNormals(mesh);
      for (let f = 0; f < normals.length / 3; f++) expect(normals[3 * f + 2]).toBeCloseTo(1, 14);
    }
  });

  it('put icosphere vertices on the sphere', () => {
    const mesh = icosphere(2, 1.5);
    for (let v = 0; v < mesh.positions.length / 3; v++) expect(Math.hypot(...mesh.positions.subarray(3 * v, 3 * v + 3))).toBeCloseTo(1.5, 14);
  });

  it('build the genus-2 slab with the volume of a 5 × 3 × 1 box less two unit holes', () => {
    expect(signedVolume(genusTwoSurface({ resolution: 3, smoothingSteps: 0 }))).toBeCloseTo(13, 12);
    // Taubin smoothing rounds the edges but keeps the shape's size.
    expect(signedVolume(genusTwoSurface())).toBeGreaterThan(11);
    expect(signedVolume(genusTwoSurface())).toBeLessThan(14);
  });

  it('give the smoothed genus-2 surface no sliver faces', () => {
    const mesh = genusTwoSurface();
    const areas = faceAreas(mesh);
    expect(Math.min(...areas) / Math.max(...areas)).toBeGreaterThan(0.05);
  });

  it('pick circles of latitude that are loops of mesh edges at the stated polar angle', () => {
    const [rings, segments, radius] = [8, 12, 2];
    const mesh = uvSphere(rings, segments, radius);
    const topology = buildTopology(mesh);
    const edges = new Set<string>();
    for (let h = 0; h < mesh.triangles.length; h++) edges.add(`${mesh.triangles[h]},${mesh.triangles[h - (h % 3) + ((h + 1) % 3)]}`);
    for (let ring = 1; ring < rings; ring++) {
      const { vertices, polarAngle } = latitudeRingVertices(rings, segments, ring);
      expect(vertices.length).toBe(segments);
      for (let j = 0; j < segments; j++) {
        const v = vertices[j];
        const w = vertices[(j + 1) % segments];
        expect(edges.has(`${v},${w}`) || edges.has(`${w},${v}`)).toBe(true);
        expect(mesh.positions[3 * v + 2]).toBeCloseTo(radius * Math.cos(polarAngle), 14);
        // Increasing longitude: counter-clockwise seen from +z.
        const p = mesh.positions;
        expect(p[3 * v] * p[3 * w + 1] - p[3 * v + 1] * p[3 * w]).toBeGreaterThan(0);
      }
      expect(topology.isBoundaryVertex[vertices[0]]).toBe(0);
    }
    expect(() => latitudeRingVertices(rings, segments, 0)).toThrow(/numbered 1 to 7/);
  });
});
