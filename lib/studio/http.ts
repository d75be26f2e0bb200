// What every studio route handler does around its one call into lib/studio: the groomer check
// (401 / 403), ids from the path (a malformed id is as unknown as a missing one: 404), and
// StudioError turned into the JSON envelope.
import { NextResponse } from 'next/server';
import { z } from 'zod';
import type { ApiFailure } from '../http/types';
import { requireApiRoles } from '../accounts/session';
import { notFound, StudioError, type StudioThing } from './errors';

/** The signed-in groomer on whose behalf the studio acts. */
export type Groomer = { userId: string };

export async function studioHandler(work: (groomer: Groomer) => Promise<Response>): Promise<Response> {
  const access = await requireApiRoles(['groomer']);
  if (!access.ok) return access.response;
  try {
    return await work({ userId: access.session.user.id });
  } catch (error) {
    if (!(error instanceof StudioError)) throw error;
    return NextResponse.json<ApiFailure>({ error: { code: error.code, message: error.message, ...error.extra } }, { status: error.status });
  }
}

const uuid = z.uuid();

/** The id named `key` in the route's parameters, or a 404 for the thing when it cannot be an id. */
export async function pathId<Key extends string>(params: Promise<Record<Key, string>>, key: Key, thing: StudioThing): Promise<string> {
  const value = (await params)[key];
  if (!uuid.safeParse(value).success) throw notFound(thing);
  return value.toLowerCase();
}
