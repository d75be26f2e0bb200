/**
 * A suggested layout: the smoothest n-direction field with its singularities left free (Knöppel,
 * Crane, Pinkall, Schröder, "Globally Optimal Direction Fields", ACM TOG 32(4), 2013), optionally
 * pulled toward a direction or the directions of least bending, and the singularities it has,
 * measured by the engine's own independent measurement, offered to the groomer as a start.
 */
import { now } from '../clock';
import type { FieldSurface } from '../connection';
import { measureIndices } from '../indices';
import { factorCholesky } from '../linalg/cholesky';
import { multiplySymmetric } from '../linalg/sparse';
import { FieldError } from '../mesh/errors';
import { faceAreas } from '../mesh/geometry';
import type { Vec3 } from '../mesh/mesh';
import { addHeldCoupling, assembleLaplacian, edgeWeights } from './system';
import { curvatureTarget, directionTarget, heldBoundaryAngles } from './targets';

export { assembleLaplacian, edgeWeights, type ConnectionLaplacian } from './system';

/** What the suggestion should follow besides smoothness. */
export interface SuggestAlignment {
  /** A world direction the field should lie along where it can, e.g. "down" for fur that falls. */
  readonly direction?: Vec3 | readonly [number, number, number];
  /** Follow the directions of least bending (even orders only). */
  readonly curvature?: boolean;
  /**
   * How strongly, ≥ 0 (default 1). At weight w the field follows the targets on features larger
   * than about R/√w, R the radius of a sphere with the surface's area, and is smoothest below.
   */
  readonly weight?: number;
}

export interface SuggestOptions {
  /** n of the n-direction field (default 1). */
  readonly order?: number;
  readonly align?: SuggestAlignment;
  /** Most inverse iterations (default 40); each is one forward and one backward solve. */
  readonly maxIterations?: number;
}

/** A singularity the suggestion has: a vertex and its index, a non-zero multiple of 1/order. */
export interface SuggestedSingularity {
  readonly vertex: number;
  readonly index: number;
}

export interface SuggestedLayout {
  readonly order: number;
  /** Unit direction per face (3 per face): the first of the field's n directions. */
  readonly faceDirection: Float64Array;
  /** The solved complex value u_f per face (2 per face, re and im in the face frame; held faces their held value). */
  readonly faceValue: Float64Array;
  /** Measured by `measureIndices`, sorted by vertex; none on a free boundary. */
  readonly singularities: readonly SuggestedSingularity[];
  /** E(u) / |u|²_M of the result: the smallest eigenvalue where no alignment or held boundary decided it. */
  readonly energy: number;
  /** Inverse iterations run (0 where a single solve decided the field). */
  readonly iterations: number;
  readonly timings: { readonly assembleMilliseconds: number; readonly factorMilliseconds: number; readonly solveMilliseconds: number; readonly measureMilliseconds: number };
}

/** Relative change of the iterate below which inverse iteration stops. */
const CONVERGED = 1e-9;

/**
 * Suggests a layout on a prepared surface.
 *
 * Faces carry complex unknowns u_f; the energy is Σ_e w_e |u_j − e^{i n ρ_e} u_i|² over interior
 * edges (ρ the Levi-Civita rotations of the prepared surface; w_e as in `edgeWeights`), the mass
 * the face areas. One matrix K = A + μM is factored once: μ is a vanishing shift (10⁻⁵ of 4π/area)
 * for definiteness, plus w · 4π/area when aligning. Without alignment, each component of the
 * surface gets the smallest eigenvector of A u = λ M u by inverse iteration on K; with alignment
 * targets q, u = K⁻¹ (w · 4π/area) M q (Knöppel §5, (A − λM) u = M q with λ = −μ), falling back to
 * the eigenvector on a component the targets do not reach.
 *
 * Boundary, as the surface was prepared: `free` is the natural boundary condition (no term), and
 * the trivial connection refuses singularities on a free boundary, so none is suggested there; a
 * held boundary (`tangent`, `normal`) fixes every face touching it to the held direction and
 * solves for the rest (the smoothest field with those values), and boundary vertices are measured
 * against the held rings, so the suggestion is one the held solve accepts.
 *
 * Guarantees: the singularities are exactly the vertices where `measureIndices` of the returned
 * field is non-zero, each a non-zero multiple of 1/order; on a closed component (or a held one)
 * they sum to its Euler characteristic. Throws FieldError `bad-order`, `bad-weight`,
 * `bad-direction`, `curvature-needs-even-order` for options it cannot use, and
 * `held-boundary-corners` for a held boundary whose corners the order cannot follow.
 */
export function suggestLayout(surface: FieldSurface, options: SuggestOptions = {}): SuggestedLayout {
  const order = options.order ?? 1;
  if (!Number.isInteger(order) || order < 1 || order > 12) throw new FieldError('bad-order', `The order of the field must be a whole number from 1 to 12, not ${order}.`);
  const weight = options.align?.weight ?? 1;
  if (!Number.isFinite(weight) || weight < 0) throw new FieldError('bad-weight', `The alignment weight must be a finite number of at least 0, not ${weight}.`);
  const maxIterations = options.maxIterations ?? 40;
  const { mesh, topology, frames } = surface;
  const nF = topology.faceCount;
  const t0 = now();
  const areas = faceAreas(mesh);
  let totalArea = 0;
  for (let f = 0; f < nF; f++) totalArea += areas[f];
  const scale = (4 * Math.PI) / Math.max(totalArea, 1e-300);

  // Held faces and the unknown numbering of the others.
  const heldAngle = surface.boundary === 'free' ? new Map<number, number>() : heldBoundaryAngles(topology, frames, surface.boundary);
  const unknownOf = new Int32Array(nF).fill(-1);
  const faceOf: number[] = [];
  const held = new Float64Array(2 * nF);
  for (let f = 0; f < nF; f++) {
    const angle = heldAngle.get(f);
    if (angle === undefined) {
      unknownOf[f] = faceOf.length;
      faceOf.push(f);
    } else {
      held[2 * f] = Math.cos(order * angle);
      held[2 * f + 1] = Math.sin(order * angle);
    }
  }
  const m = faceOf.length;

  // Targets, each normalised to an area-weighted mean |q|² of 1 so that they count alike.
  let target: Float64Array | null = null;
  const align = options.align;
  if (align && weight > 0 && (align.direction || align.curvature)) {
    target = new Float64Array(2 * nF);
    if (align.direction) addNormalised(target, directionTarget(topology, frames, align.direction, order), areas);
    if (align.curvature) addNormalised(target, curvatureTarget(mesh, topology, frames, areas, order), areas);
  }
  const pull = target ? weight * scale : 0;
  const shift = 1e-5 * scale + pull;

  const weights = edgeWeights(mesh, topology, surface.cornerAngles);
  const { stiffness, mass } = assembleLaplacian(topology, frames, weights, areas, order, unknownOf, m);
  for (let k = 0; k < m; k++) {
    // K = A + μM: the diagonal entries are stored first in each column of the lower triangle.
    stiffness.values[stiffness.colPtr[2 * k]] += shift * mass[2 * k];
    stiffness.values[stiffness.colPtr[2 * k + 1]] += shift * mass[2 * k + 1];
  }
  const t1 = now();
  const factor = factorCholesky(stiffness);
  const t2 = now();

  // One solve for what the held boundary and the targets decide.
  const rhs = new Float64Array(2 * m);
  addHeldCoupling(topology, frames, weights, order, unknownOf, held, rhs);
  if (target) {
    for (let k = 0; k < m; k++) {
      const f = faceOf[k];
      rhs[2 * k] += pull * mass[2 * k] * target[2 * f];
      rhs[2 * k + 1] += pull * mass[2 * k + 1] * target[2 * f + 1];
    }
  }
  const u = factor.solve(rhs);

  // Components the solve left (near) zero get the smallest eigenvector instead.
  const componentOf = (k: number) => topology.componentOfFace[faceOf[k]];
  const normOfComponent = componentNorms(u, mass, m, componentOf, topology.componentCount);
  const areaOfComponent = new Float64Array(topology.componentCount);
  for (let k = 0; k < m; k++) areaOfComponent[componentOf(k)] += areas[faceOf[k]];
  const undecided = new Uint8Array(topology.componentCount);
  let anyUndecided = false;
  for (let c = 0; c < topology.componentCount; c++) {
    if (areaOfComponent[c] > 0 && normOfComponent[c] <= 1e-12 * Math.sqrt(areaOfComponent[c])) {
      undecided[c] = 1;
      anyUndecided = true;
    }
  }
  let iterations = 0;
  if (anyUndecided) {
    let v: Float64Array = new Float64Array(2 * m);
    let seed = 0x2545f491;
    for (let k = 0; k < m; k++) {
      if (!undecided[componentOf(k)]) continue;
      for (let r = 0; r < 2; r++) {
        // xorshift: a fixed start with no special symmetry, so no eigenvector is missed by accident
        seed ^= seed << 13; seed ^= seed >>> 17; seed ^= seed << 5;
        v[2 * k + r] = (seed >>> 0) / 4294967296 - 0.5;
      }
    }
    normaliseComponents(v, mass, m, componentOf, topology.componentCount);
    const b = new Float64Array(2 * m);
    for (; iterations < maxIterations; ) {
      for (let i = 0; i < 2 * m; i++) b[i] = mass[i] * v[i];
      const next = factor.solve(b);
      normaliseComponents(next, mass, m, componentOf, topology.componentCount);
      iterations++;
      let change = 0;
      for (let i = 0; i < 2 * m; i++) change += mass[i] * (next[i] - v[i]) ** 2;
      v = next;
      if (Math.sqrt(change / Math.max(totalArea, 1e-300)) < CONVERGED) break;
    }
    for (let k = 0; k < m; k++) {
      if (!undecided[componentOf(k)]) continue;
      u[2 * k] = v[2 * k];
      u[2 * k + 1] = v[2 * k + 1];
    }
  }

  // E(u) / |u|²_M with A = K − μM, over the free faces.
  const Ku = multiplySymmetric(stiffness, u);
  let energy = 0, norm = 0;
  for (let i = 0; i < 2 * m; i++) {
    energy += u[i] * Ku[i] - shift * mass[i] * u[i] * u[i];
    norm += mass[i] * u[i] * u[i];
  }
  const t3 = now();

  const faceDirection = new Float64Array(3 * nF);
  const faceValue = new Float64Array(2 * nF);
  const X = frames.frameX, Y = frames.frameY;
  for (let f = 0; f < nF; f++) {
    const k = unknownOf[f];
    const x = k >= 0 ? u[2 * k] : held[2 * f], y = k >= 0 ? u[2 * k + 1] : held[2 * f + 1];
    faceValue[2 * f] = x;
    faceValue[2 * f + 1] = y;
    const theta = Math.atan2(y, x) / order;
    const c = Math.cos(theta), s = Math.sin(theta);
    for (let d = 0; d < 3; d++) faceDirection[3 * f + d] = c * X[3 * f + d] + s * Y[3 * f + d];
  }
  const measured = measureIndices(surface, faceDirection, order, surface.boundary === 'free' ? undefined : surface.ringDefect);
  const singularities: SuggestedSingularity[] = [];
  for (let v = 0; v < topology.vertexCount; v++) {
    if (!measured.measured[v]) continue;
    const steps = Math.round(measured.index[v] * order);
    if (steps !== 0) singularities.push({ vertex: v, index: steps / order });
  }
  if (surface.boundary !== 'free') checkHeldSums(surface, singularities, order);
  const t4 = now();
  return {
    order,
    faceDirection,
    faceValue,
    singularities,
    energy: norm > 0 ? Math.max(0, energy) / norm : 0,
    iterations,
    timings: { assembleMilliseconds: t1 - t0, factorMilliseconds: t2 - t1, solveMilliseconds: t3 - t2, measureMilliseconds: t4 - t3 },
  };
}

/**
 * On a held boundary the indices of each piece must sum to its χ. They do unless the boundary turns
 * somewhere by an odd multiple of π/n (a square's corner for a line field: half a symmetry step),
 * where no field of that order is held without ambiguity — `solveField` refuses such corners too.
 */
function checkHeldSums(surface: FieldSurface, singularities: readonly SuggestedSingularity[], order: number): void {
  const sums = new Float64Array(surface.components.length);
  for (const s of singularities) sums[surface.componentOfVertex[s.vertex]] += s.index;
  surface.components.forEach((piece, c) => {
    if (Math.abs(sums[c] - piece.eulerCharacteristic) < 1e-9) return;
    throw new FieldError(
      'held-boundary-corners',
      `The held boundary of piece ${c + 1} turns at its corners by angles a field of order ${order} cannot follow along both sides (a square's corners for a line field are half a symmetry step), so no layout can be suggested there. Free the boundary, or use an order whose symmetry fits the corners (1 or 4 for square corners).`,
    );
  });
}

function addNormalised(into: Float64Array, q: Float64Array, areas: Float64Array): void {
  let weighted = 0, area = 0;
  for (let f = 0; f < areas.length; f++) {
    weighted += areas[f] * (q[2 * f] ** 2 + q[2 * f + 1] ** 2);
    area += areas[f];
  }
  if (weighted === 0) return;
  const s = Math.sqrt(area / weighted);
  for (let i = 0; i < q.length; i++) into[i] += s * q[i];
}

function componentNorms(u: Float64Array, mass: Float64Array, m: number, componentOf: (k: number) => number, count: number): Float64Array {
  const norms = new Float64Array(count);
  for (let k = 0; k < m; k++) norms[componentOf(k)] += mass[2 * k] * u[2 * k] ** 2 + mass[2 * k + 1] * u[2 * k + 1] ** 2;
  for (let c = 0; c < count; c++) norms[c] = Math.sqrt(norms[c]);
  return norms;
}

/** Scales each component's block to unit M-norm: K is block-diagonal, so this is one inverse iteration per component. */
function normaliseComponents(v: Float64Array, mass: Float64Array, m: number, componentOf: (k: number) => number, count: number): void {
  const norms = componentNorms(v, mass, m, componentOf, count);
  for (let k = 0; k < m; k++) {
    const n = norms[componentOf(k)];
    if (n === 0) continue;
    v[2 * k] /= n;
    v[2 * k + 1] /= n;
  }
}
