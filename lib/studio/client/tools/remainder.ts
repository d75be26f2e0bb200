// Placing what remains of the index budget: one click puts a singularity of the remainder of the
// piece of surface clicked, then the editor goes back to looking. Picked from the budget card.
import { clickTool } from './clicks';
import { placeSingularity } from './singularities';

export const remainderTool = clickTool(
  { id: 'remainder', label: 'Remainder', shortcut: null, hint: 'Click the surface where what remains of the index budget should go.' },
  (hit, context) => {
    const budget = context.solve?.budget;
    const piece = budget?.pieceOfVertex[hit.vertex] ?? -1;
    if (budget && piece < 0) return { notice: 'That point is on a parting or crest; click beside it.', then: 'remainder' };
    const remainder = budget?.pieces[piece]?.remainder ?? null;
    if (remainder === null || remainder === 0) return { notice: 'Nothing remains to be placed on this piece of the surface.', then: 'look' };
    // The remainder balances the budget: mirrored, it would unbalance it again.
    return { ...placeSingularity(hit, remainder, true), then: 'look' };
  },
);
