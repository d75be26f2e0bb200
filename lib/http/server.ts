// Helpers for route handlers: read and validate JSON input, answer in the shared envelope.
import { NextResponse } from 'next/server';
import type { z } from 'zod';
import { fieldErrors } from './field-errors';
import type { ApiError, ApiErrorCode, ApiFailure, ApiSuccess } from './types';

export function jsonData<T>(data: T, status = 200) {
  return NextResponse.json<ApiSuccess<T>>({ data }, { status });
}

export function jsonError(status: number, code: ApiErrorCode, message: string, fields?: ApiError['fields']) {
  const error: ApiError = fields ? { code, message, fields } : { code, message };
  return NextResponse.json<ApiFailure>({ error }, { status });
}

type Parsed<T> = { ok: true; value: T } | { ok: false; response: NextResponse<ApiFailure> };

/** Parses the request body as JSON and validates it; the failure is a ready 400 response. */
export async function readJson<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<Parsed<z.infer<Schema>>> {
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return { ok: false, response: jsonError(400, 'invalid-input', 'The request body must be JSON.') };
  }
  const result = schema.safeParse(body);
  if (!result.success) {
    return {
      ok: false,
      response: jsonError(400, 'invalid-input', 'Some fields need another look.', fieldErrors(result.error)),
    };
  }
  return { ok: true, value: result.data };
}
