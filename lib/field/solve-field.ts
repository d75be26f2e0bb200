/**
 * The one call an editor makes per edit: solve, build the field, and measure it independently,
 * so that a field with a singularity the groomer did not place never leaves the engine.
 */
import { now } from './clock';
import { solveConnection, type ConnectionResult, type FieldRequest, type FieldSurface } from './connection';
import { buildDirectionField, type DirectionField } from './direction-field';
import { compareIndices, measureIndices, type IndexMismatch } from './indices';
import { FieldError, describeFirst } from './mesh/errors';

/** Everything a solve produces, with the proof that it did what was asked. */
export interface SolvedField {
  readonly connection: ConnectionResult;
  readonly field: DirectionField;
  /** Index measured from the field alone, per vertex (see `measureIndices`). */
  readonly measuredIndex: Float64Array;
  readonly timings: { readonly solveMilliseconds: number; readonly fieldMilliseconds: number; readonly measureMilliseconds: number };
}

/**
 * Solves the connection, builds the field and measures its indices independently.
 *
 * Guarantees: either returns a unit direction per face whose independently measured index equals
 * the requested one at every vertex where an index is defined (zero where nothing was placed), or
 * throws a FieldError naming the reason: an infeasible request (see `solveConnection`), or
 * (`singularities-too-close`) singularities packed more tightly than the mesh can resolve, where
 * the field would have to turn by π/order or more between neighbouring faces.
 */
export function solveField(surface: FieldSurface, request: FieldRequest): SolvedField {
  const connection = solveConnection(surface, request);
  const t0 = now();
  const field = buildDirectionField(surface, connection, request);
  const t1 = now();
  const measurement = measureIndices(surface, field.faceDirection, connection.order, surface.boundary === 'free' ? undefined : surface.ringDefect);
  const mismatches = compareIndices(connection, measurement);
  if (mismatches.length > 0) throw tooCloseError(mismatches);
  const t2 = now();
  return {
    connection,
    field,
    measuredIndex: measurement.index,
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
