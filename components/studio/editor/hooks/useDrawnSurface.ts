'use client';
// The surface's geometry as the stage draws it, from the surface as read until the prepared
// surface replaces it. The two are nearly always the same triangles at the same places (the
// prepared surface is the one read, in double precision), so the geometry made for the first is
// kept for the second — nothing is built, uploaded or drawn twice; at a million faces a second
// upload and draw held the page's main thread for over half a second. Only the vertex normals may
// differ (area-weighted as read, angle-weighted once prepared): those alone are replaced.
import { useEffect, useMemo, useRef } from 'react';
import type { BufferAttribute, BufferGeometry } from 'three';
import type { OpenedSurface, SurfacePreview } from '@/lib/studio/client/protocol';
import { drawsSameSurface } from '@/lib/studio/client/surface-geometry';
import { surfaceGeometry } from '../../scene/SurfaceMesh';

type Drawable = Pick<OpenedSurface, 'positions' | 'triangles' | 'vertexNormals'> | SurfacePreview;

/** Replaces a normal attribute's values in place (one upload of that buffer alone); false when they were already the same. */
function replaceNormals(attribute: BufferAttribute, normals: Float32Array): boolean {
  const kept = attribute.array as Float32Array;
  if (kept.length !== normals.length) return false;
  let same = true;
  for (let i = 0; i < kept.length && same; i++) same = kept[i] === normals[i];
  if (same) return true;
  kept.set(normals);
  attribute.needsUpdate = true;
  return true;
}

/**
 * The geometry to draw `surface` with, or else `preview`, or null. Guarantees: when the prepared
 * surface draws exactly the surface as read (`drawsSameSurface`), the same geometry object is
 * returned, with the prepared normals; otherwise a new one, and the one before is disposed. The
 * last one is disposed when the page goes.
 */
export function useDrawnSurface(preview: SurfacePreview | null, surface: OpenedSurface | null): BufferGeometry | null {
  const kept = useRef<{ geometry: BufferGeometry; drawn: Drawable } | null>(null);
  const geometry = useMemo(() => {
    const shown: Drawable | null = surface ?? preview;
    if (!shown) return null;
    const before = kept.current;
    if (before && before.drawn === shown) return before.geometry;
    if (before) {
      const positions = before.geometry.getAttribute('position').array;
      const normal = before.geometry.getAttribute('normal') as BufferAttribute | undefined;
      if (drawsSameSurface({ positions, triangles: before.drawn.triangles }, shown) && normal && replaceNormals(normal, shown.vertexNormals)) {
        kept.current = { geometry: before.geometry, drawn: shown };
        return before.geometry;
      }
    }
    const made = surfaceGeometry(shown.positions, shown.triangles, undefined, shown.vertexNormals);
    kept.current = { geometry: made, drawn: shown };
    return made;
  }, [preview, surface]);

  // A geometry given up for a new one is disposed once the stage has moved on to the new one.
  const given = useRef<BufferGeometry | null>(null);
  useEffect(() => {
    if (given.current && given.current !== geometry) given.current.dispose();
    given.current = geometry;
  }, [geometry]);
  useEffect(() => () => given.current?.dispose(), []);
  return geometry;
}
