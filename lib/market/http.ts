// What every market route handler does around its call into lib/market: the role check (401 /
// 403), ids from the path (a malformed id is as unknown as a missing one: 404), input validation,
// and MarketError turned into the JSON envelope `{ error: { code, message, fields?, details? } }`.
import { NextResponse } from 'next/server';
import { z } from 'zod';
import { requireApiRoles, currentSession, type SignedInSession } from '../accounts/session';
import type { Role } from '../accounts/roles';
import { fieldErrors } from '../http/field-errors';
import { MarketError, notFound, type MarketErrorCode, type MarketThing } from './errors';
import { startMarketWorkers } from './jobs';

export type MarketFailure = { error: { code: MarketErrorCode; message: string; fields?: Record<string, string>; details?: Record<string, unknown> } };

export function marketData<T>(data: T, status = 200) {
  return NextResponse.json<{ data: T }>({ data }, { status });
}

export function marketErrorResponse(error: MarketError) {
  return NextResponse.json<MarketFailure>({ error: { code: error.code, message: error.message, ...error.extra } }, { status: error.status });
}

/** The person a market call acts for. */
export type Actor = { userId: string; roles: readonly Role[]; email: string | null };

function actorOf(session: SignedInSession): Actor {
  return { userId: session.user.id, roles: session.user.roles, email: session.user.email ?? null };
}

/**
 * The first market call of a server process starts its job workers (pictures, packages, the
 * reconciliation schedule); a failure to start is logged and the call goes on.
 */
export function ensureWorkers() {
  startMarketWorkers().catch((error) => console.error(`[market] workers did not start: ${(error as Error).message}`));
}

async function guarded(work: () => Promise<Response>): Promise<Response> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof MarketError) return marketErrorResponse(error);
    throw error;
  }
}

/** For calls that need one of the roles: 401 signed out, 403 without the role. */
export async function marketHandler(roles: readonly Role[], work: (actor: Actor) => Promise<Response>): Promise<Response> {
  const access = await requireApiRoles(roles);
  if (!access.ok) return access.response;
  ensureWorkers();
  return guarded(() => work(actorOf(access.session)));
}

/** For calls open to visitors; the actor is null when nobody is signed in. */
export async function publicMarketHandler(work: (actor: Actor | null) => Promise<Response>): Promise<Response> {
  const session = await currentSession();
  ensureWorkers();
  return guarded(() => work(session ? actorOf(session) : null));
}

/** For calls with no session at all (the payment provider's webhook, the search). */
export function plainMarketHandler(work: () => Promise<Response>): Promise<Response> {
  return guarded(work);
}

const uuid = z.uuid();

export async function pathId<Key extends string>(params: Promise<Record<Key, string>>, key: Key, thing: MarketThing): Promise<string> {
  const value = (await params)[key];
  if (!uuid.safeParse(value).success) throw notFound(thing);
  return value.toLowerCase();
}

/** Validates a value with a schema; a failure is a 400 with a message per field. */
export function parseInput<Schema extends z.ZodType>(schema: Schema, value: unknown): z.infer<Schema> {
  const result = schema.safeParse(value);
  if (!result.success) throw new MarketError(400, 'invalid-input', 'Some fields need another look.', { fields: fieldErrors(result.error) });
  return result.data;
}

/** The JSON body, validated; an empty body counts as `{}` for calls whose fields are all optional. */
export async function readBody<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<z.infer<Schema>> {
  const raw = await request.text();
  let body: unknown = {};
  if (raw.trim() !== '') {
    try {
      body = JSON.parse(raw);
    } catch {
      throw new MarketError(400, 'invalid-input', 'The request body must be JSON.');
    }
  }
  return parseInput(schema, body);
}

/** Query parameters as a plain object (the last value of a repeated key wins, except `format`). */
export function queryOf(request: Request): Record<string, string | string[]> {
  const params = new URL(request.url).searchParams;
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    out[key] = all.length > 1 ? all : all[0];
  }
  return out;
}
