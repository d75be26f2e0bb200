// The public guide preview gives nothing away: a visitor downloads it, a buyer pays and downloads
// the package, and both files are read with three.js's GLTFLoader (the reader a browser runs, not
// our writer): the preview holds at most the stated share of the package's curves, a few points
// each, no widths and no binding. The package leaves only for a paid, unrefunded purchase.
import './studio-helpers';
import { unzipSync } from 'fflate';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as downloadRoute from '@/app/api/library/[purchaseId]/download/route';
import { PUBLIC_PREVIEW } from '@/lib/groom';
import { buildListingAssets } from '@/lib/market/assets';
import { requestDownload } from '@/lib/market/library';
import { getListingDetail } from '@/lib/market/listings';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { listingPrefix } from '@/lib/market/storage';
import { MARKET_JOBS } from '@/lib/market/workers';
import { closeDb, db } from '@/lib/platform/db';
import { getObjectBytes, putObject } from '@/lib/platform/storage';
import { loadGltf as load, linesOf } from '@/tests/fixtures/gltf-lines';
import { buyListing, deliver, eventsAbout, insertListing, makePerson, ringSurfaceKey, failureOf } from './market-helpers';
import { callRoute } from './studio-helpers';

afterAll(closeDb);

let listingId: string;

beforeAll(async () => {
  const seller = await makePerson('preview-seller', ['groomer']);
  listingId = await insertListing(seller, { title: 'Loop preview nap', formats: ['glb', 'json'], assetsStatus: 'pending', guideCount: null }, await ringSurfaceKey());
  await buildListingAssets(listingId);
}, 120_000);

describe('the public preview against the paid package', () => {
  it('holds at most a tenth of the package’s curves, four points each, no widths or binding', async () => {
    const detail = await getListingDetail(null, listingId);
    expect(detail.guidePreviewUrl).toMatch(/\/preview\/sample\.glb\?/);
    const previewResponse = await fetch(detail.guidePreviewUrl!);
    expect(previewResponse.status).toBe(200);
    const previewGltf = await load(new Uint8Array(await previewResponse.arrayBuffer()));

    const buyer = await makePerson('preview-buyer', ['buyer']);
    const link = await requestDownload(buyer, await buyListing(buyer, listingId));
    const files = unzipSync(new Uint8Array(await (await fetch(link.url)).arrayBuffer()));
    const packaged = await load(files['loop-preview-nap/guides.glb']);

    const preview = linesOf(previewGltf.scene);
    const full = linesOf(packaged.scene);
    expect(full.curves).toBe(detail.guideCount);
    expect(preview.curves).toBeGreaterThan(0);
    // The stated share: ⌊0.1 · curves⌋ at most.
    expect(preview.curves).toBeLessThanOrEqual(Math.floor(PUBLIC_PREVIEW.share * full.curves));
    expect(preview.points).toBeLessThanOrEqual(preview.curves * PUBLIC_PREVIEW.pointsPerGuide);
    expect(preview.points / preview.curves).toBeLessThan(full.points / full.curves);
    expect(full.attributes).toContain('_width');
    expect(preview.attributes).toEqual(['position']);
    const json = previewGltf.parser.json as { accessors: { name?: string }[]; meshes: { extras?: unknown }[] };
    expect(json.accessors.filter((accessor) => accessor.name)).toEqual([]);
    expect(json.meshes.map((mesh) => mesh.extras)).toEqual([undefined]);
    expect(JSON.stringify(json)).not.toMatch(/guideId|rootFace|rootBarycentric|binding/);
    // The listing says what its preview holds, and it is what three.js counted.
    expect(detail.facts!.preview).toEqual({ guides: preview.curves, pointsPerGuide: preview.points / preview.curves });
  });

  it('lets the package leave only for the paid buyer: not a visitor, another buyer or a refunded buyer', async () => {
    const buyer = await makePerson('preview-buyer', ['buyer']);
    const purchaseId = await buyListing(buyer, listingId);
    // A visitor reaches the route without a session: 401 before anything is looked up.
    const anonymous = await callRoute(downloadRoute, 'POST', `/api/library/${purchaseId}/download`, { params: { purchaseId } });
    expect(anonymous.status).toBe(401);
    // Another buyer (who bought nothing of it) and a groomer who is not the buyer: no such purchase of theirs.
    expect((await failureOf(requestDownload(await makePerson('preview-stranger', ['buyer']), purchaseId))).status).toBe(404);
    expect((await failureOf(requestDownload(await makePerson('preview-groomer', ['groomer']), purchaseId))).status).toBe(404);
    expect((await requestDownload(buyer, purchaseId)).fileName).toBe('loop-preview-nap.zip');

    // Refunded: refused from the moment the refund is asked, and after the provider confirms it.
    await refundPurchase(await makePerson('preview-admin', ['admin']), purchaseId);
    expect(await failureOf(requestDownload(buyer, purchaseId))).toMatchObject({ status: 403, code: 'refunded' });
    const { payment_intent_id: paymentIntent } = await db()('purchases').where({ id: purchaseId }).first('payment_intent_id');
    const [refunded] = await eventsAbout({ id: '', paymentIntent }, ['charge.refunded']);
    expect((await deliver(refunded)).status).toBe(200);
    expect(await failureOf(requestDownload(buyer, purchaseId))).toMatchObject({ status: 403, code: 'refunded' });
  });
});

describe('what the listing says it is', () => {
  it('states the facts measured when its assets were built, in the market API and the search columns', async () => {
    const { facts, guideCount } = await getListingDetail(null, listingId);
    const spec = (await db()('listings').where({ id: listingId }).first('spec')).spec;
    // The demo ring (lib/groom/demo): a torus declared in millimetres, Z up, 4 guides per cm² (no density pins) of 40 hairs each.
    expect(facts).toMatchObject({ units: spec.units, upAxis: spec.upAxis, hairsPerGuide: spec.guides.hairsPerGuide, pointsPerGuide: spec.guides.pointsPerGuide });
    expect(facts!.surface).toMatchObject({ genus: 1, openings: 0, pieces: 1 });
    expect(facts!.transfer).toEqual({ uv: facts!.surface.uvs && facts!.surface.uvOverlappingFaces === 0, alignment: true });
    // A density spec: the guide count is density × area rounded, so the mean is the spec's density to within half a guide.
    expect(Math.abs(facts!.guidesPerCm2 * facts!.growthAreaCm2 - guideCount!)).toBeLessThan(1e-6);
    expect(Math.abs(facts!.guidesPerCm2 - spec.guides.density)).toBeLessThanOrEqual(0.5 / facts!.growthAreaCm2 + 1e-9);
    expect(facts!.length.shortest).toBeLessThanOrEqual(facts!.length.median);
    expect(facts!.length.median).toBeLessThanOrEqual(facts!.length.longest);
    const row = await db()('listings').where({ id: listingId }).first('guides_per_cm2', 'typical_length_cm');
    expect(row.guides_per_cm2).toBeCloseTo(facts!.guidesPerCm2, 12);
    // 1 mm = 0.1 cm.
    expect(row.typical_length_cm).toBeCloseTo(facts!.length.median * (spec.units === 'mm' ? 0.1 : NaN), 12);
  });
});

describe('a listing built before the reduced preview', () => {
  it('shows no 3D preview until rebuilt; the rebuild writes the reduced one, removes the old file and keeps the package', async () => {
    const seller = await makePerson('preview-seller', ['groomer']);
    const id = await insertListing(seller, { title: 'Loop old preview', formats: ['glb'], assetsStatus: 'pending', guideCount: null }, await ringSurfaceKey());
    await buildListingAssets(id);
    const packageBefore = await db()('listing_packages').where({ listing_id: id }).first('object_key', 'built_at');
    // As the migration leaves it: ready, no preview_key, and the old full-guide file in storage.
    const oldKey = `${listingPrefix(id)}/preview/guides.glb`;
    await putObject(oldKey, await getObjectBytes(packageBefore.object_key), 'model/gltf-binary');
    await db()('listings').where({ id }).update({ preview_key: null, facts: null });
    expect(await getListingDetail(null, id)).toMatchObject({ guidePreviewUrl: null, facts: null });
    // The job workers queue it when they start (a stand-in for pg-boss records what is queued).
    const queued: unknown[] = [];
    const queue = { schedule: async () => undefined, send: async (_name: string, data: { listingId: string }) => void queued.push(data.listingId) };
    await MARKET_JOBS.onStart!(queue as unknown as Parameters<NonNullable<typeof MARKET_JOBS.onStart>>[0]);
    expect(queued).toContain(id);
    expect(queued).not.toContain(listingId);

    await buildListingAssets(id);
    expect((await getListingDetail(null, id)).guidePreviewUrl).toMatch(/\/preview\/sample\.glb\?/);
    expect((await getListingDetail(null, id)).facts).not.toBeNull();
    await expect(getObjectBytes(oldKey)).rejects.toThrow();
    expect(await db()('listing_packages').where({ listing_id: id }).first('object_key', 'built_at')).toEqual(packageBefore);
  }, 120_000);
});
