import type { Metadata } from 'next';
import { AreaIntro } from '@/components/areas/AreaIntro';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Sales' };

export default async function SalesPage() {
  await requireArea('sales');
  return (
    <AreaIntro
      areaId="sales"
      upcoming={['Publish a groom as a preset with pictures, price and licence.', 'Sales, revenue, downloads, refunds and payouts per preset.']}
    />
  );
}
