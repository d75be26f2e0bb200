'use client';
// The search box, filters and order of the market. Everything goes into the page's URL (so a
// search can be shared, bookmarked and paged through); the page itself reads it on the server.
import { useRouter } from 'next/navigation';
import { useTransition, type ChangeEvent, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import {
  CURRENCY_CHOICES,
  defaultSort,
  FORMAT_CHOICES,
  marketHref,
  marketQuerySchema,
  SORTS,
  TAG_KEYS,
  TAG_LABELS,
  TAG_VALUES,
  tagLabel,
  centsToText,
  type MarketQuery,
} from './search-params';

const selectClass = 'rounded-xl border-2 border-vellum bg-white px-3 py-2.5 text-base text-loam focus:border-tarn';

function Select({
  name,
  label,
  defaultValue,
  options,
  anyLabel,
  onChange,
}: {
  name: string;
  label: string;
  defaultValue: string;
  options: readonly { value: string; label: string }[];
  anyLabel?: string;
  onChange?: (event: ChangeEvent<HTMLSelectElement>) => void;
}) {
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={`filter-${name}`} className="text-sm font-semibold text-loam">
        {label}
      </label>
      <select id={`filter-${name}`} name={name} defaultValue={defaultValue} className={selectClass} onChange={onChange}>
        {anyLabel !== undefined && <option value="">{anyLabel}</option>}
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </div>
  );
}

function filtersInUse(query: MarketQuery): boolean {
  return (
    TAG_KEYS.some((key) => query[key]) ||
    [query.format, query.currency, query.minPrice, query.maxPrice, query.minDensity, query.maxDensity, query.minLength, query.maxLength].some((value) => value !== undefined)
  );
}

export function MarketFilters({ query }: { query: MarketQuery }) {
  const router = useRouter();
  const [navigating, startNavigation] = useTransition();
  const form = useValidatedForm(marketQuerySchema);
  const values = {
    minPrice: query.minPrice === undefined ? '' : centsToText(query.minPrice),
    maxPrice: query.maxPrice === undefined ? '' : centsToText(query.maxPrice),
  };

  const go = form.onSubmit(async (input) => {
    startNavigation(() => router.push(marketHref({ ...input, page: 1 })));
  });

  function submitNow(event: ChangeEvent<HTMLSelectElement>) {
    event.target.form?.requestSubmit();
  }

  // A different search puts a different key on the form, so its uncontrolled fields start over.
  const formKey = marketHref({ ...query, page: 1 });

  return (
    <form
      key={formKey}
      role="search"
      aria-label="Find presets"
      noValidate
      onSubmit={(event: FormEvent<HTMLFormElement>) => void go(event)}
      className="flex flex-col gap-5"
    >
      <div className="flex flex-col gap-3 sm:flex-row sm:items-end">
        <div className="flex-1">
          <TextField
            label="Search presets"
            type="search"
            placeholder="fox, short coat, crown whorl…"
            defaultValue={query.q ?? ''}
            {...form.field('q')}
          />
        </div>
        <Button type="submit" disabled={!form.ready || navigating}>
          {navigating ? 'Searching…' : 'Search'}
        </Button>
      </div>
      <details className="rounded-3xl bg-vellum/60 p-4" open={filtersInUse(query) || undefined}>
        <summary className="cursor-pointer text-sm font-bold text-tarn">Filters</summary>
        <div className="grid gap-4 pt-4 sm:grid-cols-2 lg:grid-cols-4">
          {TAG_KEYS.map((key) => (
            <Select
              key={key}
              name={key}
              label={TAG_LABELS[key]}
              defaultValue={query[key] ?? ''}
              options={TAG_VALUES[key].map((value) => ({ value, label: tagLabel(value) }))}
              anyLabel="Any"
              onChange={submitNow}
            />
          ))}
          <Select name="format" label="File format" defaultValue={query.format ?? ''} options={FORMAT_CHOICES} anyLabel="Any" onChange={submitNow} />
          <Select name="currency" label="Currency" defaultValue={query.currency ?? ''} options={CURRENCY_CHOICES} anyLabel="Any" onChange={submitNow} />
          <TextField label="Lowest price" inputMode="decimal" defaultValue={values.minPrice} {...form.field('minPrice')} />
          <TextField label="Highest price" inputMode="decimal" defaultValue={values.maxPrice} {...form.field('maxPrice')} />
          <div className="grid grid-cols-2 gap-2">
            <TextField label="Guides per cm², from" inputMode="decimal" defaultValue={query.minDensity ?? ''} {...form.field('minDensity')} />
            <TextField label="Guides per cm², to" inputMode="decimal" defaultValue={query.maxDensity ?? ''} {...form.field('maxDensity')} />
          </div>
          <div className="grid grid-cols-2 gap-2">
            <TextField label="Typical length (cm), from" inputMode="decimal" defaultValue={query.minLength ?? ''} {...form.field('minLength')} />
            <TextField label="Typical length (cm), to" inputMode="decimal" defaultValue={query.maxLength ?? ''} {...form.field('maxLength')} />
          </div>
        </div>
        <div className="flex justify-end pt-4">
          <Button type="submit" look="quiet" disabled={!form.ready || navigating}>
            Apply filters
          </Button>
        </div>
      </details>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div className="w-64">
          <Select name="sort" label="Order" defaultValue={query.sort ?? defaultSort(query)} options={query.q ? SORTS : SORTS.filter((sort) => sort.value !== 'relevance')} onChange={submitNow} />
        </div>
      </div>
    </form>
  );
}
