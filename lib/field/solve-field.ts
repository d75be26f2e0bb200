/**
 * The one call an editor makes per edit: solve, build the field, and measure it independently,
 * so that a field with a singularity the groomer did not place never leaves the engine.
 */
import { now } from './clock';
import { solveConnection, type ConnectionResult, type FieldRequest, type FieldSurface } from './connection';
import { buildDirectionField, type DirectionField } from './direction-field';
import { compareIndices, measureIndices, type IndexMismatch } from './indices';
import { FieldError, describeFirst } from './mesh/errors';
import { faceNormals } from './mesh/geometry';
import { proveEdges, type EdgeProof, type ProofViolation } from './proof';

/** Everything a solve produces, with the proof that it did what was asked. */
export interface SolvedField {
  readonly connection: ConnectionResult;
  readonly field: DirectionField;
  /** Index measured from the field alone, per vertex (see `measureIndices`). */
  readonly measuredIndex: Float64Array;
  /** What the edge half of the proof checked (see `proveEdges`). */
  readonly edgeProof: EdgeProof;
  readonly timings: { readonly solveMilliseconds: number; readonly fieldMilliseconds: number; readonly measureMilliseconds: number };
}

/**
 * Solves the connection, builds the field and proves it: measures every vertex's index and every
 * edge's turn independently of the solver.
 *
 * Guarantees: either returns a unit direction per face whose independently measured index equals
 * the requested one at every vertex where an index is defined (zero where nothing was placed),
 * whose turn across every interior edge off the curves is the connection's angle there and below
 * π/order (no seam anywhere), which points across every curve and turns round each curve vertex as
 * the curve demands; or throws a FieldError naming the reason: an infeasible request (see
 * `solveConnection`); (`singularities-too-close`) singularities packed more tightly than the mesh
 * can resolve, where the field would have to turn by π/order or more between neighbouring faces;
 * (`field-not-proved`) a field that breaks the proof in any other way, which is never returned.
 */
export function solveField(surface: FieldSurface, request: FieldRequest): SolvedField {
  const connection = solveConnection(surface, request);
  const t0 = now();
  const field = buildDirectionField(surface, connection, request);
  const t1 = now();
  // Both checks read the face normals from the positions (not the solver's frames), once.
  const normals = faceNormals(surface.mesh);
  const measurement = measureIndices(surface, field.faceDirection, connection.order, surface.boundary === 'free' ? undefined : surface.ringDefect, normals);
  const mismatches = compareIndices(connection, measurement);
  if (mismatches.length > 0) throw tooCloseError(mismatches);
  const { proof, violations } = proveEdges(surface, connection, field.faceDirection, normals);
  if (violations.length > 0) throw unprovedError(violations, connection.order);
  const t2 = now();
  return {
    connection,
    field,
    measuredIndex: measurement.index,
    edgeProof: proof,
    timings: { solveMilliseconds: connection.solveMilliseconds, fieldMilliseconds: t1 - t0, measureMilliseconds: t2 - t1 },
  };
}

function tooCloseError(mismatches: readonly IndexMismatch[]): FieldError {
  const where = describeFirst(mismatches.map((m) => `${m.vertex} (asked ${m.requested}, would get ${Math.round(m.measured * 1e6) / 1e6})`), 4);
  return new FieldError(
    'singularities-too-close',
    `The singularities sit too close together for this surface's resolution: the field would turn too fast between neighbouring faces at vertices ${where}. Move them apart or use a finer surface.`,
  );
}

function unprovedError(violations: readonly ProofViolation[], order: number): FieldError {
  const near = (kind: ProofViolation['kind']) => describeFirst([...new Set(violations.filter((v) => v.kind === kind).map((v) => v.vertex))], 4);
  const count = (kind: ProofViolation['kind']) => violations.filter((v) => v.kind === kind).length;
  if (count('too-fast') > 0) {
    return new FieldError(
      'singularities-too-close',
      `The singularities sit too close together for this surface's resolution: the field would turn by ${Math.round(180 / order)}° or more between neighbouring faces near vertices ${near('too-fast')}. Move them apart or use a finer surface.`,
    );
  }
  const degrees = (v: ProofViolation) => `${Math.round((Math.abs(v.angle) * 180) / Math.PI * 10) / 10}°`;
  const parts: string[] = [];
  const seam = violations.find((v) => v.kind === 'seam');
  if (seam) parts.push(`it would jump by ${degrees(seam)} across ${count('seam')} edge${count('seam') === 1 ? '' : 's'} near vertices ${near('seam')} (a seam)`);
  if (count('curve-side') > 0) parts.push(`it would not cross the curve at ${count('curve-side')} face${count('curve-side') === 1 ? '' : 's'} beside vertices ${near('curve-side')}`);
  if (count('curve-turn') > 0) parts.push(`it would twist round the curve at vertices ${near('curve-turn')}`);
  return new FieldError('field-not-proved', `The field was not returned because the check of the solved field failed: ${parts.join('; ')}. Please send this surface and groom to Whorlwind's support.`);
}
