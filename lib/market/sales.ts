// A seller's figures: revenue, the market's fee, refunds, net, units and downloads — in total,
// per period (day, week or month, UTC) and per listing, each per currency; the same as CSV; the
// balance as it is (payouts.ts, which also makes the payouts).
//
// A sale counts on the day it was paid, a refund on the day it was refunded (so a period's net
// can be negative). The fee is kept on sales and given back on refunds:
//   net = revenue − refunds − (fee on sales − fee on refunds).
import { db } from '../platform/db';
import { env } from '../platform/env';
import { balances, payoutHoldDays } from './payouts';
import type { Actor } from '../accounts/actor';
import type { SalesFigures, SalesReport } from './types';
import type { SalesQuery } from './validation';
import { TAX_NOTE, type Currency } from './vocabulary';

type Raw = {
  period: string;
  listing_id: string;
  title: string;
  currency: Currency;
  units: string;
  revenue: string;
  fee: string;
  refunds: string;
  refund_cents: string;
  fee_returned: string;
  downloads: string;
};

const zero = (currency: Currency): SalesFigures => ({
  currency,
  revenueCents: 0,
  refundCents: 0,
  platformFeeCents: 0,
  netCents: 0,
  units: 0,
  refunds: 0,
  downloads: 0,
});

function add(into: SalesFigures, row: Raw) {
  const revenue = Number(row.revenue);
  const refundCents = Number(row.refund_cents);
  const fee = Number(row.fee) - Number(row.fee_returned);
  into.revenueCents += revenue;
  into.refundCents += refundCents;
  into.platformFeeCents += fee;
  into.netCents += revenue - refundCents - fee;
  into.units += Number(row.units);
  into.refunds += Number(row.refunds);
  into.downloads += Number(row.downloads);
}

const isoDay = (date: Date) => date.toISOString().slice(0, 10);

function range(query: SalesQuery): { from: string; to: string } {
  const to = query.to ?? isoDay(new Date());
  const from = query.from ?? isoDay(new Date(Date.parse(`${to}T00:00:00Z`) - 29 * 86_400_000));
  return { from, to };
}

/** Sales, refunds and downloads of the period in one pass, grouped by period, listing and currency. */
async function figureRows(sellerId: string, from: string, to: string, bucket: SalesQuery['bucket']): Promise<Raw[]> {
  const start = `${from}T00:00:00Z`;
  const end = new Date(Date.parse(`${to}T00:00:00Z`) + 86_400_000).toISOString();
  const { rows } = await db().raw<{ rows: Raw[] }>(
    `SELECT to_char(date_trunc(?, t.at AT TIME ZONE 'UTC'), 'YYYY-MM-DD') AS period, t.listing_id, l.title, t.currency,
            sum(t.units) AS units, sum(t.revenue) AS revenue, sum(t.fee) AS fee, sum(t.refunds) AS refunds,
            sum(t.refund_cents) AS refund_cents, sum(t.fee_returned) AS fee_returned, sum(t.downloads) AS downloads
       FROM (
         SELECT p.created_at AS at, p.listing_id, p.currency, 1 AS units, p.amount_cents AS revenue, p.platform_fee_cents AS fee,
                0 AS refunds, 0 AS refund_cents, 0 AS fee_returned, 0 AS downloads
           FROM purchases p WHERE p.seller_id = ? AND p.created_at >= ? AND p.created_at < ?
         UNION ALL
         SELECT p.refunded_at, p.listing_id, p.currency, 0, 0, 0, 1, p.amount_cents, p.platform_fee_cents, 0
           FROM purchases p WHERE p.seller_id = ? AND p.status = 'refunded' AND p.refunded_at >= ? AND p.refunded_at < ?
         UNION ALL
         SELECT d.created_at, d.listing_id, l.currency, 0, 0, 0, 0, 0, 0, 1
           FROM downloads d JOIN listings l ON l.id = d.listing_id
          WHERE l.seller_id = ? AND d.created_at >= ? AND d.created_at < ?
       ) t JOIN listings l ON l.id = t.listing_id
      GROUP BY 1, 2, 3, 4
      ORDER BY 1, 3`,
    [bucket, sellerId, start, end, sellerId, start, end, sellerId, start, end],
  );
  return rows;
}

export async function salesReport(actor: Actor, query: SalesQuery): Promise<SalesReport> {
  const { from, to } = range(query);
  const seller = actor.userId;
  const [rows, listings, balance] = await Promise.all([
    figureRows(seller, from, to, query.bucket),
    db()('listings').where({ seller_id: seller }).orderBy('created_at', 'desc').select('id', 'title', 'currency'),
    balances(seller),
  ]);
  const totals = new Map<Currency, SalesFigures>();
  const series = new Map<string, SalesFigures & { periodStart: string }>();
  const perListing = new Map<string, SalesFigures & { listingId: string; title: string }>();
  for (const listing of listings) perListing.set(listing.id, { ...zero(listing.currency), listingId: listing.id, title: listing.title });
  for (const row of rows) {
    if (!totals.has(row.currency)) totals.set(row.currency, zero(row.currency));
    add(totals.get(row.currency)!, row);
    const key = `${row.period}|${row.currency}`;
    if (!series.has(key)) series.set(key, { ...zero(row.currency), periodStart: row.period });
    add(series.get(key)!, row);
    const listing = perListing.get(row.listing_id);
    if (listing) add(listing, row);
  }
  return {
    from,
    to,
    bucket: query.bucket,
    feePercent: env().MARKET_PLATFORM_FEE_PERCENT,
    totals: [...totals.values()],
    series: [...series.values()].sort((a, b) => a.periodStart.localeCompare(b.periodStart) || a.currency.localeCompare(b.currency)),
    listings: [...perListing.values()],
    balance,
    payoutHoldDays: payoutHoldDays(),
    taxNote: TAX_NOTE,
  };
}

const csvCell = (value: string | number) => {
  const text = String(value);
  // Quote when needed; a leading = + - @ would be read as a formula by spreadsheets.
  const safe = /^[=+\-@\t\r]/.test(text) && typeof value === 'string' ? `'${text}` : text;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};
const money = (cents: number) => (cents / 100).toFixed(2);

/** U+FEFF, which UTF-8 writes as the bytes EF BB BF. */
export const UTF8_BOM = '\uFEFF';

/** The figures as CSV, starting with a UTF-8 byte-order mark: one row per period, listing and currency, then a total per currency; amounts in currency units. */
export async function salesCsv(actor: Actor, query: SalesQuery): Promise<{ fileName: string; text: string }> {
  const { from, to } = range(query);
  const rows = await figureRows(actor.userId, from, to, query.bucket);
  const header = ['period_start', 'listing_id', 'listing_title', 'currency', 'units', 'revenue', 'refunds', 'refunded_amount', 'platform_fee', 'net', 'downloads'];
  const lines = [header.join(',')];
  const totals = new Map<Currency, SalesFigures>();
  const line = (period: string, listingId: string, title: string, f: SalesFigures) =>
    [period, listingId, title, f.currency.toUpperCase(), f.units, money(f.revenueCents), f.refunds, money(f.refundCents), money(f.platformFeeCents), money(f.netCents), f.downloads]
      .map(csvCell)
      .join(',');
  for (const row of rows) {
    const figures = zero(row.currency);
    add(figures, row);
    if (!totals.has(row.currency)) totals.set(row.currency, zero(row.currency));
    add(totals.get(row.currency)!, row);
    lines.push(line(row.period, row.listing_id, row.title, figures));
  }
  for (const total of totals.values()) lines.push(line('total', '', '', total));
  // A UTF-8 byte-order mark first: spreadsheet programs read a CSV without one in a legacy code
  // page, garbling titles such as “Brisquette — velours”.
  return { fileName: `whorlwind-sales-${from}-to-${to}.csv`, text: `${UTF8_BOM}${lines.join('\r\n')}\r\n` };
}
