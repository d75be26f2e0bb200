import type { Metadata } from 'next';
import Link from 'next/link';
import { MarketFilters } from '@/components/market/MarketFilters';
import { ListingTile } from '@/components/market/ListingTile';
import { Pagination } from '@/components/market/Pagination';
import { marketHref, PAGE_SIZE, readMarketQuery, searchInputOf } from '@/components/market/search-params';
import { Notice } from '@/components/ui/Notice';
import { requireArea } from '@/lib/accounts/session';
import { searchListings } from '@/lib/market/search';

export const metadata: Metadata = { title: 'Market' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function MarketPage({ searchParams }: Props) {
  await requireArea('market');
  const { query, ignored } = readMarketQuery(await searchParams);
  const found = await searchListings(searchInputOf(query));
  const first = (found.page - 1) * found.pageSize + 1;
  const last = Math.min(found.total, found.page * found.pageSize);

  return (
    <div className="flex flex-col gap-8">
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">Market</h1>
        <p className="max-w-2xl text-lg text-loam-soft">
          Coats other groomers have laid out — whorls, partings and all — ready to download as guides, fields and groom specs.
        </p>
      </div>
      <MarketFilters query={query} />
      {ignored.length > 0 && (
        <Notice tone="info">
          Some of the address could not be read and was left out ({ignored.join(', ')}).
        </Notice>
      )}
      <section aria-label="Results" className="flex flex-col gap-5">
        <p role="status" className="text-sm text-loam-soft" data-testid="result-count">
          {found.total === 0
            ? 'No presets match.'
            : results(found.total, first, last)}
        </p>
        {found.results.length > 0 ? (
          <ul className="grid gap-5 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-4">
            {found.results.map((listing) => (
              <ListingTile key={listing.id} listing={listing} />
            ))}
          </ul>
        ) : (
          <div className="rounded-3xl border-2 border-dashed border-tarn/30 p-8 text-loam-soft">
            {found.total > 0 ? (
              <>
                There are fewer pages than that.{' '}
                <Link href={marketHref({ ...query, page: 1 })} className="font-semibold text-tarn">
                  Back to the first page
                </Link>
              </>
            ) : (
              <>
                Nothing here yet for that search. Loosen a filter, or{' '}
                <Link href="/market" className="font-semibold text-tarn">
                  see every preset
                </Link>
                .
              </>
            )}
          </div>
        )}
        <Pagination query={query} total={found.total} pageSize={PAGE_SIZE} />
      </section>
    </div>
  );
}

function results(total: number, first: number, last: number) {
  const noun = total === 1 ? 'preset' : 'presets';
  return total <= last && first === 1 ? `${total} ${noun}` : `${first}–${last} of ${total} ${noun}`;
}
