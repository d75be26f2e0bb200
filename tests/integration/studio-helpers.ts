// Steps shared by the studio's integration tests: real accounts signed in through next-auth's own
// route, studio route handlers called inside a Next.js request scope (so `getServerSession`
// reads the session cookie exactly as it does in the server), and surfaces uploaded through a
// presigned PUT to the S3 stand-in.
//
// Import this module first in a test file: Next's environment set-up must run before any Next
// module creates its request storage.
import 'next/dist/server/node-environment-baseline';
import { expect } from 'vitest';
import { NextRequest } from 'next/server';
import { workAsyncStorage } from 'next/dist/server/app-render/work-async-storage.external';
import { workUnitAsyncStorage } from 'next/dist/server/app-render/work-unit-async-storage.external';
import { createRequestStoreForAPI } from 'next/dist/server/async-storage/request-store';
import { createWorkStore } from 'next/dist/server/async-storage/work-store';
import { signUp, verifyEmail } from '@/lib/accounts/users';
import { db } from '@/lib/platform/db';
import type { Role } from '@/lib/accounts/roles';
import * as authRoute from '@/app/api/auth/[...nextauth]/route';
import * as uploadsRoute from '@/app/api/studio/uploads/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import * as surfaceRoute from '@/app/api/studio/surfaces/[surfaceId]/route';
import { checkRegisteredSurface } from '@/lib/studio/surface-check';
import type { ReadySurface, SurfaceSummary, UploadTicket } from '@/lib/studio/types';
import { onlyMailTo, tokenFromLink, uniqueEmail } from './helpers';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type RouteHandler = (request: NextRequest, context: { params: Promise<Record<string, string | string[]>> }) => Promise<Response>;

export type CallOptions = {
  /** The Cookie header of a signed-in person (`account.cookie`); none for a visitor. */
  cookie?: string;
  /** A JSON body, or form fields (URLSearchParams) as next-auth's sign-in takes them. */
  body?: unknown;
  params?: Record<string, string | string[]>;
};

// Next's preview settings are required by its request store; API routes never use them.
const PREVIEW_PROPS = { previewModeId: 'studio-tests', previewModeEncryptionKey: 'studio-tests', previewModeSigningKey: 'studio-tests' };

/**
 * Calls one method of a route module as Next.js does for an incoming request: inside its work and
 * request stores, so that `cookies()` and `headers()` (and with them next-auth's
 * `getServerSession`) read this request.
 */
export async function callRoute(routeModule: object, method: Method, path: string, options: CallOptions = {}): Promise<Response> {
  const handler = (routeModule as Partial<Record<Method, RouteHandler>>)[method];
  if (!handler) throw new Error(`the route module of ${path} has no ${method} handler`);
  const headers = new Headers();
  if (options.cookie) headers.set('cookie', options.cookie);
  let body: BodyInit | undefined;
  if (options.body instanceof URLSearchParams) {
    headers.set('content-type', 'application/x-www-form-urlencoded');
    body = options.body;
  } else if (options.body !== undefined) {
    headers.set('content-type', 'application/json');
    body = typeof options.body === 'string' ? options.body : JSON.stringify(options.body);
  }
  const request = new NextRequest(new URL(path, process.env.NEXTAUTH_URL), { method, headers, body });
  return withinRequest(request, () => handler(request, { params: Promise.resolve(options.params ?? {}) }));
}

/**
 * Runs `work` inside Next's work and request stores for the request, as Next.js does for route
 * handlers and pages: `cookies()`, `headers()` and with them `getServerSession` read this request.
 */
export function withinRequest<T>(request: NextRequest, work: () => Promise<T>): Promise<T> {
  const implicitTags = { tags: [], expirationsByCacheKind: new Map() };
  const requestStore = createRequestStoreForAPI(request, request.nextUrl, implicitTags, undefined, PREVIEW_PROPS, undefined);
  const workStore = createWorkStore({ page: request.nextUrl.pathname, renderOpts: { experimental: {} }, buildId: 'studio-tests', previouslyRevalidatedTags: [] } as unknown as Parameters<typeof createWorkStore>[0]);
  return workUnitAsyncStorage.run(requestStore, () => workAsyncStorage.run(workStore, work));
}

/** The body of a JSON answer with the expected status, failing the test with the body otherwise. */
export async function expectJson<T = any>(response: Response, status: number): Promise<T> {
  const text = await response.text();
  expect(response.status, text).toBe(status);
  return JSON.parse(text) as T;
}

function cookieHeader(response: Response): string {
  return response.headers
    .getSetCookie()
    .map((cookie) => cookie.split(';')[0])
    .join('; ');
}

export type TestAccount = { userId: string; email: string; cookie: string };

/** Signs in through next-auth's credentials callback, as the sign-in form does. */
export async function signIn(email: string, password: string): Promise<string> {
  const authPath = (...segments: string[]) => ({ path: `/api/auth/${segments.join('/')}`, params: { nextauth: segments } });
  const csrf = authPath('csrf');
  const csrfResponse = await callRoute(authRoute, 'GET', csrf.path, { params: csrf.params });
  const { csrfToken } = (await csrfResponse.json()) as { csrfToken: string };
  const callback = authPath('callback', 'credentials');
  const response = await callRoute(authRoute, 'POST', callback.path, {
    cookie: cookieHeader(csrfResponse),
    params: callback.params,
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  const cookie = cookieHeader(response);
  if (!cookie.includes('next-auth.session-token=')) throw new Error(`signing in as ${email} gave no session (status ${response.status})`);
  return cookie;
}

/** A new confirmed account with the role, signed up, confirmed and signed in the real way. */
export async function signedInAccount(role: Extract<Role, 'groomer' | 'buyer'>, label: string): Promise<TestAccount> {
  const email = uniqueEmail(label);
  const password = 'long-winter-coat';
  const created = await signUp({ displayName: `Studio ${label}`, email, password, role });
  if (!created.ok) throw new Error(`could not sign up ${email}: ${created.problem}`);
  const confirmed = await verifyEmail(tokenFromLink(await onlyMailTo(email), '/verify-email'));
  if (!confirmed.ok) throw new Error(`could not confirm ${email}: ${confirmed.problem}`);
  const { id: userId } = await db()('users').where({ email }).select('id').first();
  return { userId, email, cookie: await signIn(email, password) };
}

/** Who the ownership tests need: a groomer who owns things, a second groomer, and a buyer. */
export type StudioCast = { owner: TestAccount; rival: TestAccount; buyer: TestAccount };

export async function studioCast(label: string): Promise<StudioCast> {
  const [owner, rival, buyer] = await Promise.all([
    signedInAccount('groomer', `${label}-owner`),
    signedInAccount('groomer', `${label}-rival`),
    signedInAccount('buyer', `${label}-buyer`),
  ]);
  return { owner, rival, buyer };
}

/** An admin (a role no one can sign up for), to check that the studio wants the groomer role. */
export async function signedInAdmin(): Promise<TestAccount> {
  const account = await signedInAccount('buyer', 'admin');
  await db()('user_roles').where({ user_id: account.userId }).update({ role: 'admin' });
  return { ...account, cookie: await signIn(account.email, 'long-winter-coat') };
}

/**
 * Asks for an upload, PUTs the bytes to the presigned URL with fetch, and returns the ticket.
 * `declaredSize` stands for a client that announces another size than it sends.
 */
export async function uploadFile(account: TestAccount, fileName: string, bytes: Uint8Array, declaredSize = bytes.byteLength): Promise<UploadTicket> {
  const ticket = (
    await expectJson<{ data: UploadTicket }>(
      await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: account.cookie, body: { fileName, byteSize: declaredSize } }),
      201,
    )
  ).data;
  const put = await fetch(ticket.url, { method: ticket.method, body: new Blob([bytes as BlobPart]) });
  expect(put.status, await put.text()).toBe(200);
  return ticket;
}

/** Uploads a file and registers it as a surface; the answer is returned as it came. */
export async function uploadAndRegister(account: TestAccount, fileName: string, bytes: Uint8Array, name: string, units: string): Promise<Response> {
  const ticket = await uploadFile(account, fileName, bytes);
  return callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: account.cookie, body: { uploadId: ticket.uploadId, name, units } });
}

/**
 * Uploads and registers a surface (202, state `checking`), runs its check — the job's own
 * function, in this process, as the demo seed does; tests of the job queue itself start a worker
 * process — and answers the surface as the studio's route then shows it (ready or refused).
 */
export async function registerAndCheck(account: TestAccount, fileName: string, bytes: Uint8Array, name: string, units = 'cm'): Promise<SurfaceSummary> {
  const registered = (await expectJson<{ data: { surface: SurfaceSummary } }>(await uploadAndRegister(account, fileName, bytes, name, units), 202)).data.surface;
  expect(registered).toMatchObject({ state: 'checking', check: { stage: 'waiting for its check', progress: 0 } });
  await checkRegisteredSurface({ surfaceId: registered.id });
  const response = await callRoute(surfaceRoute, 'GET', `/api/studio/surfaces/${registered.id}`, { cookie: account.cookie, params: { surfaceId: registered.id } });
  return (await expectJson<{ data: { surface: SurfaceSummary } }>(response, 200)).data.surface;
}

/** Uploads, registers and checks a surface that must be accepted. */
export async function createSurface(account: TestAccount, fileName: string, bytes: Uint8Array, name: string, units = 'cm'): Promise<ReadySurface> {
  const surface = await registerAndCheck(account, fileName, bytes, name, units);
  expect(surface.state, JSON.stringify(surface)).toBe('ready');
  return surface as ReadySurface;
}
