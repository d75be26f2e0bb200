/** Where to go after signing in: only paths on this site, so a link cannot send people away. */
export function safeCallbackPath(value: string | string[] | undefined): string {
  const candidate = Array.isArray(value) ? value[0] : value;
  if (!candidate || !candidate.startsWith('/') || candidate.startsWith('//') || candidate.startsWith('/\\')) return '/';
  return candidate;
}
