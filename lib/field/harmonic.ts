/**
 * Smooth values between pinned ones (length, lift, density…): a groomer sets a few vertices and
 * every other vertex gets the smoothest blend, with the surface factored once so that moving a pin
 * stays interactive.
 */
import { factorCholesky, type CholeskyFactor } from './linalg/cholesky';
import { factorDenseLU } from './linalg/dense';
import { cornerAngles, faceAreas } from './mesh/geometry';
import { FieldError } from './mesh/errors';
import type { TriangleMesh } from './mesh/mesh';
import { symmetricFromTriplets } from './linalg/sparse';
import { nextHalfedge, prevHalfedge } from './mesh/topology';

/** A value of a scalar attribute (length, lift, density…) pinned at a vertex. */
export interface Pin {
  readonly vertex: number;
  readonly value: number;
}

/**
 * Smooth blending of pinned values over a surface. The cotangent Laplacian is factored once when
 * the interpolator is made; each call with new pins costs one small dense solve plus one sparse
 * solve per pin, never a new factorization.
 */
export interface HarmonicInterpolator {
  /**
   * Values at every vertex, equal to the pins at pinned vertices and harmonic (the smoothest
   * blend, with no preferred direction at the boundary) elsewhere. A piece of surface with no pin
   * gets 0. Throws FieldError for an unknown vertex or a non-finite value; two pins on one vertex
   * must agree.
   */
  interpolate(pins: readonly Pin[]): Float64Array;
}

/**
 * Prepares harmonic interpolation on a mesh.
 *
 * Guarantees: the matrix factored is the cotangent Laplacian plus a vanishing multiple (1e-9,
 * relative) of the lumped mass matrix, which makes it positive definite on every component while
 * changing the blend by far less than display precision.
 */
export function prepareHarmonic(mesh: TriangleMesh): HarmonicInterpolator {
  const nV = mesh.positions.length / 3;
  const tri = mesh.triangles;
  const angles = cornerAngles(mesh);
  const areas = faceAreas(mesh);
  const rows: number[] = [], cols: number[] = [], vals: number[] = [];
  const mass = new Float64Array(nV);
  let stiffnessScale = 0;
  for (let h = 0; h < tri.length; h++) {
    const i = tri[h], j = tri[nextHalfedge(h)];
    const opposite = angles[prevHalfedge(h)];
    const w = 0.5 * (Math.cos(opposite) / Math.max(Math.sin(opposite), 1e-12));
    rows.push(i, j, i);
    cols.push(i, j, j);
    vals.push(w, w, -w);
    stiffnessScale += Math.abs(w);
    mass[i] += areas[(h / 3) | 0] / 3;
  }
  let totalMass = 0;
  for (let v = 0; v < nV; v++) totalMass += mass[v];
  const epsilon = (1e-9 * stiffnessScale) / Math.max(totalMass, 1e-300);
  for (let v = 0; v < nV; v++) {
    rows.push(v);
    cols.push(v);
    // Unused vertices get a unit diagonal so the matrix stays definite; they only ever read 0.
    vals.push(mass[v] > 0 ? epsilon * mass[v] : 1);
  }
  const factor: CholeskyFactor = factorCholesky(symmetricFromTriplets(nV, rows, cols, vals));
  const columns = new Map<number, Float64Array>();
  const greenColumn = (v: number): Float64Array => {
    let c = columns.get(v);
    if (!c) {
      const e = new Float64Array(nV);
      e[v] = 1;
      c = factor.solve(e);
      if (columns.size > 256) columns.clear();
      columns.set(v, c);
    }
    return c;
  };
  return {
    interpolate(pins) {
      const byVertex = new Map<number, number>();
      pins.forEach((pin, i) => {
        if (!Number.isInteger(pin.vertex) || pin.vertex < 0 || pin.vertex >= nV) throw new FieldError('vertex-out-of-range', `Pin ${i + 1} is at vertex ${pin.vertex}, which the surface does not have.`);
        if (!Number.isFinite(pin.value)) throw new FieldError('bad-pin', `Pin ${i + 1} has a value that is not a finite number.`);
        const previous = byVertex.get(pin.vertex);
        if (previous !== undefined && previous !== pin.value) throw new FieldError('conflicting-pins', `Two pins at vertex ${pin.vertex} ask for ${previous} and ${pin.value}.`);
        byVertex.set(pin.vertex, pin.value);
      });
      const pinned = [...byVertex.keys()];
      const k = pinned.length;
      const out = new Float64Array(nV);
      if (k === 0) return out;
      const green = pinned.map(greenColumn);
      const s = new Float64Array(k * k);
      for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) s[a * k + b] = green[b][pinned[a]];
      const lu = factorDenseLU(s, k, 1e-15);
      if (!lu) throw new FieldError('conflicting-pins', 'The pins are too close together to be told apart.');
      const weights = lu.solve(Float64Array.from(pinned, (v) => byVertex.get(v)!));
      for (let a = 0; a < k; a++) {
        const g = green[a];
        const w = weights[a];
        for (let v = 0; v < nV; v++) out[v] += w * g[v];
      }
      for (const v of pinned) out[v] = byVertex.get(v)!;
      return out;
    },
  };
}
