// The JSON envelope of every route handler under app/api, shared with the client code.
// Success: { data: T } with a 2xx status. Failure: { error: ApiError } with a 4xx/5xx status.
import type { FieldErrors } from './field-errors';

/** Every error code a route handler may answer with, the accounts', the studio's and the market's. */
export type ApiErrorCode =
  | 'invalid-input'
  | 'too-large'
  | 'not-signed-in'
  | 'forbidden'
  | 'not-found'
  | 'mail-failed'
  | 'service-unavailable'
  | 'too-many-requests'
  | 'server-error'
  // accounts
  | 'email-taken'
  | 'invalid-token'
  | 'expired-token'
  | 'used-token'
  // studio
  | 'upload-missing'
  | 'surface-rejected'
  | 'surface-in-use'
  | 'surface-not-ready'
  | 'invalid-spec'
  | 'stale-revision'
  | 'transfer-refused'
  | 'same-surface'
  | 'map-refused'
  // market
  | 'bad-signature'
  | 'own-listing'
  | 'already-owned'
  | 'not-for-sale'
  | 'wrong-state'
  | 'assets-pending'
  | 'package-pending'
  | 'refunded'
  | 'refund-pending'
  | 'not-owned'
  | 'nothing-to-pay-out'
  | 'choose-currency'
  | 'payment-provider'
  // a buyer's own use of a bought preset (fit, trial)
  | 'bought-not-for-resale';

/** `details` carries what a code needs beyond words, e.g. the problems of a rejected surface. */
export type ApiError = { code: ApiErrorCode; message: string; fields?: FieldErrors; details?: Record<string, unknown> };

export type ApiSuccess<T> = { data: T };
export type ApiFailure = { error: ApiError };
