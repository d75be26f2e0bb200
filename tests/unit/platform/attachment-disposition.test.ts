// The one Content-Disposition of downloads: plain names stay as they were, other names get an
// ASCII fallback and their exact UTF-8 form (RFC 6266 / RFC 5987).
import { describe, expect, it } from 'vitest';
import { attachmentDisposition } from '@/lib/platform/storage';
import { escapeHtml } from '@/lib/platform/html';

describe('attachmentDisposition', () => {
  it('quotes a plain ASCII name alone', () => {
    expect(attachmentDisposition('loop-ring.obj')).toBe('attachment; filename="loop-ring.obj"');
  });

  it('adds the exact name as filename* when the ASCII fallback differs', () => {
    expect(attachmentDisposition('Réglage d’été.zip')).toBe(
      `attachment; filename="Reglage d_ete.zip"; filename*=UTF-8''R%C3%A9glage%20d%E2%80%99%C3%A9t%C3%A9.zip`,
    );
  });

  it('never lets quotes, backslashes or line breaks end the header value', () => {
    const header = attachmentDisposition('a"b\\c\r\nd (1)*\'.txt');
    expect(header).toBe(`attachment; filename="a_b_c__d (1)*'.txt"; filename*=UTF-8''a%22b%5Cc%0D%0Ad%20%281%29%2A%27.txt`);
    expect(header).not.toMatch(/[\r\n]/);
  });
});

describe('escapeHtml', () => {
  it('turns the five special characters into entities', () => {
    expect(escapeHtml(`<a href="x">Tom & Jerry's</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;Tom &amp; Jerry&#39;s&lt;/a&gt;');
  });
});
