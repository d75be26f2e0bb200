// Pieces of a `listing_versions` row that the listing's commands and its updates' commands write
// alike: what a version freezes of the seller's groom version, and the seller's confirmation of
// their rights with the wording it was given under (lib/market/rights.ts).
import type { Knex } from 'knex';
import type { Actor } from '../../accounts/actor';
import { HttpError } from '../../http/errors';
import { parseGroomSpec, type GroomSpec } from '../../groom';
import type { FrozenSurfaces, GroomVersionSource } from '../groom-source';
import { FIELD_NEEDS_SURFACE, RIGHTS_WORDING, SURFACE_CARRYING_FORMAT } from '../rights';
import type { ListingPatchInput } from '../validation';
import type { ListingRow } from './views';

/**
 * The spec of the seller's groom version, resolved as a listing freezes it; 422 in lib/groom's
 * words when it cannot be sold as it is, and 422 bought-not-for-resale for a groom fitted from a
 * bought preset (lib/market/fitting: its licence covers use, not resale), for a new listing and a
 * listing's new version alike.
 */
export function sellableSpec(version: GroomVersionSource): GroomSpec {
  if (version.fromPurchaseId) {
    throw new HttpError(
      422,
      'bought-not-for-resale',
      `“${version.groomName}” was fitted from a preset you bought: its licence lets you use it on your characters, not sell it. Only grooms you made yourself can be listed.`,
      { fields: { groomId: 'A groom fitted from a bought preset cannot be sold.' } },
    );
  }
  try {
    return parseGroomSpec(version.spec);
  } catch (error) {
    throw new HttpError(422, 'invalid-input', `That version's groom spec cannot be sold as it is: ${(error as Error).message}`);
  }
}

/** The groom version a listing version sells, frozen: its spec resolved, its surfaces copied (see freezeSurfaces). */
export function frozenVersionColumns(version: GroomVersionSource, spec: GroomSpec, { surfaceKey, rootsKey }: FrozenSurfaces) {
  return {
    groom_id: version.groomId,
    groom_version_id: version.versionId,
    groom_name: version.groomName,
    version_number: version.versionNumber,
    version_name: version.versionName,
    spec: JSON.stringify(spec),
    surface_key: surfaceKey,
    surface_file_name: version.surface.fileName,
    roots_surface_key: rootsKey,
    roots_surface_file_name: rootsKey ? version.rootsSurface!.fileName : null,
  };
}

/** Who confirmed their rights, when, under which wording (the three together or none, as the table's check says). */
export function rightsConfirmation(actor: Actor) {
  return { rights_confirmed_by: actor.userId, rights_confirmed_at: new Date(), rights_wording_version: RIGHTS_WORDING.version };
}

/** 400 with a message on `formats` when the field file is asked for without the surface (it holds the whole surface). */
export function surfaceRuleOf(value: { formats: readonly string[]; shipsSurface: boolean }): void {
  if (value.formats.includes(SURFACE_CARRYING_FORMAT) && !value.shipsSurface) {
    throw new HttpError(400, 'invalid-input', 'Some fields need another look.', { fields: { formats: FIELD_NEEDS_SURFACE } });
  }
}

/**
 * A draft edited with the rights tick records the confirmation again on the version on sale
 * (version 1 of a listing made before versions gets its row then, from the listing's own columns).
 */
export async function confirmRightsAgain(trx: Knex.Transaction, actor: Actor, row: ListingRow, patch: ListingPatchInput): Promise<void> {
  const confirmation = { ...rightsConfirmation(actor), ships_surface: patch.shipsSurface ?? row.ships_surface };
  const updated = await trx('listing_versions').where({ listing_id: row.id, number: row.current_version }).whereNot({ review: 'rejected' }).update(confirmation);
  if (updated > 0) return;
  await trx('listing_versions').insert({
    listing_id: row.id,
    number: row.current_version,
    review: 'listing',
    groom_id: row.groom_id,
    groom_version_id: row.groom_version_id,
    groom_name: row.groom_name,
    version_number: row.version_number,
    version_name: row.version_name,
    spec: JSON.stringify(row.spec),
    surface_key: row.surface_key,
    surface_file_name: row.surface_file_name,
    roots_surface_key: row.roots_surface_key,
    roots_surface_file_name: row.roots_surface_file_name,
    description: patch.description ?? row.description,
    formats: patch.formats ?? row.formats,
    ...confirmation,
  });
}
