'use client';
// Opens a groom in the editor: its saved spec, revision and versions as the page read them, its
// surface file through the presigned link (read by the field worker).
import { useMemo } from 'react';
import type { GroomDetail } from '@/lib/studio/client/api';
import type { SurfaceSource } from '@/lib/studio/client/protocol';
import { Workspace } from './Workspace';

export function GroomEditor({ groom, maxUploadBytes }: { groom: GroomDetail; maxUploadBytes?: number }) {
  const source = useMemo<SurfaceSource>(() => ({ kind: 'url', url: groom.surface.fileUrl, fileName: groom.surface.fileName }), [groom]);
  const persistence = useMemo(() => ({ groomId: groom.id, revision: groom.revision, versions: groom.versions, surfaceId: groom.surface.id, maxUploadBytes }), [groom, maxUploadBytes]);
  return (
    <Workspace
      key={groom.id}
      title={groom.name}
      subtitle={`On ${groom.surface.name} (${groom.surface.faceCount.toLocaleString('en-GB')} faces, units ${groom.surface.units})${groom.fromPurchaseId ? ' · fitted from a preset you bought: yours to use, not to sell' : ''}`}
      source={source}
      initialSpec={groom.spec}
      persistence={persistence}
    />
  );
}
