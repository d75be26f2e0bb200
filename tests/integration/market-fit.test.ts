// A buyer's own use of presets (issue 14, items 1 and 2), through the route handlers against the
// real stack and a job worker: a buyer uploads a surface of their own in the studio, fits a bought
// preset to it (report, then a groom that remembers the purchase and is refused for sale), cannot
// fit what they did not buy or what was refunded, and tries a preset before buying: the trial's
// 3D preview holds at most 5 % of the listing's guides with at most 8 points each, no widths or
// binding (curves counted in the file, the file checked by the Khronos glTF validator), and a
// buyer past the trial limit gets a 429 with words.
import { callRoute, createSurface, expectJson, signedInAccount, type TestAccount } from './studio-helpers';
import { validateBytes } from 'gltf-validator';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import type { Actor } from '@/lib/accounts/actor';
import { HttpError } from '@/lib/http/errors';
import { createListing } from '@/lib/market/listings';
import { createListingVersion } from '@/lib/market/listings/versions';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { TRIALS_PER_BUYER, TRIAL_GUIDE_SHARE, TRIAL_POINTS_PER_GUIDE } from '@/lib/market/fitting';
import { LICENCE_TEXTS } from '@/lib/market/licences';
import type { FitAcceptedResponse, PresetTransferResponse, PresetTransferView } from '@/lib/market/types';
import type { GroomDetail, ReadySurface } from '@/lib/studio/types';
import * as fitsRoute from '@/app/api/library/[purchaseId]/fits/route';
import * as fitRoute from '@/app/api/library/fits/[fitId]/route';
import * as acceptRoute from '@/app/api/library/fits/[fitId]/accept/route';
import * as trialsRoute from '@/app/api/market/listings/[id]/trials/route';
import * as trialRoute from '@/app/api/market/trials/[trialId]/route';
import * as versionsRoute from '@/app/api/studio/grooms/[groomId]/versions/route';
import * as duplicateRoute from '@/app/api/studio/grooms/[groomId]/duplicate/route';
import * as groomRoute from '@/app/api/studio/grooms/[groomId]/route';
import { buyListing, insertListing, makePerson, ringSurfaceKey, waitFor } from './market-helpers';
import { DEMO_ACCOUNTS } from '@/db/demo-scenario';
import { DEMO_BUYER_SURFACE } from '@/db/seeds/20_buyer_demo';
import { startTrial, sweepOldTrials, TRIAL_KEEP_DAYS } from '@/lib/market/fitting';
import { getObjectBytes, putObject } from '@/lib/platform/storage';
import { DEMO_GROOMS as GROOMS } from '@/lib/groom/demo';

const ring = DEMO_GROOMS.find((groom) => groom.id === 'loop-plush-ring')!;
const ringBytes = new TextEncoder().encode(surfaceToObj(ring.surface(), 'A ring of the buyer'));

let worker: JobsWorkerProcess;
let seller: Actor;
let buyer: TestAccount;
let buyerActor: Actor;
let surface: ReadySurface;
let surfaceKey: string;

beforeAll(async () => {
  worker = await startJobsWorkerProcess();
  seller = await makePerson('fit-seller', ['groomer']);
  buyer = await signedInAccount('buyer', 'fit-buyer');
  buyerActor = { userId: buyer.userId, roles: ['buyer'], email: buyer.email };
  // The studio's own upload, registration and check, as a buyer (who may enter the studio now).
  surface = await createSurface(buyer, 'my-ring.obj', ringBytes, 'My ring character');
  surfaceKey = await ringSurfaceKey();
});

afterAll(async () => {
  await worker?.stop();
  await stopJobs();
  await closeDb();
});

const post = (account: TestAccount, module: object, url: string, body: unknown, params: Record<string, string>) => callRoute(module, 'POST', url, { cookie: account.cookie, body, params });

/** Reads a fit or a trial until its job has finished. */
async function finished(account: TestAccount, kind: 'fit' | 'trial', id: string): Promise<PresetTransferView> {
  const [module, url, params] = kind === 'fit' ? [fitRoute, `/api/library/fits/${id}`, { fitId: id }] : [trialRoute, `/api/market/trials/${id}`, { trialId: id }];
  return waitFor(
    `the ${kind} to finish`,
    async () => {
      const view = (await expectJson<{ data: PresetTransferResponse }>(await callRoute(module, 'GET', url, { cookie: account.cookie, params }), 200)).data.transfer;
      return view.status === 'done' || view.status === 'failed' ? view : undefined;
    },
    180_000,
  );
}

async function startFit(account: TestAccount, purchaseId: string, surfaceId: string): Promise<Response> {
  return post(account, fitsRoute, `/api/library/${purchaseId}/fits`, { surfaceId }, { purchaseId });
}

describe('fit a bought preset to my character', () => {
  it('carries the preset onto the buyer’s surface with a report, makes a groom that remembers the purchase, and refuses it (and its copies) for sale', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat to fit' }, surfaceKey);
    const purchaseId = await buyListing(buyerActor, listingId);

    const started = (await expectJson<{ data: PresetTransferResponse }>(await startFit(buyer, purchaseId, surface.id), 202)).data.transfer;
    expect(started).toMatchObject({ kind: 'fit', purchaseId, surface: { id: surface.id }, listing: { id: listingId }, report: null });
    const fit = await finished(buyer, 'fit', started.id);
    expect(fit.status, fit.error ?? '').toBe('done');
    // The report of lib/groom's transfer: where each place landed, what did not carry over, the budget.
    expect(fit.report!.method).toBe('topology');
    expect(fit.report!.features.length).toBeGreaterThan(0);
    expect(fit.report!.features.every((feature) => feature.to !== null)).toBe(true);
    expect(Array.isArray(fit.report!.notCarried)).toBe(true);
    expect(fit.report!.budget.length).toBeGreaterThan(0);

    const accepted = await post(buyer, acceptRoute, `/api/library/fits/${fit.id}/accept`, {}, { fitId: fit.id });
    const groom = (await expectJson<{ data: FitAcceptedResponse }>(accepted, 201)).data.groom;
    expect(groom).toMatchObject({ fromPurchaseId: purchaseId, surfaceId: surface.id, name: `Ring coat to fit on ${surface.name}` });
    expect((await db()('grooms').where({ id: groom.id }).first('owner_id', 'from_purchase_id'))).toEqual({ owner_id: buyer.userId, from_purchase_id: purchaseId });
    // Accepting again answers the same groom, not a second one.
    const again = (await expectJson<{ data: FitAcceptedResponse }>(await post(buyer, acceptRoute, `/api/library/fits/${fit.id}/accept`, {}, { fitId: fit.id }), 201)).data.groom;
    expect(again.id).toBe(groom.id);
    // The editor opens it as any groom of theirs.
    const opened = (await expectJson<{ data: { groom: GroomDetail } }>(await callRoute(groomRoute, 'GET', `/api/studio/grooms/${groom.id}`, { cookie: buyer.cookie, params: { groomId: groom.id } }), 200)).data.groom;
    expect(opened.spec.field.singularities.length).toBe(fit.report!.features.filter((f) => f.kind === 'singularity').length);

    // Selling it: a buyer who also grooms still cannot list it, nor a copy of it.
    const version = (await expectJson(await post(buyer, versionsRoute, `/api/studio/grooms/${groom.id}/versions`, { name: 'Fitted' }, { groomId: groom.id }), 201)).data.version;
    const copy = (await expectJson<{ data: { groom: GroomDetail } }>(await post(buyer, duplicateRoute, `/api/studio/grooms/${groom.id}/duplicate`, {}, { groomId: groom.id }), 201)).data.groom;
    expect(copy.fromPurchaseId).toBe(purchaseId);
    const asGroomer: Actor = { ...buyerActor, roles: ['buyer', 'groomer'] };
    const refused = await createListing(asGroomer, {
      groomId: groom.id,
      versionId: version.id,
      title: 'Resold ring coat',
      description: 'A coat someone else made, offered again.',
      tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
      priceCents: 500,
      currency: 'eur',
      licenceSlug: LICENCE_TEXTS[0].slug,
      formats: ['json'],
      rightsConfirmed: true,
      shipsSurface: false,
    }).then(
      () => null,
      (error: unknown) => error,
    );
    expect(refused).toBeInstanceOf(HttpError);
    expect(refused).toMatchObject({ status: 422, code: 'bought-not-for-resale' });
    expect((refused as HttpError).message).toMatch(/licence lets you use it .* not sell it/);
    expect(await db()('listings').where({ seller_id: buyer.userId }).count<{ count: string }[]>('* as count')).toEqual([{ count: '0' }]);
    // Nor as a new version of a listing of their own on the market.
    const own = await insertListing(asGroomer, { title: 'A coat of the buyer’s own making' }, surfaceKey);
    const asUpdate = await createListingVersion(asGroomer, own, {
      groomId: groom.id,
      versionId: version.id,
      description: 'The same coat, fitted from someone else’s preset.',
      formats: ['json'],
      notes: '',
      rightsConfirmed: true,
      shipsSurface: false,
    }).then(
      () => null,
      (error: unknown) => error,
    );
    expect(asUpdate).toMatchObject({ status: 422, code: 'bought-not-for-resale' });
    expect(await db()('listing_versions').where({ listing_id: own }).whereNot({ review: 'listing' }).count<{ count: string }[]>('* as count')).toEqual([{ count: '0' }]);
  });

  it('answers 404 to a buyer who did not buy the preset, and 404 for a surface that is not theirs', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat, bought by someone else' }, surfaceKey);
    const purchaseId = await buyListing(buyerActor, listingId);
    const stranger = await signedInAccount('buyer', 'fit-stranger');
    const strangerSurface = await createSurface(stranger, 'stranger.obj', ringBytes, 'Stranger ring');
    const notTheirs = await expectJson(await startFit(stranger, purchaseId, strangerSurface.id), 404);
    expect(notTheirs.error.message).toBe('There is no such purchase.');
    // The buyer's own purchase onto someone else's surface.
    expect((await expectJson(await startFit(buyer, purchaseId, strangerSurface.id), 404)).error.code).toBe('not-found');
    expect(await db()('preset_transfers').where({ purchase_id: purchaseId }).count<{ count: string }[]>('* as count')).toEqual([{ count: '0' }]);
  });

  it('refuses to fit a refunded purchase, in words, and a finished fit can no longer be accepted once its purchase is refunded', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat, refunded later' }, surfaceKey);
    const purchaseId = await buyListing(buyerActor, listingId);
    const fit = await finished(buyer, 'fit', (await expectJson<{ data: PresetTransferResponse }>(await startFit(buyer, purchaseId, surface.id), 202)).data.transfer.id);
    expect(fit.status).toBe('done');
    const admin = await makePerson('fit-admin', ['admin']);
    await refundPurchase(admin, purchaseId, 'Asked for by the buyer.');
    const refused = await expectJson(await startFit(buyer, purchaseId, surface.id), 403);
    expect(refused.error).toMatchObject({ code: 'refunded' });
    expect(refused.error.message).toMatch(/refunded: the preset can no longer be fitted/);
    const late = await expectJson(await post(buyer, acceptRoute, `/api/library/fits/${fit.id}/accept`, {}, { fitId: fit.id }), 403);
    expect(late.error.code).toBe('refunded');
    expect(await db()('grooms').where({ from_purchase_id: purchaseId }).count<{ count: string }[]>('* as count')).toEqual([{ count: '0' }]);
  });
});

/** The parts of a .glb (glTF 2.0 §4.4): its JSON and its binary chunk. */
function readGlb(bytes: Uint8Array): { json: any; bin: DataView } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  expect(view.getUint32(0, true)).toBe(0x46546c67);
  const jsonLength = view.getUint32(12, true);
  const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
  const binStart = 20 + jsonLength + 8;
  return { json, bin: new DataView(bytes.buffer, bytes.byteOffset + binStart, bytes.byteLength - binStart) };
}

describe('try before buying', () => {
  it('shows the preset on the buyer’s surface: the report, pictures, and a 3D preview of at most 5 % of the listing’s guides with at most 8 points each, without widths or binding', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat to try' }, surfaceKey);
    const listingGuides = (await db()('listings').where({ id: listingId }).first('guide_count')).guide_count as number;
    const started = await post(buyer, trialsRoute, `/api/market/listings/${listingId}/trials`, { surfaceId: surface.id }, { id: listingId });
    const trial = await finished(buyer, 'trial', (await expectJson<{ data: PresetTransferResponse }>(started, 202)).data.transfer.id);
    expect(trial.status, trial.error ?? '').toBe('done');
    expect(trial.report!.method).toBe('topology');
    expect(trial.trial!.pictures.map((picture) => picture.view).sort()).toEqual(['front', 'side', 'top']);
    for (const picture of trial.trial!.pictures) {
      const answer = await fetch(picture.url);
      expect(answer.status).toBe(200);
      // RIFF....WEBP (RFC 9649 §2.5): the renderer's picture, encoded.
      const head = new Uint8Array(await answer.arrayBuffer()).subarray(0, 12);
      expect(new TextDecoder().decode(head.subarray(8, 12))).toBe('WEBP');
    }

    const bytes = new Uint8Array(await (await fetch(trial.trial!.previewUrl)).arrayBuffer());
    // The Khronos validator: a valid glTF 2.0 binary.
    const validated = await validateBytes(bytes, { format: 'glb', maxIssues: 0 });
    expect(validated.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    const { json, bin } = readGlb(bytes);
    expect(json.meshes).toHaveLength(1);
    const [primitive] = json.meshes[0].primitives;
    expect(primitive.mode).toBe(1); // LINES
    expect(Object.keys(primitive.attributes)).toEqual(['POSITION']); // no _WIDTH
    expect(json.meshes[0].extras).toBeUndefined(); // no binding
    // The asset says only what it is a reduction of: counts, no ids, no binding.
    expect(Object.keys(json.asset.extras?.whorlwind ?? {})).toEqual(['preview']);
    // Counted in the file: lines are paths, so curves = points used − segments.
    const indices = json.accessors[primitive.indices];
    const view = json.bufferViews[indices.bufferView];
    const used = new Set<number>();
    for (let i = 0; i < indices.count; i++) used.add(bin.getUint32(view.byteOffset + 4 * i, true));
    const curves = used.size - indices.count / 2;
    const points = json.accessors[primitive.attributes.POSITION].count;
    expect(curves).toBe(trial.trial!.guideCount);
    expect(curves).toBeGreaterThan(0);
    expect(curves).toBeLessThanOrEqual(Math.floor(TRIAL_GUIDE_SHARE * listingGuides));
    expect(points / curves).toBeLessThanOrEqual(TRIAL_POINTS_PER_GUIDE);
    expect(trial.trial!.listingGuideCount).toBe(listingGuides);
  });

  it('answers 429 with words once a buyer has made as many trials as the window allows, recording nothing more', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat tried too often' }, surfaceKey);
    const eager = await signedInAccount('buyer', 'fit-eager');
    const eagerSurface = await createSurface(eager, 'eager.obj', ringBytes, 'Eager ring');
    // The window's trials as earlier requests left them (their jobs are not the point here).
    await db()('preset_transfers').insert(
      Array.from({ length: TRIALS_PER_BUYER }, () => ({ kind: 'trial', buyer_id: eager.userId, listing_id: listingId, target_surface_id: eagerSurface.id, status: 'failed', error: 'earlier' })),
    );
    const answer = await expectJson(await post(eager, trialsRoute, `/api/market/listings/${listingId}/trials`, { surfaceId: eagerSurface.id }, { id: listingId }), 429);
    expect(answer.error.code).toBe('too-many-requests');
    expect(answer.error.message).toMatch(/tried \d+ presets on your surfaces in the last 60 minutes.*Try again later/);
    expect(await db()('preset_transfers').where({ buyer_id: eager.userId }).count<{ count: string }[]>('* as count')).toEqual([{ count: String(TRIALS_PER_BUYER) }]);
    // Trials older than the window no longer count.
    await db()('preset_transfers').where({ buyer_id: eager.userId }).update({ created_at: db().raw(`now() - interval '61 minutes'`) });
    await expectJson(await post(eager, trialsRoute, `/api/market/listings/${listingId}/trials`, { surfaceId: eagerSurface.id }, { id: listingId }), 202);
  });

  it('keeps a trial and its files for a week, then the hourly sweep removes them (and leaves fits alone)', async () => {
    const listingId = await insertListing(seller, { title: 'Ring coat, tried long ago' }, surfaceKey);
    const purchaseId = await buyListing(buyerActor, listingId);
    const made = async (kind: 'fit' | 'trial', daysAgo: number) => {
      const [{ id }] = await db()('preset_transfers')
        .insert({ kind, buyer_id: buyer.userId, listing_id: listingId, purchase_id: kind === 'fit' ? purchaseId : null, target_surface_id: surface.id, status: 'done', created_at: db().raw(`now() - make_interval(days => ?)`, [daysAgo]) })
        .returning('id');
      const keys = [`market/trials/${buyer.userId}/${id}/preview.glb`, `market/trials/${buyer.userId}/${id}/front-512.webp`];
      for (const key of keys) await putObject(key, new Uint8Array([1, 2, 3]), 'application/octet-stream');
      await db()('preset_transfers').where({ id }).update({ preview_key: keys[0], pictures: JSON.stringify([{ view: 'front', size: 512, key: keys[1] }]) });
      return { id: id as string, keys };
    };
    const old = await made('trial', TRIAL_KEEP_DAYS + 1);
    const recent = await made('trial', TRIAL_KEEP_DAYS - 1);
    const oldFit = await made('fit', TRIAL_KEEP_DAYS + 30);
    expect(await sweepOldTrials()).toBeGreaterThanOrEqual(1);
    expect(await db()('preset_transfers').whereIn('id', [old.id, recent.id, oldFit.id]).pluck('id')).toEqual(expect.arrayContaining([recent.id, oldFit.id]));
    expect(await db()('preset_transfers').where({ id: old.id }).first()).toBeUndefined();
    for (const key of old.keys) await expect(getObjectBytes(key)).rejects.toThrow();
    for (const key of [...recent.keys, ...oldFit.keys]) expect((await getObjectBytes(key)).byteLength).toBe(3);
  });

  it('is refused for a listing not on the market (404)', async () => {
    const draft = await insertListing(seller, { title: 'Ring coat draft', state: 'draft' }, surfaceKey);
    await expectJson(await post(buyer, trialsRoute, `/api/market/listings/${draft}/trials`, { surfaceId: surface.id }, { id: draft }), 404);
  });
});

describe('the demo', () => {
  // `npm test` seeded this stack as `npm run demo` does: the buyer's own fox and the groomer's listings.
  it('gives the demo buyer a surface of their own on which a demo listing can be tried at once, carried by alignment', async () => {
    const account = DEMO_ACCOUNTS.find((candidate) => candidate.roles.includes('buyer') && !candidate.roles.includes('groomer'))!;
    const user = await db()('users').where({ email: account.email }).first('id');
    const own = await db()('growth_surfaces').where({ owner_id: user.id, name: DEMO_BUYER_SURFACE }).first('id', 'state');
    expect(own).toMatchObject({ state: 'ready' });
    const fox = GROOMS.find((groom) => groom.id.includes('fox'))!;
    const listing = await db()('listings').where({ state: 'published', groom_name: fox.spec.name ?? fox.character }).first('id');
    const actor: Actor = { userId: user.id, roles: account.roles, email: account.email };
    const started = await startTrial(actor, listing.id, own.id);
    const trial = await waitFor('the demo trial', async () => {
      const row = await db()('preset_transfers').where({ id: started.id }).first('status', 'report', 'error', 'preview_guide_count');
      return row.status === 'done' || row.status === 'failed' ? row : undefined;
    }, 180_000);
    expect(trial.error).toBeNull();
    expect(trial.report.method).toBe('alignment');
    expect(trial.report.notCarried).toEqual([]);
    expect(trial.preview_guide_count).toBeGreaterThan(0);
  });
});
