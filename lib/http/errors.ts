// The one failure a person can act on, thrown by any area's server logic and turned into the JSON
// envelope by the route handler (lib/http/server.ts); anything else is a server error. Kept apart
// from server.ts so that scripts and seeds may use the areas' logic without Next.js.
import type { ApiError, ApiErrorCode } from './types';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly extra: Pick<ApiError, 'fields' | 'details'> = {},
  ) {
    super(message);
    this.name = 'HttpError';
  }

  /** The envelope's `error`, as the client receives it. */
  toApiError(): ApiError {
    return { code: this.code, message: this.message, ...this.extra };
  }
}
