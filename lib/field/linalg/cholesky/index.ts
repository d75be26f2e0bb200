/**
 * Sparse Cholesky factorization P A Pᵀ = L Lᵀ for the field engine's symmetric
 * positive-definite systems, factored once per mesh and reused for many right-hand sides.
 *
 * Multifrontal and supernodal: columns of L with (nearly) the same pattern are grouped
 * into supernodes, each stored as dense blocks (a packed triangle and a row-major
 * rectangle below it), so the arithmetic runs in dense kernels over contiguous memory
 * instead of scattered scalar updates. Each supernode's contribution to its ancestors
 * (its Schur complement, the "update matrix") is kept on a stack; postorder guarantees a
 * parent finds its children's updates on top.
 *
 * Pure TypeScript on typed arrays: runs unchanged in a Web Worker and on the server.
 */
import type { SymmetricSparse } from '../sparse';
import { factorNumeric } from './numeric';
import type { CholeskyFactor } from './solve';
import { analyzeCholesky, type CholeskyOptions } from './symbolic';

export { analyzeCholesky, computeOrdering, permutationFault, type CholeskyAnalysisOptions, type CholeskyOptions, type CholeskySymbolic } from './symbolic';
export { factorNumeric, NotPositiveDefiniteError } from './numeric';
export type { CholeskyFactor } from './solve';

/**
 * Orders, analyses and factors A in one call: A = Pᵀ L Lᵀ P.
 *
 * Guarantees: as `analyzeCholesky` then `factorNumeric`. Throws RangeError for a
 * malformed matrix, NotPositiveDefiniteError when A is not (numerically) positive definite.
 */
export function factorCholesky(A: SymmetricSparse, options: CholeskyOptions = {}): CholeskyFactor {
  return factorNumeric(analyzeCholesky(A, options), A);
}
