/**
 * How the field engine says no: one error class whose stable code a caller can branch on and whose
 * message a groomer can read, used alike for a surface it cannot work with and a request it
 * cannot satisfy.
 */

/** A problem in a surface that the field engine cannot work with, or a request it cannot satisfy. */
export class FieldError extends Error {
  constructor(
    /** Stable machine-readable reason, e.g. `non-manifold-edge`, `index-budget`. */
    readonly code: string,
    message: string,
  ) {
    super(message);
    this.name = 'FieldError';
  }
}

/** Lists up to `limit` items of a list for an error message: "3, 17, 20 and 12 more". */
export function describeFirst(items: ArrayLike<number | string>, limit = 5): string {
  const shown: string[] = [];
  for (let i = 0; i < Math.min(limit, items.length); i++) shown.push(String(items[i]));
  const rest = items.length - shown.length;
  return rest > 0 ? `${shown.join(', ')} and ${rest} more` : shown.join(', ');
}
