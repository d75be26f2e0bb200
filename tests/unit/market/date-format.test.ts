// The pages' one date format: dates, dates with times and typed dates agree. Expected strings are
// the en-GB "medium" date style of the Unicode CLDR data that Node's Intl ships ("5 Dec 2026").
import { describe, expect, it } from 'vitest';
import { formatDate, formatDateTime, parseDay } from '@/components/market/format';

describe('the pages’ date format', () => {
  it('shows a day, and a moment late in a UTC day, on the same day', () => {
    expect(formatDate('2026-12-05')).toBe('5 Dec 2026');
    expect(formatDate('2026-12-05T23:30:00Z')).toBe('5 Dec 2026');
    expect(formatDateTime('2026-12-05T23:30:00Z')).toBe('5 Dec 2026, 23:30 UTC');
  });

  it('reads back what it shows, and YYYY-MM-DD', () => {
    for (const day of ['2026-01-01', '2026-02-28', '2028-02-29', '2026-12-31']) expect(parseDay(formatDate(day))).toBe(day);
    expect(parseDay('2026-12-05')).toBe('2026-12-05');
    expect(parseDay(' 5 december 2026 ')).toBe('2026-12-05');
  });

  it('refuses what is not a day of the calendar', () => {
    for (const text of ['', '31 Feb 2026', '2026-13-01', '5 Dex 2026', '12/05/2026', 'yesterday']) expect(parseDay(text), text).toBeNull();
  });
});
