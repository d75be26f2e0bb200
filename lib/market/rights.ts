// The seller's confirmation of their rights, asked on every listing and on each new version of
// one, and the tick that lets the package carry the growth surface. Plain words shared by the
// form, the route handlers and the stored record: each confirmation stores the wording version
// it was given under, so a change of wording gets a new version here and old records keep theirs.

/** The wording of the rights tick; change `version` with the text. */
export const RIGHTS_WORDING = {
  version: 'rights-2026-12-08',
  text:
    'I own this groom and the character surface its pictures, preview and package show, or I have the right to publish them. ' +
    'A client’s or an employer’s character may be confidential: I have checked that this one may be shown and sold. ' +
    'The field file (field.ply) holds the whole growth surface.',
} as const;

/** The tick that puts the seller's growth surface in the package. */
export const SURFACE_WORDING =
  'Ship my growth surface in the package: its source file, and the guides’ files with the surface and the binding data. ' +
  'I may publish this surface.';

/** Said when the rights tick is missing (API and form alike). */
export const RIGHTS_REFUSED = 'Confirm that you own or may publish this work and the character surface it shows: without that, it cannot be listed.';

/** Said when the field file is asked for without the surface: the field file holds the whole surface. */
export const FIELD_NEEDS_SURFACE =
  'The field file holds the whole growth surface: include it only together with the surface (tick that you may publish the surface).';

/** The export format that carries the whole surface whatever the options. */
export const SURFACE_CARRYING_FORMAT = 'ply';
