// The provider's error answers, thrown by any handler and turned into the response by the
// router, so that the SDK raises the same error classes it raises against the real API.

export type StripeErrorBody = { error: { type: string; code?: string; decline_code?: string; message: string; param?: string } };

/** An answer other than 200, in the provider's error shape. */
export class FakeError extends Error {
  constructor(
    readonly status: number,
    readonly body: StripeErrorBody,
  ) {
    super(body.error.message);
  }
}

/** 400 invalid_request_error about one parameter (`parameter_invalid` unless told). */
export function invalid(message: string, param?: string, code = 'parameter_invalid'): FakeError {
  return new FakeError(400, { error: { type: 'invalid_request_error', code, message, ...(param && { param }) } });
}

/** 404 resource_missing: "No such <kind>: '<id>'". */
export function missing(kind: string, id: string, param = 'id'): FakeError {
  return new FakeError(404, {
    error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such ${kind}: '${id}'`, param },
  });
}
