// The client's network address, for the per-client limits of sign-in and of the account mail.
// X-Forwarded-For is written by whoever sends the request, so it is believed only as far as
// proxies the operator named in TRUSTED_PROXIES appended to it: read from the right, entries
// written by a trusted proxy are skipped and the first other one is the client (the reading
// MDN's X-Forwarded-For page gives for a known set of proxies). With no trusted proxy (the
// default) the address is unknown: Next.js gives route handlers no socket address, and it keeps an
// X-Forwarded-For the client sent itself, so nothing there can be believed.
import { env } from '../platform/env';

type HeaderSource = Headers | Record<string, string | string[] | undefined> | undefined;

function headerValues(headers: HeaderSource, name: string): string[] {
  if (!headers) return [];
  if (headers instanceof Headers) {
    const value = headers.get(name);
    return value === null ? [] : [value];
  }
  const value = headers[name];
  return value === undefined ? [] : Array.isArray(value) ? value : [value];
}

/** The client's address as the trusted proxies reported it, or null when it cannot be known. */
export function clientAddressOf(headers: HeaderSource, trustedProxies: readonly string[] = env().TRUSTED_PROXIES): string | null {
  if (trustedProxies.length === 0) return null;
  const hops = headerValues(headers, 'x-forwarded-for')
    .flatMap((value) => value.split(','))
    .map((hop) => hop.trim())
    .filter((hop) => hop !== '');
  for (let index = hops.length - 1; index >= 0; index -= 1) {
    if (!trustedProxies.includes(hops[index])) return hops[index];
  }
  return null;
}
