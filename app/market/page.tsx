import type { Metadata } from 'next';
import { AreaIntro } from '@/components/areas/AreaIntro';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Market' };

export default async function MarketPage() {
  await requireArea('market');
  return (
    <AreaIntro
      areaId="market"
      upcoming={[
        'Presets with pictures, price and licence, searchable by animal, coat length and style.',
        'Card checkout; what you buy appears in your library.',
      ]}
    />
  );
}
