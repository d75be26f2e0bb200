import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { FieldError, prepareSurface, solveField, type BoundaryMode, type TriangleMesh } from '@/lib/field';
import { eulerCharacteristic } from '@/lib/field/mesh/geometry';
import { faceAreas } from '@/lib/field/mesh/geometry';
import { assembleLaplacian, edgeWeights, suggestLayout, type SuggestOptions } from '@/lib/field/suggest';
import { bentTube, disc, genusTwoSurface, gridPlane, icosphere, roundedCube, torus, withHoles } from '@/tests/fixtures/shapes';
import { spreadVertices } from './support';

function suggest(mesh: TriangleMesh, options: SuggestOptions, boundary: BoundaryMode = 'free') {
  const surface = prepareSurface(mesh, { boundary });
  return { surface, layout: suggestLayout(surface, options) };
}

function positionOf(mesh: TriangleMesh, v: number): [number, number, number] {
  return [mesh.positions[3 * v], mesh.positions[3 * v + 1], mesh.positions[3 * v + 2]];
}

/** The 10 × 10 grid sheared and stretched: corners of about 60° to 120°, two of them a single face. */
function skewedSquare(): TriangleMesh {
  const mesh = gridPlane(10, 10);
  const p = mesh.positions;
  for (let v = 0; v < p.length / 3; v++) {
    p[3 * v] += 0.45 * p[3 * v + 1];
    p[3 * v + 1] *= 1 + 0.3 * p[3 * v];
  }
  return mesh;
}

const sumOf = (xs: readonly { index: number }[]) => xs.reduce((s, x) => s + x.index, 0);

describe('suggestLayout: the smoothest field with free singularities', () => {
  // Source: the Poincaré–Hopf theorem — the indices of a direction field with isolated
  // singularities on a closed surface sum to its Euler characteristic, for n-direction fields with
  // indices in multiples of 1/n (e.g. Ray, Vallet, Li, Lévy, "N-Symmetry Direction Field Design",
  // ACM TOG 27(2), 2008, §3). χ of each mesh is counted independently from V − E + F.
  it.each([
    ['an icosphere', 1, () => icosphere(3)],
    ['an icosphere', 2, () => icosphere(3)],
    ['an icosphere', 4, () => icosphere(3)],
    ['a torus', 1, () => torus(2, 0.7, 48, 24)],
    ['a torus', 4, () => torus(2, 0.7, 48, 24)],
    ['a genus-two surface', 1, () => genusTwoSurface({ resolution: 3 })],
    ['a genus-two surface', 4, () => genusTwoSurface({ resolution: 3 })],
    ['a rounded cube', 4, () => roundedCube(10, 0.25)],
  ] as const)('on %s with order %i the suggested indices sum to χ (Poincaré–Hopf)', (_, order, make) => {
    const mesh = make();
    const { surface, layout } = suggest(mesh, { order });
    if (eulerCharacteristic(surface.topology) !== 0) expect(layout.singularities.length).toBeGreaterThan(0);
    for (const s of layout.singularities) {
      expect(s.index).not.toBe(0);
      expect(Math.abs(s.index * order - Math.round(s.index * order))).toBeLessThan(1e-12);
    }
    expect(sumOf(layout.singularities)).toBeCloseTo(eulerCharacteristic(surface.topology), 9);
    expect(eulerCharacteristic(surface.topology)).toBe(mesh.positions.length / 3 - surface.topology.edgeCount + mesh.triangles.length / 3);
  });

  // Source: a torus carries nowhere-vanishing vector fields (χ = 0; Poincaré–Hopf allows it), and
  // the optimal n = 1 field of a torus of revolution has none (Knöppel et al. 2013, the smoothest
  // field there follows the parallels). Here both the absence and the check's ability to fail:
  // the sphere, with the same code, must show singularities.
  it('on a torus with nothing asked, order 1 suggests no singularity', () => {
    expect(suggest(torus(2, 0.7, 48, 24), { order: 1 }).layout.singularities).toEqual([]);
    expect(suggest(torus(3, 0.5, 60, 16), { order: 1 }).layout.singularities).toEqual([]);
    expect(suggest(icosphere(3), { order: 1 }).layout.singularities.length).toBeGreaterThan(0);
  });

  // Source: the classic cross-field result that a smooth cross field on a cube has eight
  // singularities of index +1/4, one at each corner (each corner has angle defect π/2 = 2π · 1/4,
  // and a cross field following the faces turns there; Bommes, Zimmer, Kobbelt, "Mixed-Integer
  // Quadrangulation", ACM TOG 28(3), 2009, show it for cubes; the same count sums to χ = 2).
  it('for a cross field on a cube with rounded edges: eight +1/4 singularities, one at each corner', () => {
    const radius = 0.2;
    const mesh = roundedCube(12, radius);
    const { layout } = suggest(mesh, { order: 4 });
    expect(layout.singularities.map((s) => s.index)).toEqual(Array(8).fill(0.25));
    const corner = 1 - radius + radius / Math.sqrt(3);
    const seen = new Set<string>();
    for (const s of layout.singularities) {
      const p = positionOf(mesh, s.vertex);
      const nearest = p.map((x) => Math.sign(x) * corner);
      expect(Math.hypot(p[0] - nearest[0], p[1] - nearest[1], p[2] - nearest[2])).toBeLessThan(radius);
      seen.add(nearest.map(Math.sign).join());
    }
    expect(seen.size).toBe(8);
  });

  // Source: Poincaré–Hopf on the sphere, χ = 2.
  it('on a sphere the cross field sums to 2 and the line field to 2', () => {
    for (const order of [2, 4]) expect(sumOf(suggest(icosphere(3), { order }).layout.singularities)).toBeCloseTo(2, 12);
  });

  it.each([
    ['icosphere, order 1', () => icosphere(3), 1, 'free'],
    ['rounded cube, order 4', () => roundedCube(12, 0.2), 4, 'free'],
    ['genus-two surface, order 1', () => genusTwoSurface({ resolution: 3 }), 1, 'free'],
    ['disc held tangent, order 1', () => disc(10, 32), 1, 'tangent'],
    ['disc held normal, order 4', () => disc(10, 32), 4, 'normal'],
    ['disc with a free boundary, order 4', () => disc(10, 32), 4, 'free'],
    ['square held tangent, order 4', () => gridPlane(10, 10), 4, 'tangent'],
    ['square held normal, order 1', () => gridPlane(10, 10), 1, 'normal'],
    ['skewed square held tangent, order 3', skewedSquare, 3, 'tangent'],
    ['sphere with three holes, free, order 2', () => withHoles(icosphere(3), spreadVertices(icosphere(3), 3)), 2, 'free'],
    ['bent tapering tube, free, order 4', () => bentTube(1, 0.6, 3, 1.2, 32, 32), 4, 'free'],
    ['torus with one hole, free, order 4', () => withHoles(torus(2, 0.7, 48, 24), [0]), 4, 'free'],
    ['skewed square held normal, order 2', skewedSquare, 2, 'normal'],
  ] as const)('fed back as a request, the suggestion (%s) gives a field with exactly those singularities, measured', (_, make, order, boundary) => {
    const mesh = make();
    const { surface, layout } = suggest(mesh, { order }, boundary);
    const solved = solveField(surface, { order, singularities: layout.singularities });
    const asked = new Map(layout.singularities.map((s) => [s.vertex, s.index]));
    const away: number[] = [];
    solved.measuredIndex.forEach((index, v) => {
      if (Math.abs(index - (asked.get(v) ?? 0)) > 1e-6) away.push(v);
    });
    expect(away).toEqual([]);
    if (boundary !== 'free') expect(sumOf(layout.singularities)).toBeCloseTo(1, 12); // χ of the disc and the square
  });

  // Source: on a flat disc, a vector field is a complex function u(z); with the boundary held
  // tangent, u = i·e^{iφ} on the unit circle, and the smoothest (harmonic) extension is u = i·z,
  // so every face's direction is tangent to the circle through it, with the whorl at the centre.
  // With the boundary held normal, u = −z: every direction points to the centre.
  it.each([
    ['tangent', 0],
    ['normal', Math.PI / 2],
  ] as const)('on a flat disc held %s, every face follows the circles (or the radii) the harmonic extension gives', (mode, turn) => {
    const mesh = disc(10, 64);
    const { layout } = suggest(mesh, { order: 1 }, mode);
    expect(layout.singularities).toEqual([{ vertex: 0, index: 1 }]);
    let worst = 0;
    for (let f = 0; f < mesh.triangles.length / 3; f++) {
      const c = [0, 1].map((d) => [0, 1, 2].reduce((s, k) => s + mesh.positions[3 * mesh.triangles[3 * f + k] + d], 0) / 3);
      const expected = Math.atan2(c[1], c[0]) + Math.PI / 2 + turn;
      const actual = Math.atan2(layout.faceDirection[3 * f + 1], layout.faceDirection[3 * f]);
      worst = Math.max(worst, Math.abs(Math.atan2(Math.sin(actual - expected), Math.cos(actual - expected))));
    }
    // 0.1 rad: the discretisation's own error on this mesh (about 0.07 near the centre, with the
    // clamped dual lengths of its non-Delaunay diagonals); barycentric dual edges spiral by 0.56.
    expect(worst).toBeLessThan(0.1);
  });

  // Source: on a square held tangent, the constant cross field along the sides is smooth and follows
  // the boundary; its only singularities are the four corners, where the boundary turns by π/2 =
  // 2π · 1/4 (Poincaré–Hopf for the disc: 4 · 1/4 = χ = 1). A corner with a single face hands its
  // turning to the next vertex along the boundary, as the held rings of the connection do.
  it('on a square held tangent, a cross field has a +1/4 at each corner and nothing else', () => {
    const mesh = gridPlane(10, 10);
    const { layout } = suggest(mesh, { order: 4 }, 'tangent');
    expect(layout.singularities.map((s) => s.index)).toEqual(Array(4).fill(0.25));
    const corners = new Set<string>();
    for (const s of layout.singularities) {
      const [x, y] = positionOf(mesh, s.vertex);
      expect(Math.hypot(Math.abs(x) - 0.5, Math.abs(y) - 0.5)).toBeLessThanOrEqual(0.1 + 1e-12); // within one edge
      corners.add(`${Math.sign(x)},${Math.sign(y)}`);
    }
    expect(corners.size).toBe(4);
  });

  // A square's corner turns by half a symmetry step of a line field: no held line field follows
  // both sides, and solveField refuses the same corners; the suggestion says so instead of a wrong sum.
  it('refuses a held line field on a square, naming the corners', () => {
    expect(() => suggest(gridPlane(10, 10), { order: 2 }, 'tangent')).toThrow(expect.objectContaining({ code: 'held-boundary-corners' }));
  });

  // The trivial connection refuses singularities on a free boundary, so none is suggested there.
  it('suggests nothing on a free boundary', () => {
    for (const order of [1, 2, 4]) {
      const { surface, layout } = suggest(disc(8, 24), { order });
      for (const s of layout.singularities) expect(surface.topology.isBoundaryVertex[s.vertex]).toBe(0);
    }
  });
});

describe('suggestLayout: alignment', () => {
  // Source: the direction "down" projected onto a sphere is the gradient of minus the height, whose
  // only zeros are the height's critical points, the top and the bottom (one source, one sink,
  // each of index +1); a strong pull must put the suggestion's singularities there.
  it('pulled toward "down" on a sphere, the two whorls sit at the top and the bottom', () => {
    const mesh = icosphere(3);
    const { layout } = suggest(mesh, { order: 1, align: { direction: [0, -1, 0], weight: 10 } });
    expect(layout.iterations).toBe(0);
    expect(layout.singularities.map((s) => s.index)).toEqual([1, 1]);
    const heights = layout.singularities.map((s) => positionOf(mesh, s.vertex)[1]).sort((a, b) => a - b);
    expect(heights[0]).toBeLessThan(-0.95);
    expect(heights[1]).toBeGreaterThan(0.95);
    // Faces the direction lies across follow it: on the equator the field points down.
    let checked = 0;
    for (let f = 0; f < mesh.triangles.length / 3; f++) {
      const cy = [0, 1, 2].reduce((s, k) => s + mesh.positions[3 * mesh.triangles[3 * f + k] + 1], 0) / 3;
      if (Math.abs(cy) > 0.1) continue;
      expect(layout.faceDirection[3 * f + 1]).toBeLessThan(-0.9);
      checked++;
    }
    expect(checked).toBeGreaterThan(10);
  });

  it('a weight of 0 is the same as no alignment', () => {
    const mesh = icosphere(2);
    const plain = suggest(mesh, { order: 1 }).layout;
    const zero = suggest(mesh, { order: 1, align: { direction: [0, -1, 0], weight: 0 } }).layout;
    expect(zero.singularities).toEqual(plain.singularities);
  });

  // Source: on a cube the principal directions of least bending run along the faces' edges, the
  // same cross as the corner result above (Bommes et al. 2009), so pulling toward curvature keeps
  // the eight corner singularities.
  it('pulled toward the directions of least bending, the cube keeps its eight corner singularities', () => {
    const { layout } = suggest(roundedCube(12, 0.2), { order: 4, align: { curvature: true, weight: 4 } });
    expect(layout.singularities.map((s) => s.index)).toEqual(Array(8).fill(0.25));
  });

  it('refuses what it cannot use, each with a FieldError and its code', () => {
    const surface = prepareSurface(icosphere(1));
    const codeOf = (options: SuggestOptions) => {
      try {
        suggestLayout(surface, options);
        return 'accepted';
      } catch (error) {
        expect(error).toBeInstanceOf(FieldError);
        return (error as FieldError).code;
      }
    };
    expect(codeOf({ order: 1, align: { curvature: true } })).toBe('curvature-needs-even-order');
    expect(codeOf({ order: 0 })).toBe('bad-order');
    expect(codeOf({ order: 1, align: { direction: [0, 0, 0] } })).toBe('bad-direction');
    expect(codeOf({ order: 1, align: { direction: [0, 1, 0], weight: -1 } })).toBe('bad-weight');
  });
});

describe('the eigen-solve against a dense reference', () => {
  // Reference: ml-matrix's EigenvalueDecomposition (npm) of the same matrix, made dense and
  // symmetric as M^{-1/2} A M^{-1/2}, so that its smallest eigenpair is that of A u = λ M u.
  it.each([
    ['a torus, order 1', () => torus(2, 0.7, 12, 8), 1],
    ['a rounded cube, order 4', () => roundedCube(3, 0.3), 4],
    ['an icosphere, order 2', () => icosphere(1), 2],
  ] as const)('on %s the smallest eigenvalue and its eigenvector agree with ml-matrix', (_, make, order) => {
    const mesh = make();
    const surface = prepareSurface(mesh);
    const layout = suggestLayout(surface, { order, maxIterations: 200 });
    const nF = surface.topology.faceCount;
    const unknownOf = Int32Array.from({ length: nF }, (_, f) => f);
    const areas = faceAreas(mesh);
    const { stiffness, mass } = assembleLaplacian(surface.topology, surface.frames, edgeWeights(mesh, surface.topology, surface.cornerAngles), areas, order, unknownOf, nF);
    const n = 2 * nF;
    const dense = Matrix.zeros(n, n);
    for (let j = 0; j < n; j++) {
      for (let p = stiffness.colPtr[j]; p < stiffness.colPtr[j + 1]; p++) {
        const i = stiffness.rowIdx[p];
        const value = stiffness.values[p] / Math.sqrt(mass[i] * mass[j]);
        dense.set(i, j, value);
        dense.set(j, i, value);
      }
    }
    const evd = new EigenvalueDecomposition(dense, { assumeSymmetric: true });
    const values = evd.realEigenvalues;
    const smallest = Math.min(...values);
    expect(layout.energy).toBeCloseTo(smallest, 6);
    // The eigenvector, up to the eigenspace: M^{1/2} u lies in the span of the reference's
    // eigenvectors of the smallest eigenvalue (a complex phase makes that span at least 2-dimensional).
    const y = Float64Array.from({ length: n }, (_, i) => Math.sqrt(mass[i]) * layout.faceValue[i]);
    const length = Math.hypot(...y);
    let inSpan = 0;
    let dimension = 0;
    values.forEach((value, k) => {
      if (Math.abs(value - smallest) > 1e-6 * Math.max(1, Math.abs(smallest))) return;
      dimension++;
      let dot = 0;
      for (let i = 0; i < n; i++) dot += y[i] * evd.eigenvectorMatrix.get(i, k);
      inSpan += dot * dot;
    });
    expect(dimension % 2).toBe(0);
    expect(Math.sqrt(inSpan) / length).toBeGreaterThan(1 - 1e-6);
  });
});
