// Dates as the market, sales, library and admin pages show them (prices: formatPrice of
// lib/market/vocabulary, always with the currency). One format everywhere, in UTC — the day a sale
// counts in the figures — so a date, a date with its time, and a date typed into a field read the
// same, and the server's copy of a page matches the browser's.
const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeZone: 'UTC' });
const dateTimeFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' });

/** "5 Dec 2026". A YYYY-MM-DD day is read as that day. */
export function formatDate(value: string | Date): string {
  return dateFormat.format(typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value) ? new Date(`${value}T00:00:00Z`) : new Date(value));
}

/** "5 Dec 2026, 14:03 UTC". */
export function formatDateTime(value: string | Date): string {
  return `${dateTimeFormat.format(new Date(value))} UTC`;
}

const MONTHS = ['jan', 'feb', 'mar', 'apr', 'may', 'jun', 'jul', 'aug', 'sep', 'oct', 'nov', 'dec'];

/**
 * The YYYY-MM-DD day of a date typed as the pages show them ("5 Dec 2026", any case, a full month
 * name too) or as YYYY-MM-DD; null for anything else or a day the calendar does not have.
 */
export function parseDay(text: string): string | null {
  const value = text.trim();
  let year: number, month: number, day: number;
  const iso = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(value);
  const shown = /^(\d{1,2})\s+([A-Za-z]{3,9})\.?\s+(\d{4})$/.exec(value);
  if (iso) {
    [year, month, day] = [Number(iso[1]), Number(iso[2]), Number(iso[3])];
  } else if (shown) {
    const index = MONTHS.indexOf(shown[2].slice(0, 3).toLowerCase());
    if (index < 0) return null;
    [year, month, day] = [Number(shown[3]), index + 1, Number(shown[1])];
  } else {
    return null;
  }
  const date = new Date(Date.UTC(year, month - 1, day));
  if (date.getUTCFullYear() !== year || date.getUTCMonth() !== month - 1 || date.getUTCDate() !== day) return null;
  return date.toISOString().slice(0, 10);
}
