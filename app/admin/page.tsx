import type { Metadata } from 'next';
import Link from 'next/link';
import { ModerationQueue } from '@/components/admin/ModerationQueue';
import { PurchaseList } from '@/components/admin/PurchaseList';
import { requireArea } from '@/lib/accounts/session';
import { listListingsForAdmin, listVersionsForAdmin } from '@/lib/market/listings';
import { VersionQueue } from '@/components/admin/VersionQueue';
import { listPurchasesForAdmin } from '@/lib/market/payments/refunds';

export const metadata: Metadata = { title: 'Admin' };

export default async function AdminPage() {
  await requireArea('admin');
  const [queue, purchases, updates] = await Promise.all([listListingsForAdmin('submitted'), listPurchasesForAdmin(), listVersionsForAdmin()]);
  return (
    <div className="flex flex-col gap-12">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div className="flex flex-col gap-3">
          <h1 className="text-4xl font-extrabold tracking-tight">Admin</h1>
          <p className="max-w-2xl text-lg text-loam-soft">Keep the market clean: look at presets before they go on sale, and put right what went wrong with a payment.</p>
        </div>
        <div className="flex flex-wrap gap-3">
          <Link href="/admin/accounts" className="flex flex-col rounded-3xl bg-vellum px-5 py-3 no-underline hover:bg-lichen-pale">
            <span className="font-bold text-loam">Accounts</span>
            <span className="text-sm text-loam-soft">Roles, and switching accounts off</span>
          </Link>
          <Link href="/admin/mail" className="flex flex-col rounded-3xl bg-vellum px-5 py-3 no-underline hover:bg-lichen-pale">
            <span className="font-bold text-loam">Outgoing mail</span>
            <span className="text-sm text-loam-soft">Every e-mail Whorlwind sent</span>
          </Link>
        </div>
      </div>
      <section aria-labelledby="queue-heading" className="flex flex-col gap-4">
        <h2 id="queue-heading" className="text-2xl font-bold">
          Waiting for review
        </h2>
        <ModerationQueue initial={{ listings: queue }} />
      </section>
      <section aria-labelledby="updates-heading" className="flex flex-col gap-4">
        <h2 id="updates-heading" className="text-2xl font-bold">
          New versions waiting for review
        </h2>
        <VersionQueue initial={{ versions: updates }} />
      </section>
      <section aria-labelledby="purchases-heading" className="flex flex-col gap-4">
        <h2 id="purchases-heading" className="text-2xl font-bold">
          Purchases
        </h2>
        <PurchaseList initial={{ purchases }} />
      </section>
    </div>
  );
}
