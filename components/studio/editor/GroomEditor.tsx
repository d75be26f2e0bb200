'use client';
// Opens a groom in the editor: its saved spec, revision and versions as the page read them, its
// surface in its prepared form (or the file through the presigned link; read by the field worker), and the earlier sculpt its
// guides are rooted on after a move by polygon.
import { useMemo } from 'react';
import type { GroomDetail } from '@/lib/studio/client/api';
import { groomSurfaceSource } from '@/lib/studio/client/field-start';
import type { RootsSource, SurfaceSource } from '@/lib/studio/client/protocol';
import { Workspace } from './Workspace';

export function GroomEditor({ groom, maxUploadBytes }: { groom: GroomDetail; maxUploadBytes?: number }) {
  // The prepared form when the check wrote one (no parsing, no welding), with the file behind it;
  // the page's inline script (EarlyFieldStart) asked the worker for the same already.
  const source = useMemo<SurfaceSource>(() => groomSurfaceSource(groom), [groom]);
  const rootsFrom = useMemo<RootsSource | undefined>(
    () => (groom.rootsSurface ? { key: groom.rootsSurface.id, source: { kind: 'url', url: groom.rootsSurface.fileUrl, fileName: groom.rootsSurface.fileName } } : undefined),
    [groom],
  );
  const persistence = useMemo(() => ({ groomId: groom.id, revision: groom.revision, versions: groom.versions, surfaceId: groom.surface.id, maxUploadBytes }), [groom, maxUploadBytes]);
  return (
    <Workspace
      key={groom.id}
      title={groom.name}
      subtitle={`On ${groom.surface.name} (${groom.surface.faceCount.toLocaleString('en-GB')} faces, units ${groom.surface.units})${groom.fromPurchaseId ? ' · fitted from a preset you bought: yours to use, not to sell' : ''}`}
      source={source}
      rootsFrom={rootsFrom}
      initialSpec={groom.spec}
      persistence={persistence}
    />
  );
}
