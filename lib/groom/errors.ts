/**
 * A groom that cannot be made as asked: a spec that does not fit the surface, a region that
 * does not exist, a file that cannot be written. `code` is stable for programs; `message` names
 * what is wrong in words a groomer can act on.
 */
export class GroomError extends Error {
  constructor(
    /** Stable machine-readable reason, e.g. `invalid-spec`, `unknown-region`. */
    readonly code: string,
    message: string,
    /** Where in the groom spec the problem is, as a dotted path (`guides.density`), when it is in the spec. */
    readonly path?: string,
  ) {
    super(message);
    this.name = 'GroomError';
  }
}
