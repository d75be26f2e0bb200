import type { Metadata } from 'next';
import { AreaIntro } from '@/components/areas/AreaIntro';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Library' };

export default async function LibraryPage() {
  await requireArea('library');
  return (
    <AreaIntro
      areaId="library"
      upcoming={['Every preset you bought, with its files to download.', 'Apply a preset’s flow to your own growth surface.']}
    />
  );
}
