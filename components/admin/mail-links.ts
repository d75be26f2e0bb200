// The links in a caught e-mail's plain text, so the admins' outgoing-mail page can show them as
// links (the mail's own HTML twin does the same with the same rule: lib/market/mail.ts).

export type MailPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

/** An http(s) address up to the next white space; a full stop, comma or bracket closing the sentence is left out. */
const ADDRESS = /https?:\/\/[^\s<>"]+/g;
const TRAILING = /[.,;:!?)\]»”’]+$/;

/**
 * The text cut into plain parts and links. Guarantees: joining the parts' text and hrefs gives the
 * text back unchanged; only http: and https: addresses become links (never javascript: or data:).
 */
export function mailParts(text: string): MailPart[] {
  const parts: MailPart[] = [];
  let at = 0;
  for (const match of text.matchAll(ADDRESS)) {
    const href = match[0].replace(TRAILING, '');
    if (match.index > at) parts.push({ kind: 'text', text: text.slice(at, match.index) });
    parts.push({ kind: 'link', href });
    at = match.index + href.length;
  }
  if (at < text.length) parts.push({ kind: 'text', text: text.slice(at) });
  return parts;
}
