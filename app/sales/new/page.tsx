import type { Metadata } from 'next';
import Link from 'next/link';
import { ListingForm } from '@/components/market/ListingForm';
import { requireArea } from '@/lib/accounts/session';
import { listLicences } from '@/lib/market/licences';
import { marketFeePercent } from '@/lib/market/fees';

export const metadata: Metadata = { title: 'List a preset' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function NewListingPage({ searchParams }: Props) {
  await requireArea('sales');
  const params = await searchParams;
  const text = (value: string | string[] | undefined) => (typeof value === 'string' ? value : undefined);
  const licences = await listLicences();
  return (
    <div className="flex max-w-4xl flex-col gap-8">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/sales" className="font-semibold text-tarn">
          ← Sales
        </Link>
      </nav>
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">List a preset</h1>
        <p className="text-lg text-loam-soft">
          Offer one saved version of a groom on the market. Buyers get the files you choose, made from that version exactly as it is
          now; later changes to the groom do not reach them.
        </p>
      </div>
      <ListingForm licences={licences} feePercent={marketFeePercent()} listing={null} preselect={{ groomId: text(params.groom), versionId: text(params.version) }} />
    </div>
  );
}
