'use client';
// The studio's front page: the groomer's grooms, their growth surfaces with the upload, and the
// demo characters to practise on. Lists come from the studio API (SWR), starting from what the
// server read for the first paint.
import Link from 'next/link';
import { Notice } from '@/components/ui/Notice';
import type { GroomListResponse, SurfaceListResponse } from '@/lib/studio/types';
import { useServerSeededSWR } from '@/components/ui/use-server-seeded-swr';
import { studioApi } from '@/lib/studio/client/api';
import { GroomList } from './GroomList';
import { SurfaceList } from './SurfaceList';
import { SurfaceUpload } from './SurfaceUpload';

export function StudioHome({
  maxBytes,
  initialGrooms,
  initialSurfaces,
  practice,
}: {
  maxBytes: number;
  initialGrooms: GroomListResponse;
  initialSurfaces: SurfaceListResponse;
  practice: readonly { id: string; character: string; description: string }[];
}) {
  const grooms = useServerSeededSWR<GroomListResponse>(studioApi.groomsUrl, initialGrooms);
  // While a surface is being checked (a job), the list looks again every second for its progress.
  const surfaces = useServerSeededSWR<SurfaceListResponse>(studioApi.surfacesUrl, initialSurfaces, {
    refreshInterval: (latest) => (latest?.surfaces.some((surface) => surface.state === 'checking') ? 1000 : 0),
  });
  const refresh = () => {
    void grooms.mutate();
    void surfaces.mutate();
  };
  return (
    <div className="flex flex-col gap-12">
      <section aria-labelledby="grooms-heading" className="flex flex-col gap-4">
        <h2 id="grooms-heading" className="text-2xl font-extrabold tracking-tight">
          Grooms
        </h2>
        {grooms.error && <Notice tone="error">The grooms could not be loaded: {grooms.error.message}</Notice>}
        <GroomList grooms={grooms.data?.grooms ?? []} onChanged={refresh} />
      </section>
      <section aria-labelledby="surfaces-heading" className="flex flex-col gap-4">
        <h2 id="surfaces-heading" className="text-2xl font-extrabold tracking-tight">
          Growth surfaces
        </h2>
        <SurfaceUpload maxBytes={maxBytes} onUploaded={refresh} />
        {surfaces.error && <Notice tone="error">The growth surfaces could not be loaded: {surfaces.error.message}</Notice>}
        <SurfaceList surfaces={surfaces.data?.surfaces ?? []} onChanged={refresh} />
      </section>
      <section aria-labelledby="practice-heading" className="flex flex-col gap-3">
        <h2 id="practice-heading" className="text-2xl font-extrabold tracking-tight">
          Practice on a demo character
        </h2>
        <p className="text-loam-soft">The editor on a character built in your browser; nothing is saved.</p>
        <ul className="grid gap-3 md:grid-cols-3">
          {practice.map((demo) => (
            <li key={demo.id}>
              <Link href={`/studio/practice/${demo.id}`} className="flex h-full flex-col gap-1 rounded-3xl border-2 border-dashed border-tarn/30 p-4 no-underline hover:border-tarn">
                <span className="font-bold text-loam">{demo.character}</span>
                <span className="text-sm text-loam-soft">{demo.description}</span>
              </Link>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
