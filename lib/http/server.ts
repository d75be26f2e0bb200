// The one way a route handler under app/api answers: `handler` checks who may call (401 / 403),
// hands the work the signed-in Actor, and turns an HttpError into the JSON envelope; ids from the
// path, the JSON body and the query are read here too, failing as HttpErrors.
import { randomUUID } from 'node:crypto';
import { NextResponse } from 'next/server';
import { z } from 'zod';
import { actorOf, type Actor } from '../accounts/actor';
import type { Role } from '../accounts/roles';
import { currentSession } from '../accounts/session';
import { HttpError } from './errors';
import { fieldErrors } from './field-errors';
import type { ApiFailure, ApiSuccess } from './types';

export function jsonData<T>(data: T, status = 200) {
  return NextResponse.json<ApiSuccess<T>>({ data }, { status });
}

function errorResponse(error: HttpError) {
  return NextResponse.json<ApiFailure>({ error: error.toApiError() }, { status: error.status });
}

async function signedInActor(roles: readonly Role[]): Promise<Actor> {
  const session = await currentSession();
  if (!session) throw new HttpError(401, 'not-signed-in', 'Sign in first.');
  if (!roles.some((role) => session.user.roles.includes(role))) {
    throw new HttpError(403, 'forbidden', `This needs the ${roles.join(' or ')} role; your account does not have it.`);
  }
  return actorOf(session);
}

/**
 * Runs a route handler's work for those who may call it, and answers an HttpError it throws in
 * the envelope (any other error is a 500 with a plain message, see unexpectedFailure):
 * - roles: signed in with one of them (401 signed out, 403 without), the work gets the Actor;
 * - 'public': anyone, the work gets the Actor or null when nobody is signed in;
 * - 'none': no session is read at all (sign-up, the payment provider's webhook, the search).
 */
export function handler(access: readonly Role[], work: (actor: Actor) => Promise<Response>): Promise<Response>;
export function handler(access: 'public', work: (actor: Actor | null) => Promise<Response>): Promise<Response>;
export function handler(access: 'none', work: () => Promise<Response>): Promise<Response>;
export async function handler(access: readonly Role[] | 'public' | 'none', work: (actor: Actor) => Promise<Response>): Promise<Response> {
  try {
    if (access === 'none') return await (work as () => Promise<Response>)();
    if (access === 'public') {
      const session = await currentSession();
      return await (work as (actor: Actor | null) => Promise<Response>)(session ? actorOf(session) : null);
    }
    return await work(await signedInActor(access));
  } catch (error) {
    if (error instanceof HttpError) return errorResponse(error);
    return unexpectedFailure(error);
  }
}

/**
 * Anything but an HttpError: a 500 with a plain message. The error's own text (a database's, a
 * provider's, a stack) goes to the server's log only; it names tables, hosts and values that are
 * of no use to the person and of use to an attacker.
 */
function unexpectedFailure(error: unknown): Response {
  const reference = randomUUID();
  console.error(`[whorlwind] unexpected failure ${reference} in a route handler:`, error);
  return errorResponse(
    new HttpError(500, 'server-error', 'Something went wrong on our side. Try again in a moment; if it keeps happening, tell us this reference.', {
      details: { reference },
    }),
  );
}

const uuid = z.uuid();

/**
 * The id named `key` in the route's parameters, lower-cased; when it cannot be an id, `missing`
 * is thrown (the area's not-found error: a malformed id is as unknown as a missing one).
 */
export async function pathId<Key extends string>(params: Promise<Record<Key, string>>, key: Key, missing: HttpError): Promise<string> {
  const value = (await params)[key];
  if (!uuid.safeParse(value).success) throw missing;
  return value.toLowerCase();
}

/** Validates a value with a schema; a failure is a 400 invalid-input with a message per field. */
export function parseInput<Schema extends z.ZodType>(schema: Schema, value: unknown): z.infer<Schema> {
  const result = schema.safeParse(value);
  if (!result.success) throw new HttpError(400, 'invalid-input', 'Some fields need another look.', { fields: fieldErrors(result.error) });
  return result.data;
}

/**
 * Most bytes a JSON body may have: 1 MB, far above any form or spec of the app (a spec's lists are
 * bounded by its schema; the largest demo spec is a few kB). Common practice, no standard.
 */
export const JSON_BODY_LIMIT = 1_000_000;
/**
 * Most bytes of a payment provider's event: 1 MB. The provider documents no maximum; its events
 * carry one object each and are a few kB. Common practice, no standard.
 */
export const WEBHOOK_BODY_LIMIT = 1_000_000;
/**
 * Most bytes of a groom spec saved by the studio: 40 MB. A spec carries its painted maps (lib/groom
 * spec/maps.ts): nine 16-bit maps on the largest surface allowed (2,000,000 faces, about 1,000,000
 * vertices: 2.7 MB of base64 each) and the rest of the spec fit with room to spare. Worked out
 * from our own limits; no standard.
 */
export const SPEC_BODY_LIMIT = 40_000_000;

function bodyTooLarge(limit: number): HttpError {
  return new HttpError(413, 'too-large', `The request body is larger than ${limit / 1_000_000} MB, the most this address accepts.`);
}

/**
 * The body as text, read as a stream and given up past `limit` bytes (413 too-large): the read
 * stops there, so a sender cannot make the server hold more. A declared Content-Length over the
 * limit is refused before reading; a smaller one is not trusted (it can lie, or be absent with
 * chunked transfer), the bytes are counted.
 */
export async function readLimitedText(request: Request, limit = JSON_BODY_LIMIT): Promise<string> {
  const declared = Number(request.headers.get('content-length') ?? '');
  if (Number.isFinite(declared) && declared > limit) throw bodyTooLarge(limit);
  if (!request.body) return '';
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => {});
      throw bodyTooLarge(limit);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/**
 * The JSON body (at most `limit` bytes, JSON_BODY_LIMIT unless the route says otherwise; else 413
 * too-large), validated with the schema
 * (400 invalid-input when it is not JSON, or with a message per field). An empty body counts as
 * `{}`, for calls whose fields are all optional.
 */
export async function readBody<Schema extends z.ZodType>(request: Request, schema: Schema, limit = JSON_BODY_LIMIT): Promise<z.infer<Schema>> {
  const raw = await readLimitedText(request, limit);
  let body: unknown = {};
  if (raw.trim() !== '') {
    try {
      body = JSON.parse(raw);
    } catch {
      throw new HttpError(400, 'invalid-input', 'The request body must be JSON.');
    }
  }
  return parseInput(schema, body);
}

/** Query parameters as a plain object (a repeated key gives all its values, in order). */
export function queryOf(request: Request): Record<string, string | string[]> {
  const params = new URL(request.url).searchParams;
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    out[key] = all.length > 1 ? all : all[0];
  }
  return out;
}
