'use client';
// The path of a curve being drawn, joined along the mesh by the field worker as points are added.
import { useEffect, useState } from 'react';
import type { Vec3 } from '@/lib/studio/client/features';
import { SUPERSEDED, type FieldClient } from '@/lib/studio/client/field-client';

/** The joined path of `points` (null under two points or when the tool shows points alone). */
export function useDraftPath({ client, points, joined, closed, onFailure }: { client: FieldClient | null; points: readonly Vec3[]; joined: boolean; closed: boolean; onFailure: (message: string) => void }): Float32Array | null {
  const [path, setPath] = useState<Float32Array | null>(null);
  useEffect(() => {
    if (!client || points.length < 2 || !joined) {
      setPath(null);
      return;
    }
    client
      .latest('draft', 0, { type: 'curve-path', points: [...points], closed })
      .then((joinedPath) => {
        if (joinedPath !== SUPERSEDED) setPath(joinedPath.points);
      })
      .catch((error: unknown) => onFailure(error instanceof Error ? error.message : 'That path cannot be drawn.'));
  }, [client, closed, joined, onFailure, points]);
  return path;
}
