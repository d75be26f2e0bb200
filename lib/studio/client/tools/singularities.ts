// Placing a singularity with a click: the one way whorls, saddles, any-index singularities and
// the budget's remainder are put on the surface, at the vertex nearest the click.
import { addSingularity } from '../spec-edits';
import type { ClickResult } from './clicks';
import type { SurfaceHit } from './tool';

/**
 * The click that adds a singularity of an index at the vertex under the pointer; `alone` keeps it
 * on this side only with twin sides on (the budget's remainder).
 */
export function placeSingularity(hit: SurfaceHit, index: number, alone = false): ClickResult {
  return { changes: [{ type: 'apply', edit: addSingularity(hit.vertexPoint, index, alone) }] };
}
