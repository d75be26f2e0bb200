/**
 * The trivial connection: the smallest extra rotations per edge that give every vertex ring,
 * generator, stroke and curve the holonomy asked of it. This file is the solve itself; the room's
 * other files prepare the surface, check the request, lay out curves and solve the rows.
 */
import { now } from '../clock';
import { homologyGenerators, shortestDualPath, vertexFan, type DualChain } from '../mesh/dual-chains';
import { FieldError } from '../mesh/errors';
import { faceOfHalfedge } from '../mesh/topology';
import { TWO_PI, angleInFace } from '../mesh/transport';
import { validateRequest } from './budget';
import { laidOut } from './laid-out';
import { boundaryLoopChain } from './pieces';
import { twistReference } from './twist';
import type { ConnectionResult, FieldRequest } from './request';
import { isIndependentRow, ringSolution, solveRows, type ExtraRow } from './schur-rows';
import type { FieldSurface } from './surface';

export type { BoundaryMode, ConnectionResult, CurveFeature, FaceAlignment, FieldRequest, IndexBudget, PieceBudget, PointSingularity } from './request';
export { prepareSurface, ringOrderings, type FieldSurface, type PrepareSurfaceOptions } from './surface';
export { indexBudget, pieceName } from './budget';
export { dualPieces } from './curves';
export { cutIntoPieces, type SurfacePiece, type SurfacePieces } from './pieces';

/** Σ sign·values[edge] along a chain. */
function chainSum(chain: DualChain, values: Float64Array): number {
  let s = 0;
  for (let i = 0; i < chain.edges.length; i++) s += chain.signs[i] * values[chain.edges[i]];
  return s;
}

/** The value of Σ sign·angle along `chain` that turns `fromTarget` into `toTarget` with the multiple of 2π/n nearest `preferred`. */
function alignmentValue(surface: FieldSurface, chain: DualChain, fromTarget: number, toTarget: number, order: number, preferred: number): number {
  const base = toTarget - fromTarget - chainSum(chain, surface.frames.edgeRotation);
  const step = TWO_PI / order;
  return base + step * Math.round((preferred - base) / step);
}

function chainKey(prefix: string, chain: DualChain): string {
  return `${prefix}:${chain.fromFace}>${chain.toFace}:${Array.from(chain.edges, (e, i) => (chain.signs[i] > 0 ? e : -e - 1)).join(',')}`;
}

/**
 * A given holonomy must be a whole number of symmetry steps: a field of order n comes back to
 * itself after a loop only if it turned by a multiple of 2π/n; anything else is a seam.
 */
function checkHolonomies(given: readonly (number | null)[], generatorCount: number, order: number) {
  const set = given.flatMap((value, i) => (value === null || value === undefined ? [] : [i]));
  if (set.length === 0) return;
  if (given.length > generatorCount) {
    throw new FieldError('bad-holonomy', `${given.length} generator holonomies were given, but the surface has ${generatorCount} generator${generatorCount === 1 ? '' : 's'} (two per handle).`);
  }
  for (const i of set) {
    const value = given[i]!;
    const steps = (value * order) / TWO_PI;
    if (!Number.isFinite(value)) throw new FieldError('bad-holonomy', `The holonomy given for generator ${i + 1} is not a finite angle.`);
    if (Math.abs(steps - Math.round(steps)) > 1e-6) {
      throw new FieldError('bad-holonomy', `The holonomy given for generator ${i + 1} is ${value} rad; a field of order ${order} can only turn by a multiple of 2π/${order} going round a loop (anything else is a seam).`);
    }
  }
}

/**
 * Solves for the trivial connection: the smallest (least-squares) set of extra rotations per edge
 * such that the holonomy around every vertex ring is 2π × its index (Levi-Civita's curvature
 * cancelled), around every generator the asked value, along every stroke and curve the asked
 * turning, with the boundary free or held.
 *
 * Guarantees: never refactors the surface's matrix; throws FieldError naming the reason for an
 * infeasible request (index not a multiple of 1/order, unbalanced index budget, singularity on a
 * free boundary or on a curve, conflicting alignments, curves that cross); never returns NaN.
 */
export function solveConnection(surface: FieldSurface, request: FieldRequest): ConnectionResult {
  const started = now();
  const topology = surface.topology;
  const { rowOfVertex, vertexOfRow, droppedVertexOfComponent, ringDefect } = surface.solver;
  // Kept from the last request with the same curves: a moved singularity changes neither.
  const { curves, cut } = laidOut(surface, request.curves ?? []);
  const { order, requestedIndex, budget } = validateRequest(surface, request, curves, cut);
  const frames = surface.frames;
  const step = TWO_PI / order;

  const ringValues = new Float64Array(vertexOfRow.length);
  const constrainedVertex = new Uint8Array(topology.vertexCount);
  for (let r = 0; r < vertexOfRow.length; r++) {
    const v = vertexOfRow[r];
    if (curves.cutVertex[v]) continue;
    ringValues[r] = TWO_PI * requestedIndex[v] - ringDefect[v];
    constrainedVertex[v] = 1;
  }

  // Stage 1 rows have fixed values; stage 2 rows (cycles nothing else fixes, and ties) take the
  // whole number of symmetry steps nearest to what the field does without them (`natural`).
  const stage1: ExtraRow[] = [];
  const stage2: { row: ExtraRow; roundedFrom: (natural: Float64Array) => number }[] = [];
  /** A cycle whose holonomy (Levi-Civita + extra) must be a multiple of 2π/n: the one nearest the natural turning. */
  const roundedCycle = (key: string, chain: DualChain) => {
    const levelCivita = chainSum(chain, frames.edgeRotation);
    stage2.push({ row: { key, chain, removedVertex: -1, value: 0 }, roundedFrom: (natural) => step * Math.round((levelCivita + chainSum(chain, natural)) / step) - levelCivita });
  };
  const hasCurves = (request.curves ?? []).length > 0;
  const given = request.generatorHolonomies ?? [];
  checkHolonomies(given, surface.generators.length, order);
  // Given holonomies belong to the prepared surface's generators, which curves never change.
  const held = surface.generators.flatMap((g, i) => {
    const wanted = given[i];
    if (wanted === null || wanted === undefined) return [];
    const crossed = hasCurves ? g.edges.findIndex((e) => curves.cutEdge[e] === 1) : -1;
    if (crossed >= 0) {
      throw new FieldError('holonomy-crosses-curve', `The loop of generator ${i + 1}, whose holonomy is given, crosses a parting or crest (at vertex ${topology.triangles[topology.edgeHalfedge[g.edges[crossed]]]}); leave its holonomy out while the curve is there.`);
    }
    return [{ index: i, row: { key: chainKey('g', g), chain: g, removedVertex: -1, value: wanted - chainSum(g, frames.edgeRotation) } }];
  });
  if (!hasCurves) {
    const heldIndex = new Set(held.map((h) => h.index));
    surface.generators.forEach((g, i) => {
      if (!heldIndex.has(i)) roundedCycle(chainKey('g', g), g);
    });
  }
  stage1.push(...held.map((h) => h.row));
  // A piece with several free boundary loops: all but one of them (the last follows from the rings).
  cut.pieces.forEach((piece) => {
    if (piece.budgeted) return;
    for (const loop of piece.boundaryLoops.slice(1)) roundedCycle(`loop:${loop}`, boundaryLoopChain(topology, topology.boundaryLoops[loop]));
  });
  if (hasCurves) {
    for (let v = 0; v < topology.vertexCount; v++) {
      if (curves.cutVertex[v] && rowOfVertex[v] >= 0) stage1.push({ key: `off:${v}`, chain: null, removedVertex: v, value: 0 });
    }
    // A cut gives a closed piece a boundary, so the ring left out to make the system definite counts again.
    droppedVertexOfComponent.forEach((v, c) => {
      if (v < 0 || curves.cutVertex[v]) return;
      if (!cut.pieces.some((piece) => piece.component === c && (piece.closedCurves.length > 0 || piece.openCurves.length > 0))) return;
      const fan = vertexFan(topology, v);
      stage1.push({ key: chainKey('ring', fan), chain: fan, removedVertex: -1, value: TWO_PI * requestedIndex[v] - ringDefect[v] });
      constrainedVertex[v] = 1;
    });
  }
  for (const v of droppedVertexOfComponent) if (v >= 0 && !curves.cutVertex[v]) constrainedVertex[v] = 1;

  // Fixed directions: curve sides, stroke samples, twists, held boundary loops.
  const fixedFaces = new Map<number, number>(curves.targets);
  const features: number[] = [...curves.anchors];
  // On a piece with no free boundary, the turning round all its loops together is fixed by its
  // rings (Poincaré–Hopf, checked by the budget), so one curve link there is implied and must go.
  const implied = new Set<number>();
  cut.pieces.forEach((piece, p) => {
    if (!piece.budgeted) return;
    const first = curves.links.findIndex((link) => cut.pieceOfFace[link.from] === p);
    if (first >= 0) implied.add(first);
  });
  for (const [i, link] of curves.links.entries()) {
    if (implied.has(i)) continue;
    stage1.push({
      key: chainKey('curve', link.chain),
      chain: link.chain,
      removedVertex: -1,
      value: alignmentValue(surface, link.chain, fixedFaces.get(link.from)!, fixedFaces.get(link.to)!, order, link.preferred),
    });
  }
  const fix = (face: number, angle: number, what: string) => {
    if (!Number.isInteger(face) || face < 0 || face >= topology.faceCount) throw new FieldError('face-out-of-range', `${what} is on face ${face}, which the surface does not have.`);
    if (!Number.isFinite(angle)) throw new FieldError('bad-direction', `${what} has a direction that is not finite or lies across the face.`);
    if (fixedFaces.has(face)) throw new FieldError('conflicting-constraints', `${what} fixes face ${face}, which another stroke, curve or twist already fixes.`);
    fixedFaces.set(face, angle);
  };
  (request.strokes ?? []).forEach((stroke, si) => {
    let previous = -1;
    stroke.forEach((sample, k) => {
      if (sample.face === previous) return;
      const [dx, dy, dz] = sample.direction;
      const f = sample.face;
      const angle = f >= 0 && f < topology.faceCount ? angleInFace(frames, f, dx, dy, dz) : NaN;
      fix(f, angle, `Stroke ${si + 1}, sample ${k + 1}`);
      if (previous === -1) features.push(f);
      else {
        const chain = shortestDualPath(topology, previous, f, curves.cutEdge);
        stage1.push({ key: chainKey('stroke', chain), chain, removedVertex: -1, value: alignmentValue(surface, chain, fixedFaces.get(previous)!, angle, order, 0) });
      }
      previous = f;
    });
  });
  const tri = topology.triangles;
  for (const s of request.singularities ?? []) {
    if (s.orientation === undefined) continue;
    const what = `The twist of the singularity at vertex ${s.vertex}`;
    const { face, angle } = twistReference(frames, topology, surface.mesh.positions, s.vertex, s.twistDirection, what);
    fix(face, angle + s.orientation, what);
    features.push(face);
  }
  if (surface.boundary !== 'free') {
    const quarter = surface.boundary === 'normal' ? Math.PI / 2 : 0;
    for (const loop of topology.boundaryLoops) {
      const h = loop[0];
      fix(faceOfHalfedge(h), frames.halfedgeAngle[h] + quarter, `The held boundary at vertex ${tri[h]}`);
      features.push(faceOfHalfedge(h));
    }
  }

  if (hasCurves) {
    // The cut surface's own generators, after the held ones, each kept only when the rows so far
    // leave its turning free: a loop beside a closed curve that does not separate the surface is
    // already fixed by the curve's links, and so is one homologous to a held generator.
    held.forEach(({ index, row }) => {
      const others = stage1.filter((r) => r !== row);
      if (!isIndependentRow(surface, others, row)) {
        throw new FieldError('holonomy-fixed-by-curve', `The holonomy of generator ${index + 1} is given, but the partings and crests already fix how the field turns round that loop; leave it out.`);
      }
    });
    const mayRepeat = held.length > 0 || curves.closed.length > 0;
    const kept: ExtraRow[] = [];
    for (const g of homologyGenerators(topology, curves.cutEdge)) {
      const row: ExtraRow = { key: chainKey('g', g), chain: g, removedVertex: -1, value: 0 };
      if (mayRepeat && !isIndependentRow(surface, [...stage1, ...stage2.map((r) => r.row), ...kept], row)) continue;
      kept.push(row);
      roundedCycle(row.key, g);
    }
  }
  // Tie each feature to the first fixed face of its piece of surface; the turning along the tie
  // is whatever the field would do without it, rounded to a whole symmetry step.
  const referenceOfPiece = new Map<number, number>();
  for (const f of features) {
    const p = cut.pieceOfFace[f];
    const reference = referenceOfPiece.get(p);
    if (reference === undefined) {
      referenceOfPiece.set(p, f);
      continue;
    }
    const chain = shortestDualPath(topology, reference, f, curves.cutEdge);
    stage2.push({
      row: { key: chainKey('tie', chain), chain, removedVertex: -1, value: 0 },
      roundedFrom: (natural) => alignmentValue(surface, chain, fixedFaces.get(chain.fromFace)!, fixedFaces.get(chain.toFace)!, order, chainSum(chain, natural)),
    });
  }
  const t = ringSolution(surface, ringValues);
  let angles: Float64Array;
  if (stage2.length === 0) {
    angles = solveRows(surface, ringValues, t, stage1);
  } else {
    const natural = solveRows(surface, ringValues, t, stage1);
    for (const { row, roundedFrom } of stage2) row.value = roundedFrom(natural);
    angles = solveRows(surface, ringValues, t, [...stage1, ...stage2.map(({ row }) => row)]);
  }
  let largestAngle = 0;
  for (let e = 0; e < angles.length; e++) {
    if (!Number.isFinite(angles[e])) throw new FieldError('numerical-failure', 'The solve produced a non-finite angle; the surface may have degenerate faces.');
    largestAngle = Math.max(largestAngle, Math.abs(angles[e]));
  }
  return {
    order,
    angles,
    requestedIndex,
    constrainedVertex,
    cutEdge: curves.cutEdge,
    fixedFaces,
    curveLinks: curves.links,
    budget,
    curveSides: curves.sides,
    largestAngle,
    solveMilliseconds: now() - started,
  };
}
