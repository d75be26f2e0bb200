// Page links for the market's results; the pages are counted by the server.
import Link from 'next/link';
import { marketHref, type MarketQuery } from './search-params';

function pagesToShow(current: number, last: number): (number | 'gap')[] {
  const wanted = new Set([1, last, current - 1, current, current + 1].filter((page) => page >= 1 && page <= last));
  const sorted = [...wanted].sort((a, b) => a - b);
  const shown: (number | 'gap')[] = [];
  sorted.forEach((page, index) => {
    if (index > 0 && page - sorted[index - 1] > 1) shown.push('gap');
    shown.push(page);
  });
  return shown;
}

export function Pagination({ query, total, pageSize }: { query: MarketQuery; total: number; pageSize: number }) {
  const last = Math.max(1, Math.ceil(total / pageSize));
  if (last <= 1) return null;
  const current = Math.min(query.page, last);
  const link = 'rounded-full px-3.5 py-1.5 text-sm font-semibold no-underline';
  return (
    <nav aria-label="Pages of results" className="flex flex-wrap items-center justify-center gap-1">
      {current > 1 && (
        <Link href={marketHref({ ...query, page: current - 1 })} className={`${link} text-tarn hover:bg-vellum`} rel="prev">
          Previous
        </Link>
      )}
      {pagesToShow(current, last).map((page, index) =>
        page === 'gap' ? (
          <span key={`gap-${index}`} className="px-1 text-loam-soft">
            …
          </span>
        ) : (
          <Link
            key={page}
            href={marketHref({ ...query, page })}
            aria-current={page === current ? 'page' : undefined}
            aria-label={`Page ${page}`}
            className={`${link} ${page === current ? 'bg-tarn text-chalk' : 'text-tarn hover:bg-vellum'}`}
          >
            {page}
          </Link>
        ),
      )}
      {current < last && (
        <Link href={marketHref({ ...query, page: current + 1 })} className={`${link} text-tarn hover:bg-vellum`} rel="next">
          Next
        </Link>
      )}
    </nav>
  );
}
