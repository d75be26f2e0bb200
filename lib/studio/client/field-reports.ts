// What the field worker reports besides drawings: a failure as the page shows it (with the spec
// path when the groom library knows it), and the proof that the measured indices equal the
// placed ones and that no edge hides a seam.
import { FieldError, type SolvedField } from '@/lib/field';
import { GroomError } from '@/lib/groom';
import { NONZERO_LIMIT, type IndexProof, type WorkerError } from './protocol';

/** Any thrown value as a worker error: the library's own code and words, or an internal failure. */
export function errorOf(error: unknown): WorkerError {
  if (error instanceof GroomError) return { code: error.code, message: error.message, ...(error.path ? { path: error.path } : {}) };
  if (error instanceof FieldError) return { code: error.code, message: error.message };
  if (error instanceof Error) return { code: 'internal', message: `Something went wrong in the field worker: ${error.message}` };
  return { code: 'internal', message: 'Something went wrong in the field worker.' };
}

/** What the independent measurement of a solved field says, against what was placed. */
export function proofOf(solved: SolvedField): IndexProof {
  const { requestedIndex, constrainedVertex } = solved.connection;
  const measured = solved.measuredIndex;
  const nonZero: { vertex: number; index: number }[] = [];
  let nonZeroCount = 0, strays = 0, mismatches = 0, measuredVertices = 0, measuredSum = 0;
  for (let v = 0; v < measured.length; v++) {
    if (!constrainedVertex[v]) continue;
    measuredVertices++;
    const m = Math.round(measured[v] * 1e9) / 1e9;
    measuredSum += m;
    if (Math.abs(m - requestedIndex[v]) > 1e-6) mismatches++;
    if (Math.abs(m) <= 1e-6) continue;
    nonZeroCount++;
    if (requestedIndex[v] === 0) strays++;
    if (nonZero.length < NONZERO_LIMIT) nonZero.push({ vertex: v, index: m });
  }
  const { checkedEdges, largestTurn, checkedCurveTurns } = solved.edgeProof;
  return {
    measuredVertices,
    nonZero,
    nonZeroCount,
    strays,
    mismatches,
    measuredSum: Math.round(measuredSum * 1e6) / 1e6,
    checkedEdges,
    largestTurnDegrees: Math.round(((largestTurn * 180) / Math.PI) * 10) / 10,
    checkedCurveTurns,
  };
}
