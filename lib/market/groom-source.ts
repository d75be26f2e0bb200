// The saved groom version a listing sells, read from the studio's tables (grooms, groom_versions,
// growth_surfaces; db/migrations/*studio*). Only the seller's own grooms; anything else is 404.
import { db } from '../platform/db';
import { copyObject } from '../platform/storage';
import { notFound } from './errors';
import { deleteMarketObjects } from './storage';

export type GroomVersionSource = {
  groomId: string;
  groomName: string;
  versionId: string;
  versionNumber: number;
  versionName: string;
  spec: unknown;
  surface: { objectKey: string; fileName: string };
  /** The earlier sculpt the version's guides are rooted on (a groom moved by polygon), or null. */
  rootsSurface: { objectKey: string; fileName: string } | null;
  /** Set when the groom was fitted from a bought preset: such a groom is never sold (see createListing). */
  fromPurchaseId: string | null;
};

/** A frozen copy's key under `prefix`: `<stem>` with the file's own extension, lower case. */
function frozenKey(prefix: string, stem: string, fileName: string): string {
  const dot = fileName.lastIndexOf('.');
  return `${prefix}/${stem}${dot >= 0 ? fileName.slice(dot).toLowerCase() : ''}`;
}

/**
 * Copies the version's surface (and the sculpt its roots are sampled on, if any) under `prefix`,
 * so that what a listing sells outlives the groom. Returns the copies' keys.
 */
export async function freezeSurfaces(version: GroomVersionSource, prefix: string): Promise<FrozenSurfaces> {
  const surfaceKey = frozenKey(prefix, 'surface', version.surface.fileName);
  await copyObject(version.surface.objectKey, surfaceKey);
  if (!version.rootsSurface) return { surfaceKey, rootsKey: null };
  const rootsKey = frozenKey(prefix, 'roots-surface', version.rootsSurface.fileName);
  try {
    await copyObject(version.rootsSurface.objectKey, rootsKey);
  } catch (error) {
    await deleteMarketObjects([surfaceKey]);
    throw error;
  }
  return { surfaceKey, rootsKey };
}

export type FrozenSurfaces = { surfaceKey: string; rootsKey: string | null };

/** The frozen copies' keys, to delete when what they were made for is not written. */
export const frozenKeys = (frozen: FrozenSurfaces) => [frozen.surfaceKey, ...(frozen.rootsKey ? [frozen.rootsKey] : [])];

export async function sellersGroomVersion(sellerId: string, groomId: string, versionId: string): Promise<GroomVersionSource> {
  const present = await db().raw(`SELECT to_regclass('public.groom_versions') IS NOT NULL AS present`);
  if (!present.rows[0]?.present) throw notFound('groom');
  const row = await db()('groom_versions as v')
    .join('grooms as g', 'g.id', 'v.groom_id')
    // The surface the version was made on: a groom moved onto another surface since sells its old version on the old one.
    .join('growth_surfaces as s', 's.id', 'v.surface_id')
    .leftJoin('growth_surfaces as r', 'r.id', 'v.roots_surface_id')
    .where({ 'v.id': versionId, 'g.id': groomId, 'g.owner_id': sellerId })
    .first('g.id as groom_id', 'g.from_purchase_id', 'g.name as groom_name', 'v.id as version_id', 'v.number', 'v.name', 'v.spec', 's.object_key', 's.file_name', 'r.object_key as roots_key', 'r.file_name as roots_file_name');
  if (!row) {
    const groom = await db()('grooms').where({ id: groomId, owner_id: sellerId }).first('id');
    throw notFound(groom ? 'version' : 'groom');
  }
  return {
    groomId: row.groom_id,
    groomName: row.groom_name,
    versionId: row.version_id,
    versionNumber: row.number,
    versionName: row.name,
    spec: row.spec,
    surface: { objectKey: row.object_key, fileName: row.file_name },
    rootsSurface: row.roots_key ? { objectKey: row.roots_key, fileName: row.roots_file_name } : null,
    fromPurchaseId: row.from_purchase_id ?? null,
  };
}
