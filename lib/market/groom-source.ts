// The saved groom version a listing sells, read from the studio's tables (grooms, groom_versions,
// growth_surfaces; db/migrations/*studio*). Only the seller's own grooms; anything else is 404.
import { db } from '../platform/db';
import { notFound } from './errors';

export type GroomVersionSource = {
  groomId: string;
  groomName: string;
  versionId: string;
  versionNumber: number;
  versionName: string;
  spec: unknown;
  surface: { objectKey: string; fileName: string };
  /** Set when the groom was fitted from a bought preset: such a groom is never sold (see createListing). */
  fromPurchaseId: string | null;
};

export async function sellersGroomVersion(sellerId: string, groomId: string, versionId: string): Promise<GroomVersionSource> {
  const present = await db().raw(`SELECT to_regclass('public.groom_versions') IS NOT NULL AS present`);
  if (!present.rows[0]?.present) throw notFound('groom');
  const row = await db()('groom_versions as v')
    .join('grooms as g', 'g.id', 'v.groom_id')
    // The surface the version was made on: a groom moved onto another surface since sells its old version on the old one.
    .join('growth_surfaces as s', 's.id', 'v.surface_id')
    .where({ 'v.id': versionId, 'g.id': groomId, 'g.owner_id': sellerId })
    .first('g.id as groom_id', 'g.from_purchase_id', 'g.name as groom_name', 'v.id as version_id', 'v.number', 'v.name', 'v.spec', 's.object_key', 's.file_name');
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
    fromPurchaseId: row.from_purchase_id ?? null,
  };
}
