// Where to go after signing in: only places on this site, so a link cannot send people away.
//
// The check parses the value the way the browser will (the WHATWG URL standard's basic URL
// parser, https://url.spec.whatwg.org/#concept-basic-url-parser): it strips leading and trailing
// C0 controls and spaces and every tab and newline inside, and for special schemes such as http
// reads "\" as "/". So "/\t/evil.example/" is "//evil.example/", another host, although it does
// not start with "//" as written. Comparing prefixes of the raw text cannot know all of that;
// resolving it against the site's origin and comparing origins can.

// Stands for the site when its origin is not given: a relative value resolves onto any base the
// same way, so only whether it stays on that base matters. (.invalid is reserved, RFC 2606.)
const PLACEHOLDER_ORIGIN = 'http://this-site.invalid';

/**
 * The path (with query and fragment) to go to after signing in, or "/" when the value would
 * leave the site. `siteOrigin` (e.g. "https://whorlwind.example") also admits absolute URLs on it.
 */
export function safeCallbackPath(value: string | string[] | undefined, siteOrigin: string = PLACEHOLDER_ORIGIN): string {
  const candidate = Array.isArray(value) ? value[0] : value;
  if (!candidate) return '/';
  let url: URL;
  try {
    url = new URL(candidate, siteOrigin);
  } catch {
    return '/';
  }
  if (url.origin !== new URL(siteOrigin).origin) return '/';
  // What is handed on is the parsed form, so the browser reads exactly what was checked; a path
  // that parses to start with "//" (e.g. from "/.//evil.example") would be read as another host.
  const path = `${url.pathname}${url.search}${url.hash}`;
  if (path.startsWith('//')) return '/';
  return path;
}
