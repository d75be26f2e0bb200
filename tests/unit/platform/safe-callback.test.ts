// Where sign-in sends people afterwards. The shapes below are the ones the WHATWG URL standard's
// parsing of special schemes (https://url.spec.whatwg.org/#concept-basic-url-parser) turns into
// another host although they look like paths: tabs and newlines are removed anywhere, leading C0
// controls and spaces are trimmed, and "\" counts as "/" for http and https.
import { describe, expect, it } from 'vitest';
import { safeCallbackPath } from '@/lib/accounts/safe-callback';

const SITE = 'https://whorlwind.example';

const LEAVING = [
  '/\t/evil.example/', // the reported one: /%09/evil.example/ once the query is decoded
  '/\n/evil.example/',
  '/\r/evil.example',
  '\t//evil.example',
  ' //evil.example',
  '\u0000//evil.example',
  '//evil.example',
  '///evil.example',
  '/\\evil.example',
  '\\\\evil.example',
  '\\/evil.example',
  '/\\/evil.example',
  '/.//evil.example',
  'https://evil.example/',
  'HTTPS://evil.example',
  'http://whorlwind.example.evil.example/',
  'https://whorlwind.example@evil.example/',
  'javascript:alert(1)',
  'java\tscript:alert(1)',
  'data:text/html,<script>alert(1)</script>',
];

describe('safeCallbackPath', () => {
  it('keeps paths on the site, with their query and fragment', () => {
    expect(safeCallbackPath('/studio')).toBe('/studio');
    expect(safeCallbackPath('/market/3?tab=reviews#top')).toBe('/market/3?tab=reviews#top');
    expect(safeCallbackPath(['/library', '/admin'])).toBe('/library');
    expect(safeCallbackPath(undefined)).toBe('/');
    expect(safeCallbackPath('')).toBe('/');
    expect(safeCallbackPath(`${SITE}/sales`, SITE)).toBe('/sales');
  });

  it.each(LEAVING)('sends %j home instead of away', (shape) => {
    expect(safeCallbackPath(shape)).toBe('/');
    expect(safeCallbackPath(shape, SITE)).toBe('/');
  });

  it('gives only values that the browser resolves onto the site', () => {
    for (const shape of [...LEAVING, '/studio', '/a/../b', '/%2F%2Fevil.example', '/%09/evil.example/']) {
      const path = safeCallbackPath(shape, SITE);
      // What window.location.assign does with it: the same WHATWG parser, in Node and in browsers.
      expect(new URL(path, SITE).origin, `${JSON.stringify(shape)} → ${path}`).toBe(SITE);
    }
  });
});
