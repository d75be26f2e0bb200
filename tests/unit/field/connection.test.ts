import { describe, expect, it } from 'vitest';
import { Matrix, pseudoInverse } from 'ml-matrix';
import { indexBudget, prepareSurface, solveConnection, type FieldSurface } from '@/lib/field/connection';
import { vertexFan } from '@/lib/field/mesh/dual-chains';
import { FieldError } from '@/lib/field/mesh/errors';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, genusTwoSurface, gridPlane, icosphere, latitudeRingVertices, torus, uvSphere } from '@/tests/fixtures/shapes';
import { solveField } from '@/lib/field/solve-field';
import { nextHalfedge } from '@/lib/field/mesh/topology';
import { wrapAngle, wrapAngleForOrder } from '@/lib/field/mesh/transport';
import { stanfordBunny } from './surfaces';
import { edgePath, spreadVertices } from './support';

const TWO_PI = 2 * Math.PI;

/** Σ sign·values over a vertex's ring. */
function ringSum(surface: FieldSurface, v: number, values: Float64Array): number {
  const fan = vertexFan(surface.topology, v);
  let s = 0;
  for (let i = 0; i < fan.edges.length; i++) s += fan.signs[i] * values[fan.edges[i]];
  return s;
}

/**
 * The guarantee, checked twice: the connection's holonomy around every prescribed vertex ring is
 * 2π × index (Levi-Civita's curvature plus the extra angles), and the index measured from the
 * built field alone is the requested one everywhere (solveField throws otherwise).
 */
function expectGuarantee(surface: FieldSurface, singularities: { vertex: number; index: number }[], order = 1) {
  const solved = solveField(surface, { order, singularities });
  const { connection, field } = solved;
  const requested = new Map(singularities.map((s) => [s.vertex, s.index]));
  for (let v = 0; v < surface.topology.vertexCount; v++) {
    if (!connection.constrainedVertex[v]) continue;
    const holonomy = ringSum(surface, v, connection.angles) + surface.ringDefect[v];
    expect(Math.abs(holonomy - TWO_PI * (requested.get(v) ?? 0))).toBeLessThan(1e-8);
    expect(Math.abs(solved.measuredIndex[v] - (requested.get(v) ?? 0))).toBeLessThan(1e-6);
  }
  for (const x of field.faceDirection) expect(Number.isFinite(x)).toBe(true);
  return solved;
}

describe('Levi-Civita transport', () => {
  it('turns a vector carried around a circle of latitude by the enclosed area, 2π(1 − cos θ), within 1%', () => {
    // Source: do Carmo, "Differential Geometry of Curves and Surfaces", §4-4 (parallel transport
    // along a parallel of the unit sphere turns a vector by 2π(1 − cos θ), θ the colatitude).
    const rings = 180, segments = 360;
    const surface = prepareSurface(uvSphere(rings, segments));
    for (const ring of [20, 45, 60, 90]) {
      // The faces between latitude rings `ring` and `ring + 1` form a dual loop: the sum of the
      // vertex fans of the cap north of it, whose inner crossings cancel.
      const coefficient = new Float64Array(surface.topology.edgeCount);
      const cap = [0];
      for (let k = 1; k <= ring; k++) cap.push(...latitudeRingVertices(rings, segments, k).vertices);
      for (const v of cap) {
        const fan = vertexFan(surface.topology, v);
        for (let i = 0; i < fan.edges.length; i++) coefficient[fan.edges[i]] += fan.signs[i];
      }
      let holonomy = 0;
      for (let e = 0; e < coefficient.length; e++) holonomy += coefficient[e] * surface.frames.edgeRotation[e];
      const theta = (Math.PI * (ring + 0.5)) / rings;
      const expected = TWO_PI * (1 - Math.cos(theta));
      const measured = wrapAngle(holonomy - expected) + expected;
      expect(Math.abs(measured - expected) / expected).toBeLessThan(0.01);
    }
  });
});

describe('trivial connection: singularities exactly where placed, nowhere else', () => {
  const bunny = prepareSurface(stanfordBunny());

  it('on the Stanford bunny with 2 whorls', () => {
    const [a, b] = spreadVertices(bunny.mesh, 2);
    expectGuarantee(bunny, [{ vertex: a, index: 1 }, { vertex: b, index: 1 }]);
  });

  it('on the Stanford bunny with 4 singularities (3 whorls, 1 saddle)', () => {
    const vs = spreadVertices(bunny.mesh, 4, 100);
    expectGuarantee(bunny, [{ vertex: vs[0], index: 1 }, { vertex: vs[1], index: 1 }, { vertex: vs[2], index: 1 }, { vertex: vs[3], index: -1 }]);
  });

  it('on the Stanford bunny with 10 singularities (6 whorls, 4 saddles)', () => {
    const vs = spreadVertices(bunny.mesh, 10, 700);
    expectGuarantee(bunny, vs.map((vertex, i) => ({ vertex, index: i < 6 ? 1 : -1 })));
  });

  it('on a torus with none, and with a whorl–saddle pair', () => {
    const surface = prepareSurface(torus(3, 1, 48, 20));
    expect(surface.generators).toHaveLength(2);
    expectGuarantee(surface, []);
    const [a, b] = spreadVertices(surface.mesh, 2);
    expectGuarantee(surface, [{ vertex: a, index: 1 }, { vertex: b, index: -1 }]);
  });

  it('on a genus-2 surface (χ = −2) with two saddles', () => {
    const surface = prepareSurface(genusTwoSurface());
    expect(surface.generators).toHaveLength(4);
    const [a, b] = spreadVertices(surface.mesh, 2);
    expectGuarantee(surface, [{ vertex: a, index: -1 }, { vertex: b, index: -1 }]);
  });

  it('on surfaces with a boundary: free, held tangent and held normal', () => {
    const free = prepareSurface(disc(12, 40));
    expectGuarantee(free, [{ vertex: 0, index: 1 }, { vertex: 200, index: -1 }, { vertex: 300, index: 1 }]);
    // Poincaré–Hopf for a held boundary: the indices inside a disc sum to χ = 1 (one whorl).
    expectGuarantee(prepareSurface(disc(12, 40), { boundary: 'tangent' }), [{ vertex: 0, index: 1 }]);
    expectGuarantee(prepareSurface(gridPlane(16, 12), { boundary: 'normal' }), [{ vertex: 8 * 17 + 8, index: 1 }]);
  });

  it('for a 4-direction field with ±1/4 indices', () => {
    const surface = prepareSurface(icosphere(4));
    const vs = spreadVertices(surface.mesh, 10);
    // 9 × (+1/4) + 1 × (−1/4) = 2 = χ(sphere).
    expectGuarantee(surface, vs.map((vertex, i) => ({ vertex, index: i < 9 ? 0.25 : -0.25 })), 4);
  });

  it('for a line field (order 2) with ±1/2 indices', () => {
    const surface = prepareSurface(torus(3, 1, 40, 16));
    const vs = spreadVertices(surface.mesh, 2);
    expectGuarantee(surface, [{ vertex: vs[0], index: 0.5 }, { vertex: vs[1], index: -0.5 }], 2);
  });
});

describe('minimal norm', () => {
  // Reference: the minimum-norm solution of C x = b is pinv(C)·b, computed by ml-matrix's
  // pseudoInverse (SVD) from npm. C is rebuilt here from the triangle list: one row per prescribed
  // vertex ring (+1 on edges whose canonical halfedge points at the vertex, −1 away from it) and
  // one row per homology generator.
  const cases: [string, TriangleMesh, { vertex: number; index: number }[]][] = [
    ['an icosphere with two whorls', icosphere(1), [{ vertex: 0, index: 1 }, { vertex: 3, index: 1 }]],
    ['a torus with a whorl and a saddle', torus(3, 1, 7, 5), [{ vertex: 0, index: 1 }, { vertex: 17, index: -1 }]],
    ['a disc with a free boundary', disc(3, 8), [{ vertex: 0, index: 1 }, { vertex: 5, index: -1 }]],
  ];
  for (const [name, mesh, singularities] of cases) {
    it(`matches the pseudo-inverse on ${name} to 1e-8`, () => {
      const surface = prepareSurface(mesh);
      const { topology } = surface;
      const result = solveConnection(surface, { singularities });
      const index = new Map(singularities.map((s) => [s.vertex, s.index]));
      const rows: number[][] = [];
      const rhs: number[] = [];
      for (let v = 0; v < topology.vertexCount; v++) {
        if (topology.isBoundaryVertex[v]) continue;
        const row = new Array(topology.edgeCount).fill(0);
        for (let e = 0; e < topology.edgeCount; e++) {
          const h = topology.edgeHalfedge[e];
          if (topology.twin[h] === -1) continue;
          if (topology.triangles[nextHalfedge(h)] === v) row[e] = 1;
          if (topology.triangles[h] === v) row[e] = -1;
        }
        rows.push(row);
        rhs.push(TWO_PI * (index.get(v) ?? 0) - surface.angleDefects[v]);
      }
      for (const g of surface.generators) {
        const row = new Array(topology.edgeCount).fill(0);
        let levelCivita = 0;
        for (let i = 0; i < g.edges.length; i++) {
          row[g.edges[i]] += g.signs[i];
          levelCivita += g.signs[i] * surface.frames.edgeRotation[g.edges[i]];
        }
        rows.push(row);
        rhs.push(TWO_PI * Math.round(levelCivita / TWO_PI) - levelCivita);
      }
      const reference = pseudoInverse(new Matrix(rows)).mmul(Matrix.columnVector(rhs)).to1DArray();
      for (let e = 0; e < topology.edgeCount; e++) expect(Math.abs(result.angles[e] - reference[e])).toBeLessThan(1e-8);
    });
  }
});

describe('features', () => {
  const surface = prepareSurface(icosphere(4));
  const { topology, frames } = surface;

  for (const kind of ['parting', 'crest'] as const) {
    it(`a ${kind} sends the flow ${kind === 'parting' ? 'away from' : 'toward'} the curve on both sides, perpendicular`, () => {
      const curve = edgePath(surface.mesh, topology, 5, [0, 1, 0.3], 8);
      // An open curve acts as one source or sink (+1), so with one whorl the sphere's budget of 2 is met.
      const far = spreadVertices(surface.mesh, 2, 5)[1];
      expect(indexBudget(surface, { singularities: [{ vertex: far, index: 1 }], curves: [{ kind, vertices: curve }] }).balanced).toBe(true);
      const solved = solveField(surface, { singularities: [{ vertex: far, index: 1 }], curves: [{ kind, vertices: curve }] });
      const sense = kind === 'parting' ? 1 : -1;
      for (let i = 0; i + 1 < curve.length; i++) {
        let h = -1;
        for (let g = 0; g < topology.triangles.length; g++) if (topology.triangles[g] === curve[i] && topology.triangles[nextHalfedge(g)] === curve[i + 1]) h = g;
        for (const side of [h, topology.twin[h]]) {
          const f = (side / 3) | 0;
          const outward = frames.halfedgeAngle[side] + Math.PI / 2; // left of the halfedge = into its face
          expect(Math.abs(wrapAngle(solved.field.faceAngle[f] - outward - (sense > 0 ? 0 : Math.PI)))).toBeLessThan(1e-9);
        }
      }
    });
  }

  it('a flow stroke fixes the direction in the faces it passes through', () => {
    const stroke = [
      { face: 100, direction: [0, 0, 1] as const },
      { face: 2000, direction: [1, 0, 0] as const },
      { face: 2003, direction: [1, 0.2, 0] as const },
    ];
    const vs = spreadVertices(surface.mesh, 2);
    const solved = solveField(surface, { singularities: vs.map((vertex) => ({ vertex, index: 1 })), strokes: [stroke] });
    for (const s of stroke) {
      const f = s.face;
      const n = [frames.normal[3 * f], frames.normal[3 * f + 1], frames.normal[3 * f + 2]];
      const along = s.direction[0] * n[0] + s.direction[1] * n[1] + s.direction[2] * n[2];
      const projected = [0, 1, 2].map((k) => s.direction[k] - along * n[k]);
      const length = Math.hypot(...projected);
      const d = [0, 1, 2].map((k) => solved.field.faceDirection[3 * f + k]);
      expect(d[0] * projected[0] + d[1] * projected[1] + d[2] * projected[2]).toBeCloseTo(length, 9);
    }
  });

  it('a whorl twist of 0 is outflow and of π inflow next to the whorl', () => {
    const [a, b] = spreadVertices(surface.mesh, 2);
    for (const twist of [0, Math.PI]) {
      const solved = solveField(surface, { singularities: [{ vertex: a, index: 1, orientation: twist }, { vertex: b, index: 1 }] });
      const f = (topology.vertexHalfedge[a] / 3) | 0;
      const p = surface.mesh.positions;
      const c = [0, 1, 2].map((k) => (p[3 * topology.triangles[3 * f] + k] + p[3 * topology.triangles[3 * f + 1] + k] + p[3 * topology.triangles[3 * f + 2] + k]) / 3 - p[3 * a + k]);
      const d = [0, 1, 2].map((k) => solved.field.faceDirection[3 * f + k]);
      const cosine = (c[0] * d[0] + c[1] * d[1] + c[2] * d[2]) / Math.hypot(...c);
      expect(cosine).toBeCloseTo(twist === 0 ? 1 : -1, 6);
    }
  });

  it('a global rotation turns every face by the same angle', () => {
    const vs = spreadVertices(surface.mesh, 2);
    const singularities = vs.map((vertex) => ({ vertex, index: 1 }));
    const base = solveField(surface, { singularities });
    const turned = solveField(surface, { singularities, rotation: 0.7 });
    for (let f = 0; f < topology.faceCount; f++) expect(Math.abs(wrapAngle(turned.field.faceAngle[f] - base.field.faceAngle[f] - 0.7))).toBeLessThan(1e-9);
  });

  it('holds a given holonomy around each torus generator, and refuses one that is not a whole number of symmetry steps', () => {
    const t = prepareSurface(torus(3, 1, 40, 16));
    // A cross field (order 4) may turn by any multiple of a quarter turn round a loop.
    const given = [Math.PI / 2, -Math.PI];
    const result = solveConnection(t, { order: 4, generatorHolonomies: given });
    t.generators.forEach((g, i) => {
      let h = 0;
      for (let k = 0; k < g.edges.length; k++) h += g.signs[k] * (t.frames.edgeRotation[g.edges[k]] + result.angles[g.edges[k]]);
      expect(h).toBeCloseTo(given[i], 9);
    });
    // 0.4 rad round a loop would leave a seam: the field would not come back to itself.
    expect(() => solveConnection(t, { generatorHolonomies: [0.4, null] })).toThrow(expect.objectContaining({ code: 'bad-holonomy', message: expect.stringContaining('generator 1') }));
    expect(() => solveConnection(t, { generatorHolonomies: [0, 0, 0] })).toThrow(expect.objectContaining({ code: 'bad-holonomy' }));
  });

  it('keeps a held boundary tangent or normal to the boundary edges', () => {
    for (const boundary of ['tangent', 'normal'] as const) {
      const d = prepareSurface(disc(10, 32), { boundary });
      const solved = solveField(d, { singularities: [{ vertex: 0, index: 1 }] });
      for (const loop of d.topology.boundaryLoops) {
        for (const h of loop) {
          const f = (h / 3) | 0;
          const expected = d.frames.halfedgeAngle[h] + (boundary === 'normal' ? Math.PI / 2 : 0);
          expect(Math.abs(wrapAngle(solved.field.faceAngle[f] - expected))).toBeLessThan(1e-9);
        }
      }
    }
  });
});

describe('index budget and infeasible requests', () => {
  const sphere = prepareSurface(icosphere(3));

  function expectFieldError(run: () => unknown, code: string) {
    try {
      run();
    } catch (error) {
      expect(error).toBeInstanceOf(FieldError);
      expect((error as FieldError).code).toBe(code);
      expect((error as FieldError).message.length).toBeGreaterThan(20);
      return;
    }
    throw new Error(`expected a FieldError ${code}`);
  }

  it('reports what a closed surface demands against what is placed', () => {
    const budget = indexBudget(sphere, { singularities: [{ vertex: 0, index: 1 }] });
    expect(budget.pieces).toEqual([{ piece: 0, component: 0, borderedBy: [], demanded: 2, placed: 1, remainder: 1 }]);
    expect(budget.balanced).toBe(false);
    expect(indexBudget(prepareSurface(disc(3, 8)), {}).pieces[0].demanded).toBeNull();
  });

  it('refuses an unbalanced budget, and puts the remainder where asked', () => {
    expectFieldError(() => solveConnection(sphere, { singularities: [{ vertex: 0, index: 1 }] }), 'index-budget');
    const far = spreadVertices(sphere.mesh, 2)[1];
    const solved = solveField(sphere, { singularities: [{ vertex: 0, index: 1 }], remainderAt: far });
    expect(solved.measuredIndex[far]).toBeCloseTo(1, 9);
  });

  it('names the reason for each infeasible request', () => {
    expectFieldError(() => solveConnection(sphere, { singularities: [{ vertex: 0, index: 1.5 }, { vertex: 40, index: 0.5 }] }), 'bad-index');
    expectFieldError(() => solveConnection(sphere, { singularities: [{ vertex: 99999, index: 2 }] }), 'vertex-out-of-range');
    expectFieldError(() => solveConnection(sphere, { singularities: [{ vertex: 3, index: 1 }, { vertex: 3, index: 1 }] }), 'duplicate-singularity');
    expectFieldError(() => solveConnection(prepareSurface(disc(3, 8)), { singularities: [{ vertex: 20, index: 1 }] }), 'singularity-on-free-boundary');
    expectFieldError(() => solveConnection(sphere, { order: 0 }), 'bad-order');
    expectFieldError(
      () => solveConnection(sphere, { singularities: [{ vertex: 0, index: 2 }], strokes: [[{ face: 5, direction: [1, 0, 0] }], [{ face: 5, direction: [0, 1, 0] }]] }),
      'conflicting-constraints',
    );
    // Index 3 at a vertex of five faces asks the field to turn 6π around them: more than π per step.
    const far = spreadVertices(sphere.mesh, 2)[1];
    expectFieldError(() => solveField(sphere, { singularities: [{ vertex: 0, index: 3 }, { vertex: far, index: -1 }] }), 'singularities-too-close');
  });
});
