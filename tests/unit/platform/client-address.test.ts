// Whose address the per-client limits count: X-Forwarded-For is believed only as far as the
// proxies named in TRUSTED_PROXIES wrote it (read from the right, as MDN's X-Forwarded-For page
// describes for a known set of trusted proxies).
import { describe, expect, it } from 'vitest';
import { clientAddressOf } from '@/lib/accounts/client-address';

describe('clientAddressOf', () => {
  it('believes nothing when no proxy is trusted (the default)', () => {
    expect(clientAddressOf(new Headers({ 'x-forwarded-for': '203.0.113.7' }), [])).toBeNull();
    expect(clientAddressOf({ 'x-forwarded-for': '203.0.113.7', 'x-real-ip': '203.0.113.8' }, [])).toBeNull();
  });

  it('takes the entry the trusted proxy appended, not what the client wrote before it', () => {
    const proxies = ['10.0.0.5'];
    // The client forged "198.51.100.1"; the proxy appended the address it saw.
    expect(clientAddressOf(new Headers({ 'x-forwarded-for': '198.51.100.1, 203.0.113.7' }), proxies)).toBe('203.0.113.7');
    expect(clientAddressOf({ 'x-forwarded-for': ['198.51.100.1', '203.0.113.7'] }, proxies)).toBe('203.0.113.7');
  });

  it('skips a chain of trusted proxies, and knows nothing when only proxies are listed', () => {
    const proxies = ['10.0.0.5', '10.0.0.6'];
    expect(clientAddressOf(new Headers({ 'x-forwarded-for': '198.51.100.1, 203.0.113.7, 10.0.0.6' }), proxies)).toBe('203.0.113.7');
    expect(clientAddressOf(new Headers({ 'x-forwarded-for': '10.0.0.6' }), proxies)).toBeNull();
    expect(clientAddressOf(new Headers(), proxies)).toBeNull();
    expect(clientAddressOf(undefined, proxies)).toBeNull();
  });
});
