// The one table of a listing's allowed state changes (lib/market/listings/states.ts): every
// command from every state, and the refusal the seller or admin reads otherwise.
import { describe, expect, it } from 'vitest';
import { HttpError } from '@/lib/http/errors';
import { LISTING_TRANSITIONS, nextState, type ListingCommand } from '@/lib/market/listings/states';
import { LISTING_STATES, type ListingState } from '@/lib/market/vocabulary';

const ALLOWED: Record<ListingCommand, Partial<Record<ListingState, ListingState>>> = {
  edit: { draft: 'draft', rejected: 'draft', unlisted: 'draft' },
  submit: { draft: 'submitted', rejected: 'submitted', unlisted: 'submitted' },
  approve: { submitted: 'published' },
  reject: { submitted: 'rejected' },
  unlist: { submitted: 'unlisted', published: 'unlisted' },
};

const REFUSALS: Record<ListingCommand, (state: ListingState) => string> = {
  edit: (state) => `A ${state} listing cannot be edited; unlist it first.`,
  submit: (state) => `A ${state} listing cannot be submitted.`,
  approve: (state) => `A ${state} listing cannot be decided on; only submitted ones are.`,
  reject: (state) => `A ${state} listing cannot be decided on; only submitted ones are.`,
  unlist: (state) => `A ${state} listing cannot be unlisted.`,
};

function refusal(state: ListingState, command: ListingCommand): HttpError {
  try {
    nextState(state, command);
  } catch (error) {
    return error as HttpError;
  }
  throw new Error(`${command} from ${state} was allowed`);
}

describe('listing states', () => {
  it('has a rule for exactly the five commands', () => {
    expect(Object.keys(LISTING_TRANSITIONS).sort()).toEqual(Object.keys(ALLOWED).sort());
  });

  for (const command of Object.keys(ALLOWED) as ListingCommand[]) {
    for (const state of LISTING_STATES) {
      const to = ALLOWED[command][state];
      if (to) {
        it(`${command} moves a ${state} listing to ${to}`, () => {
          expect(nextState(state, command)).toBe(to);
        });
      } else {
        it(`${command} refuses a ${state} listing with 409 wrong-state`, () => {
          const error = refusal(state, command);
          expect(error).toBeInstanceOf(HttpError);
          expect(error).toMatchObject({ status: 409, code: 'wrong-state', message: REFUSALS[command](state), extra: { details: { state } } });
        });
      }
    }
  }

  it('lets a listing reach the market only through submission and approval', () => {
    const into = (target: ListingState) => (Object.keys(LISTING_TRANSITIONS) as ListingCommand[]).filter((c) => LISTING_TRANSITIONS[c].to === target);
    expect(into('published')).toEqual(['approve']);
    expect(LISTING_TRANSITIONS.approve.from).toEqual(['submitted']);
  });
});
