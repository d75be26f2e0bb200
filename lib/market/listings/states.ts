// The life of a listing in one table: which command may move a listing from which state to
// which, so the seller's and the admin's commands (lifecycle.ts) and the tests read the same
// rules. A new listing starts as a draft:
//   draft, rejected or unlisted → edit → draft;   draft, rejected or unlisted → submit → submitted;
//   submitted → approve → published | reject → rejected (with a reason);
//   submitted or published → unlist → unlisted.
import { HttpError } from '../../http/errors';
import type { ListingState } from '../vocabulary';

export type ListingCommand = 'edit' | 'submit' | 'approve' | 'reject' | 'unlist';

type Transition = {
  from: readonly ListingState[];
  to: ListingState;
  /** Ends "A <state> listing cannot be …" when the listing is in another state. */
  refused: string;
};

export const LISTING_TRANSITIONS: Readonly<Record<ListingCommand, Transition>> = {
  edit: { from: ['draft', 'rejected', 'unlisted'], to: 'draft', refused: 'edited; unlist it first' },
  submit: { from: ['draft', 'rejected', 'unlisted'], to: 'submitted', refused: 'submitted' },
  approve: { from: ['submitted'], to: 'published', refused: 'decided on; only submitted ones are' },
  reject: { from: ['submitted'], to: 'rejected', refused: 'decided on; only submitted ones are' },
  unlist: { from: ['submitted', 'published'], to: 'unlisted', refused: 'unlisted' },
};

/** The state `command` moves a listing in `state` to; 409 `wrong-state` (with the state in the details) if it may not. */
export function nextState(state: ListingState, command: ListingCommand): ListingState {
  const transition = LISTING_TRANSITIONS[command];
  if (!transition.from.includes(state)) {
    throw new HttpError(409, 'wrong-state', `A ${state} listing cannot be ${transition.refused}.`, { details: { state } });
  }
  return transition.to;
}
