// How client components talk to the route handlers: typed results instead of thrown errors
// for form submissions, and a throwing fetcher for SWR.
import type { ApiError, ApiFailure, ApiSuccess } from './types';

export type ApiOutcome<T> = { ok: true; data: T } | { ok: false; error: ApiError };

const unreachable: ApiError = {
  code: 'service-unavailable',
  message: 'Whorlwind could not be reached. Check your connection and try again.',
};

async function outcomeOf<T>(response: Response): Promise<ApiOutcome<T>> {
  let body: ApiSuccess<T> | ApiFailure;
  try {
    body = await response.json();
  } catch {
    return { ok: false, error: { code: 'service-unavailable', message: `The server answered ${response.status} without details.` } };
  }
  if ('error' in body) return { ok: false, error: body.error };
  return { ok: true, data: body.data };
}

export async function postJson<T>(url: string, body: unknown): Promise<ApiOutcome<T>> {
  try {
    const response = await fetch(url, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(body),
    });
    return await outcomeOf<T>(response);
  } catch {
    return { ok: false, error: unreachable };
  }
}

export class ApiRequestError extends Error {
  constructor(readonly apiError: ApiError) {
    super(apiError.message);
  }
}

/** SWR fetcher: resolves to the `data` of the envelope, throws ApiRequestError otherwise. */
export async function fetchData<T>(url: string): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { accept: 'application/json' } });
  } catch {
    throw new ApiRequestError(unreachable);
  }
  const outcome = await outcomeOf<T>(response);
  if (!outcome.ok) throw new ApiRequestError(outcome.error);
  return outcome.data;
}
