// The headers next.config.ts sends with every answer; that the app works under them is shown by
// the browser suites, which run against a build with these headers.
import { describe, expect, it } from 'vitest';
import config, { contentSecurityPolicy } from '@/next.config';

function directives(policy: string): Map<string, string[]> {
  return new Map(policy.split(';').map((part) => part.trim().split(/\s+/)).map(([name, ...values]) => [name, values]));
}

describe('security headers', () => {
  it('are sent for every path', async () => {
    const rules = await config.headers!();
    expect(rules).toHaveLength(1);
    expect(rules[0].source).toBe('/:path*');
    const headers = Object.fromEntries(rules[0].headers.map(({ key, value }) => [key, value]));
    expect(Object.keys(headers).sort()).toEqual(
      ['Content-Security-Policy', 'Permissions-Policy', 'Referrer-Policy', 'X-Content-Type-Options', 'X-Frame-Options'].sort(),
    );
    expect(headers['X-Frame-Options']).toBe('DENY');
    expect(headers['X-Content-Type-Options']).toBe('nosniff');
    expect(headers['Referrer-Policy']).toBe('strict-origin-when-cross-origin');
    expect(headers['Permissions-Policy']).toMatch(/camera=\(\)/);
  });

  it('forbid framing, plugins and eval, and allow the object store and the field worker', () => {
    const policy = directives(contentSecurityPolicy({ S3_ENDPOINT: 'http://127.0.0.1:54331' }, false));
    expect(policy.get('frame-ancestors')).toEqual(["'none'"]);
    expect(policy.get('object-src')).toEqual(["'none'"]);
    expect(policy.get('default-src')).toEqual(["'self'"]);
    expect(policy.get('script-src')).not.toContain("'unsafe-eval'");
    expect(policy.get('worker-src')).toEqual(["'self'", 'blob:']);
    expect(policy.get('img-src')).toContain('http://127.0.0.1:54331');
    expect(policy.get('connect-src')).toContain('http://127.0.0.1:54331');
  });

  it("name the provider's endpoints when no S3 endpoint is set, and allow eval only under next dev", () => {
    const policy = directives(contentSecurityPolicy({ S3_REGION: 'eu-west-1', S3_BUCKET: 'coats' }, true));
    expect(policy.get('connect-src')).toEqual(expect.arrayContaining(['https://s3.eu-west-1.amazonaws.com', 'https://coats.s3.eu-west-1.amazonaws.com']));
    expect(policy.get('script-src')).toContain("'unsafe-eval'");
  });
});
