// Text put into HTML by the server: the HTML twins of e-mails and the payments fake's hosted page.
// Plain TypeScript without dependencies, so the local stand-ins may import it too.

const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** The text with `& < > " '` as entities: safe between tags and inside quoted attribute values. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (character) => ENTITIES[character]!);
}
