import type { Metadata } from 'next';
import { LibraryList } from '@/components/market/LibraryList';
import { actorOf } from '@/lib/accounts/actor';
import { requireArea } from '@/lib/accounts/session';
import { listLibrary } from '@/lib/market/library';
import { env } from '@/lib/platform/env';

export const metadata: Metadata = { title: 'Library' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function LibraryPage({ searchParams }: Props) {
  const session = await requireArea('library');
  const purchases = session ? await listLibrary(actorOf(session)) : [];
  const justPaid = (await searchParams).checkout === 'success';
  return (
    <div className="flex flex-col gap-8">
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">Library</h1>
        <p className="max-w-2xl text-lg text-loam-soft">
          The presets you bought: fit them to a character of your own in the studio, download their files, and tell other groomers how they worked for you.
        </p>
      </div>
      <LibraryList initial={{ purchases }} justPaid={justPaid} maxUploadBytes={env().SURFACE_MAX_BYTES} />
    </div>
  );
}
