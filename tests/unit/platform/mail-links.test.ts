// The admins' outgoing-mail page shows a mail's addresses as links: the cut is lossless and only
// http(s) addresses become links (WHATWG URL schemes; trailing sentence punctuation is prose).
import { describe, expect, it } from 'vitest';
import { mailParts, type MailPart } from '@/components/admin/mail-links';

const joined = (parts: MailPart[]) => parts.map((part) => (part.kind === 'link' ? part.href : part.text)).join('');

describe('links in a caught mail', () => {
  it('finds the confirmation link of a sign-up mail and keeps the text around it', () => {
    const text = 'Confirm your address: http://127.0.0.1:3000/verify-email?token=abc_DEF-123.\n\nThanks.';
    const parts = mailParts(text);
    expect(parts.filter((part) => part.kind === 'link')).toEqual([{ kind: 'link', href: 'http://127.0.0.1:3000/verify-email?token=abc_DEF-123' }]);
    expect(joined(parts)).toBe(text);
  });

  it('finds several links, and none in plain text or other schemes', () => {
    const text = 'See https://a.example/x (and https://b.example/y), not javascript:alert(1) or data:text/html,hi';
    expect(mailParts(text).filter((part) => part.kind === 'link').map((part) => (part as { href: string }).href)).toEqual(['https://a.example/x', 'https://b.example/y']);
    expect(joined(mailParts(text))).toBe(text);
    expect(mailParts('No links here.')).toEqual([{ kind: 'text', text: 'No links here.' }]);
  });
});
