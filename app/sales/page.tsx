import type { Metadata } from 'next';
import Link from 'next/link';
import { Payouts } from '@/components/sales/Payouts';
import { SalesDashboard } from '@/components/sales/SalesDashboard';
import { SellerListings } from '@/components/sales/SellerListings';
import { Notice } from '@/components/ui/Notice';
import { actorOf } from '@/lib/accounts/actor';
import { requireArea } from '@/lib/accounts/session';
import { listOwnListings } from '@/lib/market/listings';
import { salesReport } from '@/lib/market/sales';
import { listPayouts } from '@/lib/market/payouts';

export const metadata: Metadata = { title: 'Sales' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function SalesPage({ searchParams }: Props) {
  const session = await requireArea('sales');
  if (!session) return null;
  const actor = actorOf(session);
  const [report, listings, payouts] = await Promise.all([
    salesReport(actor, { bucket: 'day' }),
    listOwnListings(actor),
    listPayouts(actor),
  ]);
  const listed = (await searchParams).listed;
  const highlight = typeof listed === 'string' ? listed : null;

  return (
    <div className="flex flex-col gap-12">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div className="flex flex-col gap-3">
          <h1 className="text-4xl font-extrabold tracking-tight">Sales</h1>
          <p className="max-w-2xl text-lg text-loam-soft">Your presets on the market: what they earn, who downloads them, what comes back.</p>
        </div>
        <Link href="/sales/new" className="rounded-full bg-bracken px-5 py-2.5 text-sm font-semibold text-chalk no-underline hover:bg-bracken-deep">
          List a preset
        </Link>
      </div>

      <section id="listings" aria-labelledby="listings-heading" className="flex flex-col gap-4">
        <h2 id="listings-heading" className="text-2xl font-bold">
          Your listings
        </h2>
        {highlight && listings.some((listing) => listing.id === highlight) && (
          <Notice tone="success">Saved. The market’s admins look at every preset before it goes on sale; you get an e-mail when they decide.</Notice>
        )}
        <SellerListings initial={{ listings }} highlight={highlight} />
      </section>

      <section aria-labelledby="figures-heading" className="flex flex-col gap-4">
        <h2 id="figures-heading" className="text-2xl font-bold">
          Figures
        </h2>
        <SalesDashboard initial={report} />
      </section>

      <section aria-labelledby="payouts-heading" className="flex flex-col gap-4">
        <h2 id="payouts-heading" className="text-2xl font-bold">
          Payouts
        </h2>
        <Payouts initialPayouts={{ payouts }} balance={report.balance} holdDays={report.payoutHoldDays} />
      </section>
    </div>
  );
}
