// The seller's rights on a listing and on each new version of it: the tick that they own or may
// publish the work and the character surface it shows (required; its words are lib/market/rights.ts,
// stored with the version), and the tick that puts the growth surface in the package.
import { z } from 'zod';
import { RIGHTS_WORDING, SURFACE_WORDING } from '@/lib/market/rights';
import { listingVersionSchema } from '@/lib/market/validation';

const tick = z
  .string()
  .optional()
  .transform((value) => value === 'on');

/** The two ticks as the form reads them (a checkbox sends "on" or nothing), checked by the route's own rules. */
export const rightsFormFields = {
  rightsConfirmed: tick.pipe(listingVersionSchema.shape.rightsConfirmed),
  shipsSurface: tick,
};

export function RightsFields({ defaultShipsSurface, error, surfaceError }: { defaultShipsSurface: boolean; error?: string; surfaceError?: string }) {
  return (
    <fieldset className="flex flex-col gap-3" aria-describedby={error ? 'rights-error' : undefined}>
      <legend className="pb-2 text-lg font-bold">Your rights</legend>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" name="rightsConfirmed" aria-invalid={error ? true : undefined} className="mt-1 accent-bracken" />
        <span>{RIGHTS_WORDING.text}</span>
      </label>
      {error && (
        <p id="rights-error" className="text-sm font-medium text-hawthorn" data-field-error="rightsConfirmed">
          {error}
        </p>
      )}
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" name="shipsSurface" defaultChecked={defaultShipsSurface} className="mt-1 accent-bracken" />
        <span>{SURFACE_WORDING}</span>
      </label>
      {surfaceError && <p className="text-sm font-medium text-hawthorn">{surfaceError}</p>}
      <p className="text-sm text-loam-soft">
        Without the surface, buyers get the guides (with where each grows: polygon and barycentric position), the groom spec and the
        pictures; the field file needs the surface ticked, since it holds the whole surface.
      </p>
    </fieldset>
  );
}
