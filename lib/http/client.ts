// How client components talk to the route handlers: one `request<T>` that answers with a typed
// result instead of throwing (for forms and buttons), and a throwing fetcher for SWR.
import type { ApiError, ApiFailure, ApiSuccess } from './types';

/** An error as a route handler sent it, with the HTTP status (0 when the server could not be reached). */
export type ApiCallError = ApiError & { status: number };

export type ApiOutcome<T> = { ok: true; data: T } | { ok: false; error: ApiCallError };

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

const UNREACHABLE = 'Whorlwind could not be reached. Check your connection and try again.';

/** Calls a route handler with an optional JSON body; never throws. */
export async function request<T>(method: HttpMethod, url: string, body?: unknown): Promise<ApiOutcome<T>> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      headers: body === undefined ? { accept: 'application/json' } : { accept: 'application/json', 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, error: { code: 'service-unavailable', message: UNREACHABLE, status: 0 } };
  }
  let envelope: Partial<ApiSuccess<T> & ApiFailure>;
  try {
    envelope = await response.json();
  } catch {
    return { ok: false, error: { code: 'service-unavailable', message: `The server answered ${response.status} without details.`, status: response.status } };
  }
  if (envelope.error || !response.ok) {
    const error = envelope.error ?? { code: 'service-unavailable', message: `The server answered ${response.status}.` };
    return { ok: false, error: { ...error, status: response.status } };
  }
  return { ok: true, data: envelope.data as T };
}

export function postJson<T>(url: string, body: unknown): Promise<ApiOutcome<T>> {
  return request<T>('POST', url, body);
}

export class ApiRequestError extends Error {
  constructor(readonly apiError: ApiCallError) {
    super(apiError.message);
  }
}

/** SWR fetcher: resolves to the `data` of the envelope, throws ApiRequestError otherwise. */
export async function fetchData<T>(url: string): Promise<T> {
  const outcome = await request<T>('GET', url);
  if (!outcome.ok) throw new ApiRequestError(outcome.error);
  return outcome.data;
}
