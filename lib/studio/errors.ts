// The studio's wording of its failures: ids of other groomers are answered like missing ones, in
// the studio's own words. The failures themselves are HttpErrors (lib/http/errors.ts).
import { HttpError } from '../http/errors';

export type StudioThing = 'upload' | 'surface' | 'groom' | 'version' | 'export';

/** Not there, or another groomer's: the answer is the same, so ids of others are not confirmed. */
export function notFound(thing: StudioThing): HttpError {
  return new HttpError(404, 'not-found', `There is no such ${thing} in your studio.`);
}
