// The periods of a sales report (UTC days; weeks from Monday, as PostgreSQL's date_trunc
// counts them; months), so a chart shows the quiet ones too.
import type { SalesBucket } from '@/lib/market/vocabulary';

const DAY = 86_400_000;

function startOf(date: Date, bucket: SalesBucket): Date {
  const day = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
  if (bucket === 'week') return new Date(day.getTime() - ((day.getUTCDay() + 6) % 7) * DAY);
  if (bucket === 'month') return new Date(Date.UTC(day.getUTCFullYear(), day.getUTCMonth(), 1));
  return day;
}

function next(date: Date, bucket: SalesBucket): Date {
  if (bucket === 'month') return new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth() + 1, 1));
  return new Date(date.getTime() + (bucket === 'week' ? 7 : 1) * DAY);
}

/** The start (YYYY-MM-DD) of every period that overlaps from…to, both days included. */
export function periodStarts(from: string, to: string, bucket: SalesBucket, limit = 400): string[] {
  const end = Date.parse(`${to}T00:00:00Z`);
  const starts: string[] = [];
  for (let at = startOf(new Date(`${from}T00:00:00Z`), bucket); at.getTime() <= end && starts.length < limit; at = next(at, bucket)) {
    starts.push(at.toISOString().slice(0, 10));
  }
  return starts;
}

const dayLabel = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' });
const monthLabel = new Intl.DateTimeFormat('en-GB', { month: 'short', year: 'numeric', timeZone: 'UTC' });

export function periodLabel(start: string, bucket: SalesBucket): string {
  const date = new Date(`${start}T00:00:00Z`);
  if (bucket === 'month') return monthLabel.format(date);
  return bucket === 'week' ? `wk ${dayLabel.format(date)}` : dayLabel.format(date);
}

export function isoDay(date: Date): string {
  return date.toISOString().slice(0, 10);
}

export function daysBefore(day: string, days: number): string {
  return isoDay(new Date(Date.parse(`${day}T00:00:00Z`) - days * DAY));
}
