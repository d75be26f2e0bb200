'use client';
// A seller's figures for a period: totals (revenue, the market's fee, refunds, net, units,
// downloads), a chart per day, week or month, a table per listing that sorts by any column, and
// the same figures as CSV. Money stays in its own currency; a seller paid in several sees one at
// a time.
import { useMemo, useState } from 'react';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import type { SalesFigures, SalesResponse } from '@/lib/market/types';
import { salesQuerySchema } from '@/lib/market/validation';
import { formatPrice, SALES_BUCKETS, type Currency, type SalesBucket } from '@/lib/market/vocabulary';
import { formatDate, parseDay } from '@/components/market/format';
import { BarChart } from './BarChart';
import { daysBefore, isoDay, periodLabel, periodStarts } from './periods';

type Range = { from: string; to: string; bucket: SalesBucket };

const BUCKET_LABELS: Record<SalesBucket, string> = { day: 'Per day', week: 'Per week', month: 'Per month' };

type MetricKey = 'netCents' | 'revenueCents' | 'units' | 'downloads' | 'refunds';
const METRICS: { key: MetricKey; label: string; money: boolean }[] = [
  { key: 'netCents', label: 'Net', money: true },
  { key: 'revenueCents', label: 'Revenue', money: true },
  { key: 'units', label: 'Units sold', money: false },
  { key: 'downloads', label: 'Downloads', money: false },
  { key: 'refunds', label: 'Refunds', money: false },
];

type ColumnKey = 'title' | 'units' | 'revenueCents' | 'refunds' | 'platformFeeCents' | 'netCents' | 'downloads';
const COLUMNS: { key: ColumnKey; label: string; money?: boolean }[] = [
  { key: 'title', label: 'Preset' },
  { key: 'units', label: 'Units' },
  { key: 'revenueCents', label: 'Revenue', money: true },
  { key: 'refunds', label: 'Refunds' },
  { key: 'platformFeeCents', label: 'Market fee', money: true },
  { key: 'netCents', label: 'Net', money: true },
  { key: 'downloads', label: 'Downloads' },
];

export function salesUrl(path: '/api/sales' | '/api/sales/export.csv', range: Range): string {
  return `${path}?${new URLSearchParams(range).toString()}`;
}

function presets(today: string): { label: string; range: Range }[] {
  return [
    { label: 'Last 30 days', range: { from: daysBefore(today, 29), to: today, bucket: 'day' } },
    { label: 'Last 12 weeks', range: { from: daysBefore(today, 7 * 12 - 1), to: today, bucket: 'week' } },
    { label: 'Last 12 months', range: { from: daysBefore(today, 364), to: today, bucket: 'month' } },
  ];
}

export function SalesDashboard({ initial }: { initial: SalesResponse }) {
  const [range, setRange] = useState<Range>({ from: initial.from, to: initial.to, bucket: initial.bucket });
  const key = salesUrl('/api/sales', range);
  const initialKey = salesUrl('/api/sales', { from: initial.from, to: initial.to, bucket: initial.bucket });
  // The server copy answers the page's own period; another period is read from the API.
  const { data, error, isValidating } = useServerSeededSWR<SalesResponse>(key, initial, { keepPreviousData: true }, initialKey);
  const report = data ?? initial;
  const currencies = useMemo(() => {
    const found = new Set<Currency>([...report.totals.map((t) => t.currency), ...report.listings.map((l) => l.currency)]);
    return [...found];
  }, [report]);
  const [chosenCurrency, setCurrency] = useState<Currency | null>(null);
  const currency = chosenCurrency && currencies.includes(chosenCurrency) ? chosenCurrency : (report.totals[0]?.currency ?? currencies[0] ?? 'eur');
  const [metric, setMetric] = useState<MetricKey>('netCents');

  return (
    <div className="flex flex-col gap-6">
      <RangeForm range={range} onChange={setRange} busy={isValidating} />
      {error && <Notice tone="error">{error.message}</Notice>}
      <div className="flex flex-wrap items-center justify-between gap-3">
        {currencies.length > 1 ? (
          <div role="group" aria-label="Currency" className="flex gap-1">
            {currencies.map((code) => (
              <button
                key={code}
                type="button"
                aria-pressed={code === currency}
                onClick={() => setCurrency(code)}
                className="rounded-full px-3 py-1 text-sm font-semibold text-tarn aria-pressed:bg-tarn aria-pressed:text-chalk"
              >
                {code.toUpperCase()}
              </button>
            ))}
          </div>
        ) : (
          <span />
        )}
        <a href={salesUrl('/api/sales/export.csv', range)} download className="text-sm font-semibold text-tarn" data-testid="sales-csv">
          Download these figures as CSV
        </a>
      </div>
      <Totals figures={report.totals.find((t) => t.currency === currency) ?? null} currency={currency} feePercent={report.feePercent} />
      <section aria-label="Over time" className="flex flex-col gap-3 rounded-3xl bg-white p-5 ring-2 ring-vellum">
        <div role="group" aria-label="Figure shown" className="flex flex-wrap gap-1">
          {METRICS.map((choice) => (
            <button
              key={choice.key}
              type="button"
              aria-pressed={choice.key === metric}
              onClick={() => setMetric(choice.key)}
              className="rounded-full px-3 py-1 text-sm font-semibold text-tarn aria-pressed:bg-bracken aria-pressed:text-chalk"
            >
              {choice.label}
            </button>
          ))}
        </div>
        <Chart report={report} currency={currency} metric={metric} />
      </section>
      <ListingTable rows={report.listings.filter((row) => row.currency === currency)} />
      <p className="text-sm text-loam-soft">{report.taxNote}</p>
    </div>
  );
}

// The period's days are typed as the page shows dates ("5 Dec 2026"; YYYY-MM-DD too), not in a
// browser date field, whose format follows the browser's language instead of the page's.
const dayField = (what: string) =>
  z
    .string()
    .optional()
    .transform((text, context) => {
      if (!text?.trim()) return undefined;
      const day = parseDay(text);
      if (!day) context.addIssue({ code: 'custom', message: `Give the ${what} day like ${formatDate(isoDay(new Date()))}.` });
      return day ?? undefined;
    });
const rangeFormSchema = z
  .object({ from: dayField('first'), to: dayField('last'), bucket: salesQuerySchema.shape.bucket })
  .refine((v) => !v.from || !v.to || v.from <= v.to, { path: ['to'], message: 'The end must not be before the start.' });

function RangeForm({ range, onChange, busy }: { range: Range; onChange: (range: Range) => void; busy: boolean }) {
  const form = useValidatedForm(rangeFormSchema);
  const today = isoDay(new Date());
  return (
    <form
      key={`${range.from}|${range.to}|${range.bucket}`}
      noValidate
      aria-label="Period"
      className="flex flex-col gap-3 rounded-3xl bg-vellum/60 p-4"
      onSubmit={form.onSubmit(async (input) => {
        onChange({ from: input.from ?? range.from, to: input.to ?? range.to, bucket: input.bucket });
      })}
    >
      <div className="flex flex-wrap gap-2">
        {presets(today).map((preset) => (
          <Button key={preset.label} look="quiet" className="px-3 py-1.5" onClick={() => onChange(preset.range)}>
            {preset.label}
          </Button>
        ))}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <TextField label="From" defaultValue={formatDate(range.from)} {...form.field('from')} />
        <TextField label="To" defaultValue={formatDate(range.to)} {...form.field('to')} />
        <div className="flex flex-col gap-1.5">
          <label htmlFor="sales-bucket" className="text-sm font-semibold text-loam">
            Grouped
          </label>
          <select id="sales-bucket" name="bucket" defaultValue={range.bucket} className="rounded-xl border-2 border-vellum bg-white px-3 py-2.5">
            {SALES_BUCKETS.map((bucket) => (
              <option key={bucket} value={bucket}>
                {BUCKET_LABELS[bucket]}
              </option>
            ))}
          </select>
        </div>
        <Button type="submit" disabled={!form.ready}>
          {busy ? 'Reading…' : 'Show'}
        </Button>
      </div>
    </form>
  );
}

function Totals({ figures, currency, feePercent }: { figures: SalesFigures | null; currency: Currency; feePercent: number }) {
  const f = figures ?? { revenueCents: 0, refundCents: 0, platformFeeCents: 0, netCents: 0, units: 0, refunds: 0, downloads: 0 };
  const money = (cents: number) => formatPrice(cents, currency);
  const cells = [
    { label: 'Revenue', value: money(f.revenueCents), testId: 'total-revenue' },
    { label: `Market fee (${feePercent} %)`, value: money(f.platformFeeCents), testId: 'total-fee' },
    { label: 'Refunded', value: money(f.refundCents), testId: 'total-refunded' },
    { label: 'Net', value: money(f.netCents), testId: 'total-net', strong: true },
    { label: 'Units sold', value: String(f.units), testId: 'total-units' },
    { label: 'Refunds', value: String(f.refunds), testId: 'total-refunds' },
    { label: 'Downloads', value: String(f.downloads), testId: 'total-downloads' },
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4 lg:grid-cols-7">
      {cells.map((cell) => (
        <div key={cell.label} className={`flex flex-col gap-1 rounded-2xl p-4 ${cell.strong ? 'bg-tarn text-chalk' : 'bg-vellum'}`}>
          <dt className={`text-xs font-bold uppercase tracking-wide ${cell.strong ? 'text-chalk/80' : 'text-loam-soft'}`}>{cell.label}</dt>
          <dd className="text-lg font-extrabold" data-testid={cell.testId}>
            {cell.value}
          </dd>
        </div>
      ))}
    </dl>
  );
}

function Chart({ report, currency, metric }: { report: SalesResponse; currency: Currency; metric: MetricKey }) {
  const choice = METRICS.find((m) => m.key === metric)!;
  const byPeriod = new Map(report.series.filter((s) => s.currency === currency).map((s) => [s.periodStart, s]));
  const bars = periodStarts(report.from, report.to, report.bucket).map((start) => ({
    key: start,
    label: periodLabel(start, report.bucket),
    value: byPeriod.get(start)?.[metric] ?? 0,
  }));
  const format = choice.money ? (value: number) => formatPrice(value, currency) : (value: number) => value.toLocaleString('en-GB');
  return <BarChart title={`${choice.label}, ${BUCKET_LABELS[report.bucket].toLowerCase()}`} bars={bars} format={format} minStep={1} />;
}

type Row = SalesResponse['listings'][number];

function ListingTable({ rows }: { rows: Row[] }) {
  const [sort, setSort] = useState<{ key: ColumnKey; descending: boolean }>({ key: 'netCents', descending: true });
  const sorted = useMemo(() => {
    const copy = [...rows];
    copy.sort((a, b) => {
      const order = sort.key === 'title' ? a.title.localeCompare(b.title) : a[sort.key] - b[sort.key];
      return sort.descending ? -order : order;
    });
    return copy;
  }, [rows, sort]);
  if (rows.length === 0) return <p className="text-loam-soft">No presets in this currency yet.</p>;
  return (
    <div className="overflow-x-auto rounded-3xl ring-2 ring-vellum">
      <table className="w-full min-w-[44rem] bg-white text-sm" data-testid="sales-table">
        <caption className="sr-only">Figures per preset, sortable by each column</caption>
        <thead className="bg-vellum text-left">
          <tr>
            {COLUMNS.map((column) => {
              const active = sort.key === column.key;
              return (
                <th
                  key={column.key}
                  scope="col"
                  aria-sort={active ? (sort.descending ? 'descending' : 'ascending') : 'none'}
                  className={`px-4 py-2.5 ${column.key === 'title' ? '' : 'text-right'}`}
                >
                  <button
                    type="button"
                    className="font-bold text-loam"
                    onClick={() => setSort({ key: column.key, descending: active ? !sort.descending : column.key !== 'title' })}
                  >
                    {column.label}
                    <span aria-hidden="true" className="pl-1 text-bracken">
                      {active ? (sort.descending ? '▼' : '▲') : ''}
                    </span>
                  </button>
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {sorted.map((row) => (
            <tr key={row.listingId} className="border-t border-vellum" data-testid="sales-row">
              {COLUMNS.map((column) =>
                column.key === 'title' ? (
                  <th key={column.key} scope="row" className="px-4 py-2.5 text-left font-semibold">
                    <a href={`/market/${row.listingId}`} className="text-loam">
                      {row.title}
                    </a>
                  </th>
                ) : (
                  <td key={column.key} className="px-4 py-2.5 text-right tabular-nums">
                    {column.money ? formatPrice(row[column.key], row.currency) : row[column.key]}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
