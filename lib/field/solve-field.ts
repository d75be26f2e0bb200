import { solveConnection, type ConnectionResult, type FieldRequest, type FieldSurface } from './connection';
import { buildDirectionField, type DirectionField } from './direction-field';
import { compareIndices, measureIndices, type IndexMismatch } from './indices';

/** Everything a solve produces, with the proof that it did what was asked. */
export interface SolvedField {
  readonly connection: ConnectionResult;
  readonly field: DirectionField;
  /** Index measured from the field alone, per vertex (see `measureIndices`). */
  readonly measuredIndex: Float64Array;
  /** Vertices where the measured index differs from the requested one; empty when the guarantee holds. */
  readonly mismatches: readonly IndexMismatch[];
  readonly timings: { readonly solveMilliseconds: number; readonly fieldMilliseconds: number; readonly measureMilliseconds: number };
}

const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/**
 * Solves the connection, builds the field and measures its indices independently.
 *
 * Guarantees: throws FieldError for an infeasible request; otherwise returns a unit direction per
 * face, and `mismatches` lists every vertex whose measured index differs from the one asked
 * (zero where nothing was placed). The list is empty whenever every connection angle is below
 * π/order in size, which smooth requests on reasonable meshes satisfy; a non-empty list names the
 * vertices so the caller can show them instead of trusting a wrong field.
 */
export function solveField(surface: FieldSurface, request: FieldRequest): SolvedField {
  const connection = solveConnection(surface, request);
  const t0 = now();
  const field = buildDirectionField(surface, connection, request);
  const t1 = now();
  const measurement = measureIndices(surface, field.faceDirection, connection.order, surface.boundary === 'free' ? undefined : surface.solver.ringDefect);
  const mismatches = compareIndices(connection, measurement);
  const t2 = now();
  return {
    connection,
    field,
    measuredIndex: measurement.index,
    mismatches,
    timings: { solveMilliseconds: connection.solveMilliseconds, fieldMilliseconds: t1 - t0, measureMilliseconds: t2 - t1 },
  };
}
