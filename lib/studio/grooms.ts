// Grooms: a growth surface and a groom spec, with the spec saved by autosave (optimistic
// revisions) and named versions that can be restored. A groomer only ever sees their own.
import type { Knex } from 'knex';
import { validateGroomSpec, type GroomSpec } from '../groom';
import { db } from '../platform/db';
import type { GroomDetail, GroomSummary, RestoredResponse, SpecSavedResponse, Version } from './types';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import type { Groomer } from '../accounts/actor';
import { enqueueThumbnail } from './jobs';
import { startingSpec } from './starting-spec';
import { presignDownload } from '../platform/storage';
import { deleteOrphanedObjects, STUDIO_URL_SECONDS } from './storage';
import { surfaceMesh } from './surface-cache';
import { ownSurfaceRow, surfaceDetail, type SurfaceRow } from './surfaces';

export const GROOM_NAME_MAX = 200;

export type GroomRow = {
  id: string;
  owner_id: string;
  surface_id: string;
  /** The surface whose roots the guides grow from, when it is an earlier sculpt of `surface_id` (same polygons). */
  roots_surface_id: string | null;
  /** The purchase the groom was fitted from (lib/market/fit.ts): used under its licence, never sold again. Copies keep it. */
  from_purchase_id: string | null;
  name: string;
  spec: GroomSpec;
  revision: number;
  spec_saved_at: Date;
  thumbnail_key: string | null;
  created_at: Date;
  updated_at: Date;
};

type GroomListRow = GroomRow & {
  surface_name: string;
  surface_thumbnail_key: string | null;
  version_count: number;
  latest_number: number | null;
  latest_name: string | null;
};

type VersionRow = { id: string; groom_id: string; surface_id: string; roots_surface_id: string | null; number: number; name: string; spec: GroomSpec; source_revision: number; thumbnail_key: string | null; created_at: Date };

/** The groomer's grooms with what their summaries show, newest edit first. */
function groomListQuery(groomer: Groomer, connection: Knex | Knex.Transaction = db()) {
  return connection('grooms as g')
    .join('growth_surfaces as s', 's.id', 'g.surface_id')
    .joinRaw(
      `LEFT JOIN LATERAL (
         SELECT count(*)::int AS version_count, max(number) AS latest_number,
                (SELECT name FROM groom_versions WHERE groom_id = g.id ORDER BY number DESC LIMIT 1) AS latest_name
           FROM groom_versions WHERE groom_id = g.id
       ) AS v ON true`,
    )
    .where('g.owner_id', groomer.userId)
    .select('g.*', 's.name as surface_name', 's.thumbnail_key as surface_thumbnail_key', 'v.version_count', 'v.latest_number', 'v.latest_name');
}

async function groomSummary(row: GroomListRow): Promise<GroomSummary> {
  const thumbnailKey = row.thumbnail_key ?? row.surface_thumbnail_key;
  return {
    id: row.id,
    name: row.name,
    surfaceId: row.surface_id,
    surfaceName: row.surface_name,
    revision: row.revision,
    versionCount: row.version_count,
    latestVersion: row.latest_number === null ? null : { number: row.latest_number, name: row.latest_name! },
    thumbnailUrl: thumbnailKey ? await presignDownload(thumbnailKey, STUDIO_URL_SECONDS) : null,
    updatedAt: row.updated_at.toISOString(),
    fromPurchaseId: row.from_purchase_id,
  };
}

async function version(row: VersionRow): Promise<Version> {
  return {
    id: row.id,
    number: row.number,
    name: row.name,
    surfaceId: row.surface_id,
    createdAt: row.created_at.toISOString(),
    thumbnailUrl: row.thumbnail_key ? await presignDownload(row.thumbnail_key, STUDIO_URL_SECONDS) : null,
  };
}

export async function listGrooms(groomer: Groomer): Promise<GroomSummary[]> {
  const rows: GroomListRow[] = await groomListQuery(groomer).orderBy([
    { column: 'g.updated_at', order: 'desc' },
    { column: 'g.id', order: 'desc' },
  ]);
  return Promise.all(rows.map(groomSummary));
}

export async function getGroom(groomer: Groomer, groomId: string): Promise<GroomDetail> {
  const row: GroomListRow | undefined = await groomListQuery(groomer).where('g.id', groomId).first();
  if (!row) throw notFound('groom');
  const surface: SurfaceRow = await db()('growth_surfaces').where({ id: row.surface_id }).first();
  const versions: VersionRow[] = await db()('groom_versions').where({ groom_id: groomId }).orderBy('number', 'desc');
  // Grooms are made only on ready surfaces, and a surface never leaves that state.
  const detail = await surfaceDetail(surface);
  if (detail.state !== 'ready') throw new Error(`groom ${groomId} grows on surface ${surface.id}, which is ${detail.state}`);
  const roots: SurfaceRow | undefined = row.roots_surface_id ? await db()('growth_surfaces').where({ id: row.roots_surface_id }).first() : undefined;
  return {
    ...(await groomSummary(row)),
    spec: row.spec,
    savedAt: row.spec_saved_at.toISOString(),
    surface: detail,
    rootsSurface: roots ? { id: roots.id, fileName: roots.file_name, fileUrl: await presignDownload(roots.object_key, STUDIO_URL_SECONDS, roots.file_name) } : null,
    versions: await Promise.all(versions.map(version)),
  };
}

/** The groomer's groom row, locked for the rest of the transaction, or a 404. */
async function lockOwnGroom(trx: Knex.Transaction, groomer: Groomer, groomId: string): Promise<GroomRow> {
  const row: GroomRow | undefined = await trx('grooms').where({ id: groomId, owner_id: groomer.userId }).forUpdate().first();
  if (!row) throw notFound('groom');
  return row;
}

/** Creates a groom on one of the groomer's surfaces, starting from a spec whose index budget is balanced. */
export async function createGroom(groomer: Groomer, input: { surfaceId: string; name: string }): Promise<GroomDetail> {
  const surface = await ownSurfaceRow(groomer, input.surfaceId);
  if (surface.state !== 'ready') {
    throw new HttpError(
      409,
      'surface-not-ready',
      surface.state === 'checking' ? `${surface.name} is still being checked; start a groom on it once it is ready.` : `${surface.name} was refused by its check and cannot carry a groom.`,
    );
  }
  // The check worked out the starting spec; only surfaces checked before it did are read again.
  const spec = surface.starting_spec ?? startingSpec(await surfaceMesh({ id: surface.id, objectKey: surface.object_key, fileName: surface.file_name }), surface.units, surface.area_cm2 ?? 0);
  const [{ id }] = await db()('grooms')
    .insert({ owner_id: groomer.userId, surface_id: surface.id, name: input.name, spec: JSON.stringify(spec) })
    .returning('id');
  await enqueueThumbnail({ groomId: id });
  return getGroom(groomer, id);
}

export async function renameGroom(groomer: Groomer, groomId: string, name: string): Promise<GroomDetail> {
  const updated = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).update({ name, updated_at: db().fn.now() });
  if (updated === 0) throw notFound('groom');
  return getGroom(groomer, groomId);
}

/** A new groom on the same surface with a copy of the saved spec (and the purchase it came from); versions stay with the original. */
export async function duplicateGroom(groomer: Groomer, groomId: string, name?: string): Promise<GroomDetail> {
  const original: GroomRow | undefined = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).first();
  if (!original) throw notFound('groom');
  const copyName = name ?? `${original.name.slice(0, GROOM_NAME_MAX - ' (copy)'.length)} (copy)`;
  const [{ id }] = await db()('grooms')
    .insert({ owner_id: groomer.userId, surface_id: original.surface_id, roots_surface_id: original.roots_surface_id, from_purchase_id: original.from_purchase_id, name: copyName, spec: JSON.stringify(original.spec) })
    .returning('id');
  await enqueueThumbnail({ groomId: id });
  return getGroom(groomer, id);
}

/** Deletes a groom with its versions and exports, and then their files. */
export async function deleteGroom(groomer: Groomer, groomId: string): Promise<void> {
  const keys = await db().transaction(async (trx) => {
    const groom = await lockOwnGroom(trx, groomer, groomId);
    const versionKeys: (string | null)[] = await trx('groom_versions').where({ groom_id: groomId }).pluck('thumbnail_key');
    const exportKeys: (string | null)[] = await trx('groom_exports').where({ groom_id: groomId }).pluck('object_key');
    await trx('grooms').where({ id: groomId }).delete();
    return [groom.thumbnail_key, ...versionKeys, ...exportKeys];
  });
  await deleteOrphanedObjects(keys);
}

/** The spec checked with lib/groom's schema, and against the surface's declared units. */
function checkedSpec(input: unknown, surfaceUnits: string): GroomSpec {
  const result = validateGroomSpec(input);
  if (result.problems) {
    const fields = Object.fromEntries(result.problems.map((problem) => [problem.path, problem.message]));
    const [first] = result.problems;
    const more = result.problems.length > 1 ? ` (and ${result.problems.length - 1} more)` : '';
    throw new HttpError(400, 'invalid-spec', `The groom spec was not saved: ${first.path} ${first.message}${more}.`, { fields });
  }
  if (result.spec.units !== surfaceUnits) {
    const message = `must be "${surfaceUnits}", the units the growth surface was uploaded in`;
    throw new HttpError(400, 'invalid-spec', `The groom spec was not saved: units ${message}.`, { fields: { units: message } });
  }
  return result.spec;
}

/**
 * Autosave: stores the spec as the groom's saved spec if `baseRevision` is the revision stored,
 * so that an editor working from an older spec never overwrites a newer one unknowingly.
 */
export async function saveSpec(groomer: Groomer, groomId: string, input: { spec: unknown; baseRevision: number }): Promise<SpecSavedResponse> {
  return db().transaction(async (trx) => {
    const groom = await lockOwnGroom(trx, groomer, groomId);
    const surface: Pick<SurfaceRow, 'units'> = await trx('growth_surfaces').where({ id: groom.surface_id }).first('units');
    const spec = checkedSpec(input.spec, surface.units);
    if (input.baseRevision !== groom.revision) {
      throw new HttpError(
        409,
        'stale-revision',
        `The spec changed since revision ${input.baseRevision} (another tab or a restore saved revision ${groom.revision}); load it again before saving.`,
        { details: { revision: groom.revision } },
      );
    }
    const [saved] = await trx('grooms')
      .where({ id: groomId })
      .update({ spec: JSON.stringify(spec), revision: groom.revision + 1, spec_saved_at: trx.fn.now(), updated_at: trx.fn.now() })
      .returning(['revision', 'spec_saved_at']);
    return { revision: saved.revision, savedAt: saved.spec_saved_at.toISOString() };
  });
}

/** Keeps the saved spec as a numbered, named version, and queues its thumbnail. */
export async function createVersion(groomer: Groomer, groomId: string, name: string): Promise<Version> {
  const created = await db().transaction(async (trx) => {
    const groom = await lockOwnGroom(trx, groomer, groomId);
    const [{ latest }] = await trx('groom_versions').where({ groom_id: groomId }).max<{ latest: number | null }[]>('number as latest');
    const [row] = await trx('groom_versions')
      .insert({ groom_id: groomId, surface_id: groom.surface_id, roots_surface_id: groom.roots_surface_id, number: (latest ?? 0) + 1, name, spec: JSON.stringify(groom.spec), source_revision: groom.revision })
      .returning('*');
    await trx('grooms').where({ id: groomId }).update({ updated_at: trx.fn.now() });
    return row as VersionRow;
  });
  await enqueueThumbnail({ groomId, versionId: created.id });
  return version(created);
}

export async function listVersions(groomer: Groomer, groomId: string): Promise<Version[]> {
  const groom = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).first('id');
  if (!groom) throw notFound('groom');
  const rows: VersionRow[] = await db()('groom_versions').where({ groom_id: groomId }).orderBy('number', 'desc');
  return Promise.all(rows.map(version));
}

/**
 * Makes a version's spec the saved spec again, as a new revision, on the surface the version was
 * made on (a groom whose surface was replaced since goes back to its old surface).
 */
export async function restoreVersion(groomer: Groomer, groomId: string, versionId: string): Promise<RestoredResponse> {
  const restored = await db().transaction(async (trx) => {
    const groom = await lockOwnGroom(trx, groomer, groomId);
    const row: VersionRow | undefined = await trx('groom_versions').where({ id: versionId, groom_id: groomId }).first();
    if (!row) throw notFound('version');
    const [saved] = await trx('grooms')
      .where({ id: groomId })
      .update({ spec: JSON.stringify(row.spec), surface_id: row.surface_id, roots_surface_id: row.roots_surface_id, revision: groom.revision + 1, spec_saved_at: trx.fn.now(), updated_at: trx.fn.now() })
      .returning(['spec', 'surface_id', 'revision', 'spec_saved_at']);
    return { spec: saved.spec as GroomSpec, surfaceId: saved.surface_id as string, revision: saved.revision as number, savedAt: (saved.spec_saved_at as Date).toISOString() };
  });
  await enqueueThumbnail({ groomId });
  return restored;
}
