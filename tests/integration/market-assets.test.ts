// A listing's pictures and package against faults: an edit made while the package is built, and
// object storage that blips or stays down. Storage is reached through a TCP proxy of this test in
// front of the S3 stand-in, which can refuse connections (a real network fault, the real SDK);
// the modules are imported after S3_ENDPOINT points at it (each test file has its own modules).
import { createConnection, createServer, type Server, type Socket } from 'node:net';
import { strFromU8, unzipSync } from 'fflate';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Actor } from '@/lib/accounts/actor';

let proxy: Server;
let refuseNext = 0;
let refused = 0;
const sockets = new Set<Socket>();

/** Starts a fault: open connections are cut, and the next `count` new ones refused. */
function refuse(count: number) {
  refused = 0;
  refuseNext = count;
  for (const socket of sockets) socket.destroy();
}

let m: {
  db: typeof import('@/lib/platform/db');
  storage: typeof import('@/lib/platform/storage');
  assets: typeof import('@/lib/market/assets');
  listings: typeof import('@/lib/market/listings');
  helpers: typeof import('./market-helpers');
};

beforeAll(async () => {
  const target = new URL(process.env.S3_ENDPOINT!);
  proxy = createServer((socket) => {
    if (refuseNext > 0) {
      refuseNext -= 1;
      refused += 1;
      socket.destroy();
      return;
    }
    const upstream = createConnection({ host: target.hostname, port: Number(target.port) });
    sockets.add(socket).add(upstream);
    socket.pipe(upstream).pipe(socket);
    const end = () => {
      socket.destroy();
      upstream.destroy();
      sockets.delete(socket);
      sockets.delete(upstream);
    };
    socket.on('error', end).on('close', end);
    upstream.on('error', end).on('close', end);
  });
  await new Promise<void>((resolve) => proxy.listen(0, '127.0.0.1', resolve));
  vi.stubEnv('S3_ENDPOINT', `http://127.0.0.1:${(proxy.address() as { port: number }).port}`);
  m = {
    db: await import('@/lib/platform/db'),
    storage: await import('@/lib/platform/storage'),
    assets: await import('@/lib/market/assets'),
    listings: await import('@/lib/market/listings'),
    helpers: await import('./market-helpers'),
  };
});

afterAll(async () => {
  await m?.db.closeDb();
  for (const socket of sockets) socket.destroy();
  await new Promise<void>((resolve) => proxy.close(() => resolve()));
  vi.unstubAllEnvs();
});

async function draft(seller: Actor, title: string) {
  return m.helpers.insertListing(seller, { title, state: 'draft', assetsStatus: 'pending', guideCount: null, formats: ['json', 'obj'] }, await m.helpers.ringSurfaceKey());
}

const listing = (id: string) => m.db.db()('listings').where({ id }).first('assets_status', 'assets_error', 'revision', 'surface_key');

describe('an edit while the package is built', () => {
  it('never leaves the package of the listing as it was before the edit', async () => {
    const seller = await m.helpers.makePerson('assets-seller', ['groomer']);
    const id = await draft(seller, 'Nap before the edit');
    const building = m.assets.buildListingAssets(id);
    // The build has read the listing once it froze the surface under the listing's own prefix.
    await m.helpers.waitFor('the build to start', async () => (await listing(id)).surface_key.startsWith(`market/listings/${id}/`));
    await m.listings.updateListing(seller, id, { title: 'Nap after the edit' });
    await building;
    const row = await listing(id);
    expect(row).toMatchObject({ assets_status: 'ready', revision: 2 });
    const pack = await m.db.db()('listing_packages').where({ listing_id: id }).first();
    expect(pack).toMatchObject({ listing_revision: 2, file_name: 'nap-after-the-edit.zip' });
    const files = unzipSync(await m.storage.getObjectBytes(pack.object_key));
    const readme = strFromU8(files['nap-after-the-edit/README.txt']);
    expect(readme).toMatch(/^Nap after the edit\n/);
    // The README explains the files of this package (spec and OBJ) and no others: no field.ply, no .usda.
    const packed = Object.keys(files).map((path) => path.split('/').pop()!).filter((name) => /\.(usda|gltf|glb|obj|json|ply)$/.test(name));
    expect(packed.sort()).toEqual(['groom-spec.json', 'guides.obj']);
    expect([...new Set(readme.match(/[\w-]*\.(usda|gltf|glb|obj|json|ply)\b/g))].sort()).toEqual(packed);
  });
});

describe('object storage faults', () => {
  it('outlasts a blip longer than the SDK’s own retries by trying again later', async () => {
    const id = await draft(await m.helpers.makePerson('assets-seller', ['groomer']), 'Nap through a blip');
    // More refused connections than one SDK call's attempts (3): only a later try gets through.
    refuse(5);
    await m.assets.buildListingAssets(id, { storageRetryDelaysMs: [50, 50, 50] });
    expect(refused).toBe(5);
    expect(await listing(id)).toMatchObject({ assets_status: 'ready', assets_error: null });
  });

  it('marks the listing failed, with the reason, only after the last try', async () => {
    const id = await draft(await m.helpers.makePerson('assets-seller', ['groomer']), 'Nap in an outage');
    refuse(Number.MAX_SAFE_INTEGER);
    try {
      await m.assets.buildListingAssets(id, { storageRetryDelaysMs: [20, 20] });
    } finally {
      refuseNext = 0;
    }
    // Three tries of the first storage call, each with the SDK's own attempts (the AWS SDK for
    // JavaScript v3 makes 3 by default, its "standard" retry mode): more than one call's worth.
    expect(refused).toBeGreaterThan(3);
    const row = await listing(id);
    expect(row.assets_status).toBe('failed');
    expect(row.assets_error).toBeTruthy();
  });

  it('fails at once when a retry cannot help (the surface is missing)', async () => {
    const seller = await m.helpers.makePerson('assets-seller', ['groomer']);
    const id = await m.helpers.insertListing(seller, { state: 'draft', assetsStatus: 'pending', guideCount: null }, 'tests/market/no-such-surface.obj');
    const started = Date.now();
    await m.assets.buildListingAssets(id, { storageRetryDelaysMs: [60_000] });
    expect(Date.now() - started).toBeLessThan(60_000); // no pause: a missing object is not retried
    expect((await listing(id)).assets_status).toBe('failed');
  });
});
