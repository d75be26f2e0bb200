// Failures of the studio's operations that a person can act on. Route handlers turn them into
// the platform's JSON envelope (lib/studio/http.ts); anything else is a server error.
import type { ApiError, ApiErrorCode } from '../http/types';

export class StudioError extends Error {
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly extra: Pick<ApiError, 'fields' | 'details'> = {},
  ) {
    super(message);
    this.name = 'StudioError';
  }
}

export type StudioThing = 'upload' | 'surface' | 'groom' | 'version' | 'export';

/** Not there, or another groomer's: the answer is the same, so ids of others are not confirmed. */
export function notFound(thing: StudioThing): StudioError {
  return new StudioError(404, 'not-found', `There is no such ${thing} in your studio.`);
}
