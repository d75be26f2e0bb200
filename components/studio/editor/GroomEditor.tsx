'use client';
// Opens a groom in the editor: its saved spec and revision from the studio API, its surface file
// through the presigned link the API hands out (read by the field worker), its versions.
import Link from 'next/link';
import { useEffect, useMemo, useState } from 'react';
import { Notice } from '@/components/ui/Notice';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec } from '@/lib/groom/spec';
import { studioApi, type GroomDetail, type StudioError } from '@/lib/studio-client/api';
import { prewarmFieldWorker } from '@/lib/studio-client/field-client';
import type { SurfaceSource } from '@/lib/studio-client/protocol';
import { Workspace } from './Workspace';

export function GroomEditor({ groomId }: { groomId: string }) {
  const [groom, setGroom] = useState<GroomDetail | null>(null);
  const [error, setError] = useState<StudioError | null>(null);
  useEffect(() => {
    let live = true;
    prewarmFieldWorker();
    studioApi.getGroom(groomId).then((outcome) => {
      if (!live) return;
      if (outcome.ok) setGroom(outcome.data.groom);
      else setError(outcome.error);
    });
    return () => {
      live = false;
    };
  }, [groomId]);

  const source = useMemo<SurfaceSource | null>(() => (groom ? { kind: 'url', url: groom.surface.fileUrl, fileName: groom.surface.fileName } : null), [groom]);
  const persistence = useMemo(() => (groom ? { groomId: groom.id, revision: groom.revision, versions: groom.versions } : null), [groom]);

  if (error) {
    return (
      <div className="flex flex-col gap-4">
        <h1 className="text-3xl font-extrabold tracking-tight">This groom cannot be opened</h1>
        <Notice tone="error">{error.status === 404 ? 'There is no groom of yours at this address. It may have been deleted.' : error.message}</Notice>
        <Link href="/studio" className="font-semibold text-tarn">
          Back to the studio
        </Link>
      </div>
    );
  }
  if (!groom || !source || !persistence) {
    return (
      <div className="flex flex-col gap-2" role="status">
        <h1 className="text-3xl font-extrabold tracking-tight">Opening the groom…</h1>
        <p className="text-loam-soft">Fetching its spec and surface.</p>
      </div>
    );
  }
  return (
    <Workspace
      key={groom.id}
      title={groom.name}
      subtitle={`On ${groom.surface.name} (${groom.surface.faceCount.toLocaleString('en-GB')} faces, units ${groom.surface.units})`}
      source={source}
      initialSpec={groom.spec}
      persistence={persistence}
    />
  );
}

/** The editor on one of the demo characters, built in the browser: for trying things out, nothing saved. */
export function PracticeEditor({ demoId }: { demoId: string }) {
  const demo = DEMO_GROOMS.find((d) => d.id === demoId);
  const source = useMemo<SurfaceSource>(() => ({ kind: 'demo', demoId }), [demoId]);
  const spec = useMemo(() => (demo ? parseGroomSpec(demo.spec) : null), [demo]);
  if (!demo || !spec) {
    return <Notice tone="error">There is no practice character called “{demoId}”.</Notice>;
  }
  return <Workspace title={`Practice: ${demo.character}`} subtitle={demo.description} source={source} initialSpec={spec} persistence={null} />;
}
