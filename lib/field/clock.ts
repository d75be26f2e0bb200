/**
 * The field engine's one clock, for the timings it reports (setup seconds, solve milliseconds).
 * The same code runs in a Web Worker, in a browser tab and on the server, so it takes the
 * monotonic high-resolution clock where there is one and the wall clock otherwise.
 */

/** Milliseconds from an arbitrary origin: `performance.now()` where available, else `Date.now()`. Only differences mean anything. */
export const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());
