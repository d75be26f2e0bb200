// File names made from names people type, safe on any system and in any archive.

/**
 * "Bramble — autumn coat" → "bramble-autumn-coat": lower-case ASCII letters, digits and single
 * dashes (accents dropped, everything else a dash), at most `maxLength` characters, never starting
 * or ending with a dash; `fallback` when nothing of the name is left.
 */
export function fileSlug(name: string, maxLength: number, fallback: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, maxLength)
    .replace(/-+$/, '');
  return slug || fallback;
}
