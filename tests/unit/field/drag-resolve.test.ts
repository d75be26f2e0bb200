import { describe, expect, it } from 'vitest';
import { buildDirectionField, prepareSurface, solveConnection, solveField, type FieldRequest } from '@/lib/field';
import { laidOut } from '@/lib/field/connection/laid-out';
import type { RowCacheEntry } from '@/lib/field/connection/ring-solver';
import { keepResponse } from '@/lib/field/connection/schur-rows';
import { latitudeRingVertices, uvSphere } from '@/tests/fixtures/shapes';

const RINGS = 24, SEGMENTS = 32;
const ring = (k: number) => latitudeRingVertices(RINGS, SEGMENTS, k).vertices;

/** The largest difference between two arrays of the same length. */
function largestDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

/**
 * A drag as the studio makes it: a twisted whorl moved vertex by vertex along a latitude ring of a
 * UV sphere, beside a twisted saddle, a second whorl and an open parting (+1), so the budget of
 * the sphere (χ = 2) holds at every step. The parting alternates between two places now and then,
 * as when a curve is edited between two drags.
 */
function dragRequests(): FieldRequest[] {
  const partingA = Array.from(ring(4).subarray(0, 5));
  const partingB = Array.from(ring(5).subarray(10, 15));
  return [0, 1, 2, 3, 4, 5, 6].map((step) => ({
    order: 1,
    singularities: [
      { vertex: ring(12)[step], index: 1, orientation: 0.3 },
      { vertex: ring(18)[16], index: -1, orientation: 1.1 },
      { vertex: ring(12)[20], index: 1 },
    ],
    curves: [{ kind: 'parting' as const, vertices: step === 3 || step === 4 ? partingB : partingA }],
  }));
}

describe('re-solving while a whorl is dragged', () => {
  it('every step, on a surface whose caches the steps before filled, gives the field a freshly prepared surface’s proved solve gives, within 1e-9', () => {
    // The reference is independent of every cache: a new prepareSurface per step, and solveField,
    // which also measures every index and edge (it throws rather than return an unproved field).
    const mesh = uvSphere(RINGS, SEGMENTS, 10);
    const dragged = prepareSurface(mesh);
    for (const request of dragRequests()) {
      const connection = solveConnection(dragged, request);
      const field = buildDirectionField(dragged, connection, request);
      const reference = solveField(prepareSurface(mesh), request);
      expect(largestDifference(connection.angles, reference.connection.angles)).toBeLessThan(1e-9);
      expect(largestDifference(field.faceDirection, reference.field.faceDirection)).toBeLessThan(1e-9);
      expect(largestDifference(field.vertexDirection, reference.field.vertexDirection)).toBeLessThan(1e-9);
      expect(largestDifference(connection.requestedIndex, reference.connection.requestedIndex)).toBe(0);
      expect(largestDifference(connection.cutEdge, reference.connection.cutEdge)).toBe(0);
    }
  });

  it('the state let go of is still proved: solveField on the dragged surface measures each index where it was placed and nowhere else', () => {
    const mesh = uvSphere(RINGS, SEGMENTS, 10);
    const surface = prepareSurface(mesh);
    const requests = dragRequests();
    for (const request of requests) solveConnection(surface, request);
    const released = requests[requests.length - 1];
    const solved = solveField(surface, released);
    const placed = new Map(released.singularities!.map((s) => [s.vertex, s.index]));
    for (let v = 0; v < surface.topology.vertexCount; v++) {
      if (!solved.connection.constrainedVertex[v]) continue;
      expect(Math.abs(solved.measuredIndex[v] - (placed.get(v) ?? 0))).toBeLessThan(1e-6);
    }
    expect(solved.edgeProof.checkedEdges).toBeGreaterThan(0);
  });

  it('the curves’ layout is kept for the same curves and made again for others', () => {
    const surface = prepareSurface(uvSphere(RINGS, SEGMENTS, 10));
    const a = [{ kind: 'parting' as const, vertices: Array.from(ring(4).subarray(0, 5)) }];
    const first = laidOut(surface, a);
    expect(laidOut(surface, [{ ...a[0], vertices: [...a[0].vertices] }])).toBe(first);
    const crest = laidOut(surface, [{ ...a[0], kind: 'crest' }]);
    expect(crest).not.toBe(first);
    expect(laidOut(surface, []).curves.cutEdge.every((x) => x === 0)).toBe(true);
  });

  it('a dragged twist makes a new row per step: its column is kept by giving up the least recently used ones, never one in use, and never counted twice', () => {
    const entry = (): RowCacheEntry => ({ couplingIdx: new Int32Array(0), couplingVal: new Float64Array(0), schur: new Map(), response: null });
    const a = entry(), b = entry(), c = entry(), d = entry();
    const solver = { rowCache: new Map([['a', a], ['b', b], ['c', c], ['d', d]]), storedResponses: 0 };
    const column = () => new Float64Array(4);
    keepResponse(solver, a, column(), [a], 10);
    keepResponse(solver, b, column(), [b], 10);
    expect(solver.storedResponses).toBe(8);
    // c needs room: a (the oldest) gives up its column, b stays.
    keepResponse(solver, c, column(), [c], 10);
    expect([a.response, b.response !== null, c.response !== null, solver.storedResponses]).toEqual([null, true, true, 8]);
    // d needs room while b and c are in use: nothing may go, so d keeps none.
    keepResponse(solver, d, column(), [b, c, d], 10);
    expect([d.response, solver.storedResponses]).toEqual([null, 8]);
    // A row solved again replaces its own column instead of adding a second one.
    keepResponse(solver, c, column(), [c], 10);
    expect(solver.storedResponses).toBe(8);
  });
});
