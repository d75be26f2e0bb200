// The access matrix (access-matrix.ts), played against the test stack: every route handler under
// app/api and every page under app/ is found in the file tree, must have a row, and each row is
// called for a visitor, a buyer, the groomer who owns the thing, another groomer and an admin —
// real accounts signed in through next-auth's own route, things made per run through the routes
// (studio) or the real checkout on the payments fake (purchases).
//
// Route handlers are called as Next.js calls them (studio-helpers' callRoute). Pages are server
// components: they are called inside the same request scope, and the outcome of their access
// check is read from what they return or throw — Next's redirect (to sign-in), forbidden() (403)
// and notFound() (404) interrupts, which Next turns into those statuses for the browser.
import { callRoute, createSurface, expectJson, signedInAccount, signedInAdmin, uploadFile, withinRequest, type TestAccount } from './studio-helpers';
import { randomUUID } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { NextRequest } from 'next/server';
import { isRedirectError } from 'next/dist/client/components/redirect-error';
import { getURLFromRedirectError } from 'next/dist/client/components/redirect';
import { getAccessFallbackHTTPStatus, isHTTPAccessFallbackError } from 'next/dist/client/components/http-access-fallback/http-access-fallback';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import nextConfig from '@/next.config';
import { closeDb, db } from '@/lib/platform/db';
import { putObject } from '@/lib/platform/storage';
import { stopJobs } from '@/lib/platform/jobs';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import type { Actor } from '@/lib/accounts/actor';
import type { GroomDetail, SurfaceSummary } from '@/lib/studio/types';
import { uniqueEmail } from './helpers';
import { buyListing as buy, insertListing, ringSurfaceKey } from './market-helpers';
import { PAGE_ROWS, ROUTE_ROWS, type Method, type PageRow, type PageStatus, type RouteRow, type Things, type Who } from './access-matrix';

// Next sets this from next.config's experimental.authInterrupts when it builds; forbidden()
// refuses to run without it. Taken from the same configuration, so the test cannot differ from it.
if (nextConfig.experimental?.authInterrupts) process.env.__NEXT_EXPERIMENTAL_AUTH_INTERRUPTS = 'true';

const ROOT = join(import.meta.dirname, '..', '..');
const METHODS: Method[] = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];
// Who is called first: the owner last, so a row may change or delete the very thing it checks.
const ORDER: Who[] = ['anonymous', 'buyer', 'other', 'admin', 'owner'];

/** Files named `name` under app/`under`, as route paths: app/a/[b]/page.tsx → /a/[b]. */
function appFiles(under: string, name: string): { path: string; file: string }[] {
  const found: { path: string; file: string }[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name === name) {
        const segments = relative(join(ROOT, 'app'), dir).split(sep).filter((s) => s !== '' && !/^\(.*\)$/.test(s));
        found.push({ path: `/${segments.join('/')}`, file: full });
      }
    }
  };
  walk(join(ROOT, 'app', under));
  return found.sort((a, b) => a.path.localeCompare(b.path));
}

type Module = Record<string, unknown>;
const routeModules = new Map<string, Module>();
const routeMethods: string[] = [];
for (const { path, file } of appFiles('api', 'route.ts')) {
  const module = (await import(file)) as Module;
  routeModules.set(path, module);
  for (const method of METHODS) if (typeof module[method] === 'function') routeMethods.push(`${method} ${path}`);
}
const pageFiles = appFiles('', 'page.tsx');

let people: Record<Exclude<Who, 'anonymous'>, TestAccount>;
let things: Things;

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

describe('the access matrix', () => {
  it('has a row for every route handler method and page in app/, and no row for one that is gone', () => {
    const routeRows = new Set(ROUTE_ROWS.map((row) => `${row.method} ${row.path}`));
    const pageRows = new Set(PAGE_ROWS.map((row) => row.path));
    expect({
      routesWithoutRow: routeMethods.filter((key) => !routeRows.has(key)),
      rowsWithoutRoute: [...routeRows].filter((key) => !routeMethods.includes(key)),
      pagesWithoutRow: pageFiles.map((p) => p.path).filter((path) => !pageRows.has(path)),
      rowsWithoutPage: [...pageRows].filter((path) => !pageFiles.some((p) => p.path === path)),
    }).toEqual({ routesWithoutRow: [], rowsWithoutRoute: [], pagesWithoutRow: [], rowsWithoutPage: [] });
  });
});

/** A path with its parameters filled in, and the parameters as Next hands them to the module. */
function fill(path: string, params: Record<string, string | string[]> | undefined) {
  const values: Record<string, string | string[]> = {};
  const url = path.replace(/\[(\.\.\.)?([^\]]+)\]/g, (_, rest: string | undefined, name: string) => {
    const given = params?.[name];
    if (given === undefined) throw new Error(`the row of ${path} gives no value for [${name}]`);
    const value = Array.isArray(given) ? given : (things[given as keyof Things] as string);
    values[name] = rest ? [value].flat() : [value].flat().join('/');
    return [value].flat().map(encodeURIComponent).join('/');
  });
  return { url, values };
}

async function callRow(row: RouteRow, who: Who): Promise<{ status: number; text: string }> {
  const { url, values } = fill(row.path, row.params);
  const body = typeof row.body === 'function' ? (row.body as (t: Things) => unknown)(things) : row.body;
  const cookie = who === 'anonymous' ? undefined : people[who].cookie;
  const response = await callRoute(routeModules.get(row.path)!, row.method, row.query ? `${url}?${row.query}` : url, { cookie, body, params: values });
  return { status: response.status, text: (await response.text()).slice(0, 300) };
}

async function openPage(row: PageRow, who: Who): Promise<PageStatus> {
  const { url, values } = fill(row.path, row.params);
  const module = (await import(pageFiles.find((p) => p.path === row.path)!.file)) as {
    default: (props: object) => unknown;
    generateMetadata?: (props: object) => unknown;
  };
  const headers = new Headers();
  if (who !== 'anonymous') headers.set('cookie', people[who].cookie);
  const request = new NextRequest(new URL(url, process.env.NEXTAUTH_URL), { headers });
  const props = () => ({ params: Promise.resolve(values), searchParams: Promise.resolve({}) });
  try {
    await withinRequest(request, async () => {
      await module.generateMetadata?.(props());
      await module.default(props());
    });
    return 200;
  } catch (error) {
    if (isHTTPAccessFallbackError(error)) return getAccessFallbackHTTPStatus(error) as PageStatus;
    if (isRedirectError(error)) {
      const target = new URL(getURLFromRedirectError(error), 'http://whorlwind.test');
      // Sign-in must bring the person back: the callback is the area's own path.
      if (target.pathname === '/signin' && url.startsWith(target.searchParams.get('callbackUrl') ?? '\0')) return 'signin';
      throw new Error(`${url} redirected ${who} to ${target.pathname}${target.search}`);
    }
    throw error;
  }
}

const label = (row: { path: string; note?: string }, method?: string) => `${method ? `${method} ` : ''}${row.path}${row.note ? ` (${row.note})` : ''}`;

describe('route handlers answer each person as the matrix says', () => {
  // Some answers wait for a job (carrying a groom onto another surface), as they would in production.
  let worker: JobsWorkerProcess;
  beforeAll(async () => {
    worker = await startJobsWorkerProcess();
    await makeCastAndThings();
  });
  afterAll(() => worker.stop());

  it.each(ROUTE_ROWS.map((row) => [label(row, row.method), row] as const))('%s', async (_, row) => {
    const actual = {} as Record<Who, number>;
    const answers: string[] = [];
    for (const who of ORDER) {
      const { status, text } = await callRow(row, who);
      actual[who] = status;
      if (status !== row.expected[who]) answers.push(`${who}: ${status} ${text}`);
    }
    expect(actual, answers.join('\n')).toEqual(row.expected);
  });

  it.each(PAGE_ROWS.map((row) => [label(row), row] as const))('page %s', async (_, row) => {
    const actual = {} as Record<Who, PageStatus>;
    for (const who of ORDER) actual[who] = await openPage(row, who);
    expect(actual).toEqual(row.expected);
  });
});

// ---- the people and things of one run ----

const ringBytes = new TextEncoder().encode(surfaceToObj(DEMO_GROOMS.find((g) => g.id === 'loop-plush-ring')!.surface(), 'matrix ring'));

async function post<T>(account: TestAccount, routePath: string, url: string, body: unknown, status: number, params: Record<string, string> = {}): Promise<T> {
  return (await expectJson<{ data: T }>(await callRoute(routeModules.get(routePath)!, 'POST', url, { cookie: account.cookie, body, params }), status)).data;
}

async function newGroom(owner: TestAccount, surfaceId: string, name: string): Promise<GroomDetail> {
  return (await post<{ groom: GroomDetail }>(owner, '/api/studio/grooms', '/api/studio/grooms', { surfaceId, name }, 201)).groom;
}

/** An update of a published listing waiting for the admins, as the seller's command leaves it (listing versions). */
async function updateWaiting(listingId: string): Promise<string> {
  const listing = await db()('listings').where({ id: listingId }).first();
  const [row] = await db()('listing_versions')
    .insert({
      listing_id: listingId,
      number: 2,
      review: 'submitted',
      ...Object.fromEntries(['groom_id', 'groom_version_id', 'groom_name', 'version_number', 'version_name', 'surface_key', 'surface_file_name', 'description', 'formats'].map((key) => [key, listing[key]])),
      spec: JSON.stringify(listing.spec),
      submitted_at: db().fn.now(),
    })
    .returning('id');
  return row.id;
}

async function makeCastAndThings() {
  const [owner, other, buyer, admin] = await Promise.all([
    signedInAccount('groomer', 'matrix-owner'),
    signedInAccount('groomer', 'matrix-other'),
    signedInAccount('buyer', 'matrix-buyer'),
    signedInAdmin(),
  ]);
  people = { owner, other, buyer, admin };
  const seller: Actor = { userId: owner.userId, roles: ['groomer'], email: owner.email };
  const buyerActor: Actor = { userId: buyer.userId, roles: ['buyer'], email: buyer.email };

  const [surface, spareSurface]: SurfaceSummary[] = await Promise.all([
    createSurface(owner, 'matrix-ring.obj', ringBytes, 'Matrix ring'),
    createSurface(owner, 'matrix-spare.obj', ringBytes, 'Matrix spare'),
  ]);
  const upload = (await uploadFile(owner, 'matrix-later.obj', ringBytes)).uploadId;
  const groom = await newGroom(owner, surface.id, 'Matrix coat');
  const spareGroom = await newGroom(owner, surface.id, 'Matrix spare coat');
  const specGroom = await newGroom(owner, surface.id, 'Matrix autosaved coat');
  const version = (await post<{ version: { id: string } }>(owner, '/api/studio/grooms/[groomId]/versions', `/api/studio/grooms/${groom.id}/versions`, { name: 'First' }, 201, { groomId: groom.id })).version;
  const exported = (await post<{ export: { id: string } }>(owner, '/api/studio/grooms/[groomId]/exports', `/api/studio/grooms/${groom.id}/exports`, { format: 'json' }, 202, { groomId: groom.id })).export;

  const surfaceKey = await ringSurfaceKey();
  const listed = (state: string, title: string) => insertListing(seller, { state, title }, surfaceKey);
  const [listing, boughtListing, refundListing, draftListing, submitListing, unlistListing, submittedListing, refundedListing] = await Promise.all([
    listed('published', 'Matrix coat for sale'),
    listed('published', 'Matrix coat, bought'),
    listed('published', 'Matrix coat, refunded'),
    listed('draft', 'Matrix draft'),
    listed('draft', 'Matrix draft to submit'),
    listed('published', 'Matrix coat to unlist'),
    listed('submitted', 'Matrix coat awaiting review'),
    listed('published', 'Matrix coat, refunded before the rows'),
  ]);
  // A picture and a package as the asset job leaves them (the bytes themselves are not read).
  const picture = `tests/matrix/${listing}/front-256.webp`;
  await putObject(picture, new Uint8Array([0x52, 0x49, 0x46, 0x46]), 'image/webp');
  await db()('listings').where({ id: listing }).update({ pictures: JSON.stringify([{ view: 'front', size: 256, key: picture }]) });
  const packageKey = `tests/matrix/${boughtListing}/package.zip`;
  await putObject(packageKey, new Uint8Array([0x50, 0x4b, 0x05, 0x06]), 'application/zip');
  await db()('listing_packages').insert({ listing_id: boughtListing, groom_version_id: randomUUID(), object_key: packageKey, file_name: 'matrix.zip', byte_size: 4 });
  const [account] = await db()('users')
    .insert({ email: uniqueEmail('matrix-bystander'), display_name: 'Matrix bystander', password_hash: 'not-used', email_verified_at: db().fn.now() })
    .returning('id');
  await db()('user_roles').insert({ user_id: account.id, role: 'buyer' });
  const waitingVersion = await updateWaiting(await listed('published', 'Matrix coat, updated'));
  const purchase = await buy(buyerActor, boughtListing);
  const refundPurchase = await buy(buyerActor, refundListing);
  const refundedPurchase = await buy(buyerActor, refundedListing);
  await db()('purchases').where({ id: refundedPurchase }).update({ status: 'refunded', refunded_at: db().fn.now() });
  // The buyer's own surface, and fits and a trial as their job leaves them (the rows read rows, not the transfer).
  const buyerSurface = await createSurface(buyer, 'matrix-buyer-ring.obj', ringBytes, 'Matrix buyer ring');
  const transfer = (kind: 'fit' | 'trial', listingId: string, purchaseId: string | null) => ({
    kind,
    buyer_id: buyer.userId,
    listing_id: listingId,
    purchase_id: purchaseId,
    target_surface_id: buyerSurface.id,
    status: 'done',
    stage: 'Done',
    spec: JSON.stringify(specGroom.spec),
    report: JSON.stringify({ method: 'topology', notCarried: [] }),
  });
  const [fit, acceptFit, trial] = await db()('preset_transfers')
    .insert([transfer('fit', boughtListing, purchase), transfer('fit', boughtListing, purchase), transfer('trial', listing, null)])
    .returning('id')
    .then((rows) => rows.map((row) => row.id as string));

  things = {
    upload,
    surface: surface.id,
    spareSurface: spareSurface.id,
    groom: groom.id,
    spareGroom: spareGroom.id,
    version: version.id,
    export: exported.id,
    specGroom: specGroom.id,
    spec: specGroom.spec,
    revision: specGroom.revision,
    listing,
    boughtListing,
    draftListing,
    submitListing,
    unlistListing,
    submittedListing,
    waitingVersion,
    purchase,
    refundPurchase,
    account: account.id,
    missing: randomUUID(),
    demo: DEMO_GROOMS[0].id,
    buyerSurface: buyerSurface.id,
    fit,
    acceptFit,
    trial,
    refundedPurchase,
  };
}
