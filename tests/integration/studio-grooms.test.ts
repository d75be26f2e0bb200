// Grooms, autosave and versions through the studio's route handlers, with the job worker running
// in this process for the thumbnails.
import { callRoute, createSurface, expectJson, studioCast, type TestAccount } from './studio-helpers';
import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { indexBudget, readSurface } from '@/lib/field';
import { fieldRequestFromSpec, parseGroomSpec, prepareGroomSurface, solveGroomField, type GroomSpec } from '@/lib/groom';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import * as groomRoute from '@/app/api/studio/grooms/[groomId]/route';
import * as duplicateRoute from '@/app/api/studio/grooms/[groomId]/duplicate/route';
import * as specRoute from '@/app/api/studio/grooms/[groomId]/spec/route';
import * as versionsRoute from '@/app/api/studio/grooms/[groomId]/versions/route';
import * as restoreRoute from '@/app/api/studio/grooms/[groomId]/versions/[versionId]/restore/route';
import * as surfaceRoute from '@/app/api/studio/surfaces/[surfaceId]/route';
import type { GroomDetail, GroomSummary, ReadySurface, Version } from '@/lib/studio/types';

const [fox, , ring] = DEMO_GROOMS;
const foxObj = new TextEncoder().encode(surfaceToObj(fox.surface(), 'fox head'));
const ringObj = new TextEncoder().encode(surfaceToObj(ring.surface(), 'plush ring'));

let worker: JobsWorkerProcess;
let wren: TestAccount;
let rival: TestAccount;
let buyer: TestAccount;
let foxSurface: ReadySurface;

beforeAll(async () => {
  worker = await startJobsWorkerProcess();
  ({ owner: wren, rival, buyer } = await studioCast('groom'));
  foxSurface = await createSurface(wren, 'bramble.obj', foxObj, 'Bramble head');
});

afterAll(async () => {
  await worker.stop();
  await closeDb();
});

const groomPath = (id: string) => `/api/studio/grooms/${id}`;
const as = (account: TestAccount | null, groomId: string, body?: unknown, extra: Record<string, string> = {}) => ({
  cookie: account?.cookie,
  body,
  params: { groomId, ...extra },
});

async function createGroom(account: TestAccount, surfaceId: string, name: string): Promise<GroomDetail> {
  const response = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: account.cookie, body: { surfaceId, name } });
  return (await expectJson<{ data: { groom: GroomDetail } }>(response, 201)).data.groom;
}

async function getGroom(account: TestAccount, id: string): Promise<GroomDetail> {
  return (await expectJson(await callRoute(groomRoute, 'GET', groomPath(id), as(account, id)), 200)).data.groom;
}

function saveSpec(account: TestAccount, id: string, spec: unknown, baseRevision: number) {
  return callRoute(specRoute, 'PUT', `${groomPath(id)}/spec`, as(account, id, { spec, baseRevision }));
}

/** Polls until the check passes (the job worker runs in the background). */
async function eventually<T>(check: () => Promise<T | null | undefined | false>, what: string, seconds = 30): Promise<T> {
  const deadline = Date.now() + seconds * 1000;
  for (;;) {
    const result = await check();
    if (result) return result;
    if (Date.now() > deadline) throw new Error(`waited ${seconds} s for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
}

function placedIndex(spec: GroomSpec): number {
  return spec.field.singularities.reduce((sum, s) => sum + s.index, 0);
}

describe('a new groom', () => {
  let groom: GroomDetail;

  beforeAll(async () => {
    groom = await createGroom(wren, foxSurface.id, 'Bramble — first coat');
  });

  it('starts at revision 1 with a spec in the surface’s units whose index budget is balanced', () => {
    expect(groom).toMatchObject({ name: 'Bramble — first coat', surfaceId: foxSurface.id, surfaceName: 'Bramble head', revision: 1, versionCount: 0, latestVersion: null, versions: [] });
    expect(groom.surface).toMatchObject({ id: foxSurface.id, eulerCharacteristic: 2, fileUrl: expect.stringContaining('bramble.obj') });
    expect(groom.spec.units).toBe('cm');
    expect(groom.spec.field.singularities.map((s) => s.index)).toEqual([1, 1]);
    expect(placedIndex(groom.spec)).toBe(foxSurface.eulerCharacteristic);
  });

  it('has a starting spec that solves, with exactly the singularities it places', () => {
    const surface = prepareGroomSurface(readSurface(foxObj, 'bramble.obj').mesh);
    const spec = parseGroomSpec(groom.spec);
    expect(indexBudget(surface.field, fieldRequestFromSpec(spec, surface)).balanced).toBe(true);
    const solved = solveGroomField(spec, surface);
    const singular = Array.from(solved.measuredIndex).filter((index) => Math.abs(index) > 1e-6);
    expect(singular.map(Math.round)).toEqual([1, 1]);
  });

  it('places nothing on a ring (χ = 0), and its spec solves', async () => {
    const ringSurface = await createSurface(wren, 'loop.obj', ringObj, 'Loop ring', 'mm');
    const onRing = await createGroom(wren, ringSurface.id, 'Loop — first coat');
    expect(onRing.spec).toMatchObject({ units: 'mm', field: { singularities: [] } });
    const surface = prepareGroomSurface(readSurface(ringObj, 'loop.obj').mesh);
    expect(() => solveGroomField(parseGroomSpec(onRing.spec), surface)).not.toThrow();
  });

  it('shows the surface’s thumbnail until the job has rendered the groom’s own', async () => {
    expect(groom.thumbnailUrl).toMatch(/thumbnail-.*\.webp/);
    const key = await eventually(async () => (await db()('grooms').where({ id: groom.id }).first('thumbnail_key')).thumbnail_key, 'the groom thumbnail');
    expect(key).toMatch(new RegExp(`^grooms/${groom.id}/thumbnail-`));
    const listed = (await getGroom(wren, groom.id)).thumbnailUrl!;
    expect(new URL(listed).pathname).toContain(key);
    const image = await fetch(listed);
    expect(image.headers.get('content-type')).toBe('image/webp');
  });

  it('is listed with its surface, revision and version, newest edit first', async () => {
    const other = await createGroom(wren, foxSurface.id, 'Bramble — second coat');
    const { grooms } = (await expectJson<{ data: { grooms: GroomSummary[] } }>(await callRoute(groomsRoute, 'GET', '/api/studio/grooms', { cookie: wren.cookie }), 200)).data;
    expect(grooms[0]).toMatchObject({ id: other.id, surfaceName: 'Bramble head', revision: 1, versionCount: 0, latestVersion: null });
    expect(grooms.map((g) => g.id)).toContain(groom.id);
  });

  it('refuses a surface of another groomer as not found', async () => {
    const response = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: rival.cookie, body: { surfaceId: foxSurface.id, name: 'Stolen coat' } });
    expect((await expectJson(response, 404)).error.message).toBe('There is no such surface in your studio.');
  });
});

describe('renaming, duplicating, deleting', () => {
  it('renames, and the last edit moves on', async () => {
    const groom = await createGroom(wren, foxSurface.id, 'Working title');
    const response = await callRoute(groomRoute, 'PATCH', groomPath(groom.id), as(wren, groom.id, { name: '  Bramble — winter coat ' }));
    const renamed = (await expectJson(response, 200)).data.groom as GroomDetail;
    expect(renamed.name).toBe('Bramble — winter coat');
    expect(Date.parse(renamed.updatedAt)).toBeGreaterThanOrEqual(Date.parse(groom.updatedAt));
    const empty = await callRoute(groomRoute, 'PATCH', groomPath(groom.id), as(wren, groom.id, { name: '' }));
    expect((await expectJson(empty, 400)).error.fields).toEqual({ name: 'Give the groom a name.' });
  });

  it('duplicates the saved spec into a new groom at revision 1, named “(copy)” unless named', async () => {
    const groom = await createGroom(wren, foxSurface.id, 'Original');
    const changed = { ...groom.spec, guides: { ...groom.spec.guides, length: 3.5 } };
    await expectJson(await saveSpec(wren, groom.id, changed, 1), 200);
    const copy = (await expectJson(await callRoute(duplicateRoute, 'POST', `${groomPath(groom.id)}/duplicate`, as(wren, groom.id, {})), 201)).data.groom as GroomDetail;
    expect(copy).toMatchObject({ name: 'Original (copy)', surfaceId: foxSurface.id, revision: 1, versions: [] });
    expect(copy.id).not.toBe(groom.id);
    expect(copy.spec.guides.length).toBe(3.5);
    const named = (await expectJson(await callRoute(duplicateRoute, 'POST', `${groomPath(groom.id)}/duplicate`, as(wren, groom.id, { name: 'Variant B' })), 201)).data.groom;
    expect(named.name).toBe('Variant B');
  });

  it('deletes a groom with its versions, and frees its surface', async () => {
    const surface = await createSurface(wren, 'bramble.obj', foxObj, 'Short-lived head');
    const groom = await createGroom(wren, surface.id, 'Short-lived');
    await expectJson(await callRoute(versionsRoute, 'POST', `${groomPath(groom.id)}/versions`, as(wren, groom.id, { name: 'v1' })), 201);
    const inUse = await callRoute(surfaceRoute, 'DELETE', `/api/studio/surfaces/${surface.id}`, { cookie: wren.cookie, params: { surfaceId: surface.id } });
    const { error } = await expectJson(inUse, 409);
    expect(error).toMatchObject({ code: 'surface-in-use', message: 'A groom grows on this surface (“Short-lived”); delete it first.' });

    expect(await expectJson(await callRoute(groomRoute, 'DELETE', groomPath(groom.id), as(wren, groom.id)), 200)).toEqual({ data: { deleted: true } });
    expect((await expectJson(await callRoute(groomRoute, 'GET', groomPath(groom.id), as(wren, groom.id)), 404)).error.code).toBe('not-found');
    expect(await db()('groom_versions').where({ groom_id: groom.id })).toHaveLength(0);
    const freed = await callRoute(surfaceRoute, 'DELETE', `/api/studio/surfaces/${surface.id}`, { cookie: wren.cookie, params: { surfaceId: surface.id } });
    expect(freed.status).toBe(200);
  });
});

describe('autosave', () => {
  // Each test saves on a groom of its own, so the revisions it expects are its own doing.
  const fresh = (name: string) => createGroom(wren, foxSurface.id, name);

  it('saves a spec on the revision it was loaded at, and counts revisions', async () => {
    const groom = await fresh('Autosaved coat');
    const spec = { ...fox.spec };
    const first = (await expectJson(await saveSpec(wren, groom.id, spec, 1), 200)).data;
    expect(first).toEqual({ revision: 2, savedAt: expect.any(String) });
    const second = (await expectJson(await saveSpec(wren, groom.id, { ...spec, guides: { ...spec.guides, lift: 30 } }, 2), 200)).data;
    expect(second.revision).toBe(3);
    const saved = await getGroom(wren, groom.id);
    expect(saved).toMatchObject({ revision: 3, savedAt: second.savedAt });
    // What is stored is the spec resolved by lib/groom: the same decisions, every default filled in.
    expect(saved.spec).toEqual(parseGroomSpec({ ...spec, guides: { ...spec.guides, lift: 30 } }));
  });

  it('refuses a save from a stale revision with 409 and the current revision', async () => {
    const groom = await fresh('Coat saved in another tab');
    await expectJson(await saveSpec(wren, groom.id, fox.spec, 1), 200);
    const response = await saveSpec(wren, groom.id, { ...fox.spec, guides: { ...fox.spec.guides, lift: 30 } }, 1);
    const { error } = await expectJson(response, 409);
    expect(error).toMatchObject({ code: 'stale-revision', details: { revision: 2 } });
    expect(error.message).toMatch(/since revision 1 .* revision 2/);
    expect(await getGroom(wren, groom.id)).toMatchObject({ revision: 2, spec: parseGroomSpec(fox.spec) });
  });

  it('refuses an invalid spec with 400 and a message per spec path, saving nothing', async () => {
    const groom = await fresh('Coat with a bad spec');
    const bad = {
      ...fox.spec,
      field: { singularities: [{ vertex: 3, index: 0 }, { point: [0, 0, 0], vertex: 1, index: 1 }] },
      guides: { colour: 'russet' },
    };
    const { error } = await expectJson(await saveSpec(wren, groom.id, bad, 1), 400);
    expect(error.code).toBe('invalid-spec');
    expect(error.fields).toEqual({
      'field.singularities[0].index': 'an index of 0 is no singularity',
      'field.singularities[1]': 'give either "point" or "vertex" (one of them, not both)',
      'guides.colour': 'is not a field of the groom spec',
    });
    expect(error.message).toMatch(/^The groom spec was not saved: field\.singularities\[0\]\.index an index of 0 is no singularity \(and 2 more\)\.$/);
    expect((await getGroom(wren, groom.id)).revision).toBe(1);
  });

  it('refuses a spec in other units than the surface’s', async () => {
    const groom = await fresh('Coat in millimetres');
    const { error } = await expectJson(await saveSpec(wren, groom.id, { ...fox.spec, units: 'mm' }, 1), 400);
    expect(error).toMatchObject({ code: 'invalid-spec', fields: { units: 'must be "cm", the units the growth surface was uploaded in' } });
    expect((await getGroom(wren, groom.id)).revision).toBe(1);
  });

  it('asks for the revision and the spec', async () => {
    const groom = await fresh('Coat sent nothing');
    const { error } = await expectJson(await callRoute(specRoute, 'PUT', `${groomPath(groom.id)}/spec`, as(wren, groom.id, {})), 400);
    expect(Object.keys(error.fields).sort()).toEqual(['baseRevision', 'spec']);
  });
});

describe('versions', () => {
  /** A groom with the fox's spec saved (revision 2) and kept as version 1, “Autumn”. */
  async function groomWithVersion(name: string): Promise<{ groom: GroomDetail; first: Version }> {
    const groom = await createGroom(wren, foxSurface.id, name);
    await expectJson(await saveSpec(wren, groom.id, fox.spec, 1), 200);
    const first = (await expectJson(await callRoute(versionsRoute, 'POST', `${groomPath(groom.id)}/versions`, as(wren, groom.id, { name: 'Autumn' })), 201)).data.version;
    return { groom, first };
  }
  // Read by the tests that change nothing; the others make their own.
  let groom: GroomDetail;
  let first: Version;

  beforeAll(async () => {
    ({ groom, first } = await groomWithVersion('Versioned coat'));
  });

  it('keeps the saved spec under a number and a name', async () => {
    expect(first).toMatchObject({ number: 1, name: 'Autumn', thumbnailUrl: null });
    const stored = await db()('groom_versions').where({ id: first.id }).first();
    expect(stored).toMatchObject({ source_revision: 2, spec: parseGroomSpec(fox.spec) });
  });

  it('renders the version’s thumbnail through the job queue', async () => {
    await eventually(async () => (await db()('groom_versions').where({ id: first.id }).first('thumbnail_key')).thumbnail_key, 'the version thumbnail');
    const { versions } = (await expectJson(await callRoute(versionsRoute, 'GET', `${groomPath(groom.id)}/versions`, as(wren, groom.id)), 200)).data;
    const image = await fetch(versions.find((v: Version) => v.id === first.id).thumbnailUrl);
    expect(image.status).toBe(200);
    expect(image.headers.get('content-type')).toBe('image/webp');
  });

  it('lists versions newest first, and the groom shows its latest', async () => {
    const { groom } = await groomWithVersion('Coat kept twice');
    const shorter = { ...fox.spec, guides: { ...fox.spec.guides, length: 0.8 } };
    await expectJson(await saveSpec(wren, groom.id, shorter, 2), 200);
    await expectJson(await callRoute(versionsRoute, 'POST', `${groomPath(groom.id)}/versions`, as(wren, groom.id, { name: 'Summer trim' })), 201);
    const { versions } = (await expectJson(await callRoute(versionsRoute, 'GET', `${groomPath(groom.id)}/versions`, as(wren, groom.id)), 200)).data;
    expect(versions.map((v: Version) => [v.number, v.name])).toEqual([[2, 'Summer trim'], [1, 'Autumn']]);
    const { grooms } = (await expectJson(await callRoute(groomsRoute, 'GET', '/api/studio/grooms', { cookie: wren.cookie }), 200)).data;
    expect(grooms.find((g: GroomSummary) => g.id === groom.id)).toMatchObject({ versionCount: 2, latestVersion: { number: 2, name: 'Summer trim' }, revision: 3 });
  });

  it('restores a version as a new revision of the saved spec', async () => {
    const { groom, first } = await groomWithVersion('Coat restored');
    await expectJson(await saveSpec(wren, groom.id, { ...fox.spec, guides: { ...fox.spec.guides, length: 0.8 } }, 2), 200);
    const response = await callRoute(restoreRoute, 'POST', `${groomPath(groom.id)}/versions/${first.id}/restore`, as(wren, groom.id, undefined, { versionId: first.id }));
    const restored = (await expectJson(response, 200)).data;
    expect(restored).toMatchObject({ revision: 4, spec: parseGroomSpec(fox.spec) });
    const saved = await getGroom(wren, groom.id);
    expect(saved).toMatchObject({ revision: 4, spec: parseGroomSpec(fox.spec), savedAt: restored.savedAt });
    // An editor still at revision 3 is told about the restore instead of overwriting it.
    expect((await expectJson(await saveSpec(wren, groom.id, fox.spec, 3), 409)).error.details).toEqual({ revision: 4 });
  });

  it('answers 404 for a version of another groom', async () => {
    const other = await createGroom(wren, foxSurface.id, 'Unrelated');
    const response = await callRoute(restoreRoute, 'POST', `${groomPath(other.id)}/versions/${first.id}/restore`, as(wren, other.id, undefined, { versionId: first.id }));
    expect((await expectJson(response, 404)).error.message).toBe('There is no such version in your studio.');
  });
});

describe('who may see and change grooms', () => {
  let groom: GroomDetail;
  let version: Version;

  beforeAll(async () => {
    groom = await createGroom(wren, foxSurface.id, 'Private coat');
    version = (await expectJson(await callRoute(versionsRoute, 'POST', `${groomPath(groom.id)}/versions`, as(wren, groom.id, { name: 'Kept' })), 201)).data.version;
  });

  const everyCall = (account: TestAccount | null) => [
    callRoute(groomRoute, 'GET', groomPath(groom.id), as(account, groom.id)),
    callRoute(groomRoute, 'PATCH', groomPath(groom.id), as(account, groom.id, { name: 'Mine' })),
    callRoute(duplicateRoute, 'POST', `${groomPath(groom.id)}/duplicate`, as(account, groom.id, {})),
    callRoute(specRoute, 'PUT', `${groomPath(groom.id)}/spec`, as(account, groom.id, { spec: fox.spec, baseRevision: 1 })),
    callRoute(versionsRoute, 'GET', `${groomPath(groom.id)}/versions`, as(account, groom.id)),
    callRoute(versionsRoute, 'POST', `${groomPath(groom.id)}/versions`, as(account, groom.id, { name: 'Mine' })),
    callRoute(restoreRoute, 'POST', `${groomPath(groom.id)}/versions/${version.id}/restore`, as(account, groom.id, undefined, { versionId: version.id })),
    callRoute(groomRoute, 'DELETE', groomPath(groom.id), as(account, groom.id)),
  ];

  it('answers 404 to another groomer for the groom and its versions, and changes nothing', async () => {
    for (const response of await Promise.all(everyCall(rival))) {
      expect((await expectJson(response, 404)).error.code).toBe('not-found');
    }
    const { grooms } = (await expectJson(await callRoute(groomsRoute, 'GET', '/api/studio/grooms', { cookie: rival.cookie }), 200)).data;
    expect(grooms).toEqual([]);
    expect(await getGroom(wren, groom.id)).toMatchObject({ name: 'Private coat', revision: 1, versionCount: 1 });
  });

  // Buyers work in the studio on their own surfaces and grooms (fitting what they bought): to them
  // a groomer's groom is as unknown as to another groomer.
  it('answers 404 to a buyer for a groomer’s groom and surface, and 401 to a visitor', async () => {
    for (const response of await Promise.all(everyCall(buyer))) expect((await expectJson(response, 404)).error.code).toBe('not-found');
    for (const response of await Promise.all(everyCall(null))) expect((await expectJson(response, 401)).error.code).toBe('not-signed-in');
    expect((await expectJson(await callRoute(groomsRoute, 'GET', '/api/studio/grooms', { cookie: buyer.cookie }), 200)).data.grooms).toEqual([]);
    expect((await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: buyer.cookie, body: { surfaceId: foxSurface.id, name: 'x' } })).status).toBe(404);
    expect(await getGroom(wren, groom.id)).toMatchObject({ name: 'Private coat', revision: 1, versionCount: 1 });
  });
});
