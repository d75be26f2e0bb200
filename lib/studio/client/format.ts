// Words and figures for the studio's lists.

/**
 * The day of an instant in a time zone ("1 Jan 2026"; the same instant is 2 Jan in Auckland).
 * Made per call: a format kept from module load would keep the zone of that moment.
 */
function dayIn(timeZone: string | undefined, instant: number): string {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeZone }).format(new Date(instant));
}

/**
 * "just now", "4 minutes ago", "3 hours ago", "yesterday", "5 days ago", then the date: the day
 * it was in `timeZone` (an IANA name), by default the viewer's own — the lists are read by the
 * person in front of them, whose "yesterday" and dates are their own calendar's.
 */
export function timeAgo(iso: string, now = Date.now(), timeZone?: string): string {
  const then = new Date(iso).getTime();
  if (!Number.isFinite(then)) return '';
  const seconds = Math.max(0, Math.round((now - then) / 1000));
  if (seconds < 45) return 'just now';
  const minutes = Math.round(seconds / 60);
  if (minutes < 60) return `${minutes} minute${minutes === 1 ? '' : 's'} ago`;
  const hours = Math.round(minutes / 60);
  if (hours < 24) return `${hours} hour${hours === 1 ? '' : 's'} ago`;
  const days = Math.round(hours / 24);
  if (days === 1) return 'yesterday';
  if (days < 14) return `${days} days ago`;
  return dayIn(timeZone, then);
}

/** A surface's name from its file name: "bramble_head-v3.obj" → "bramble head v3". */
export function nameFromFile(fileName: string): string {
  const base = fileName.replace(/\.[^.]+$/, '').replace(/[_-]+/g, ' ').trim();
  return base.slice(0, 200) || 'Growth surface';
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}
