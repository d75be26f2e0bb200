'use client';
// The growth surface, shaded, with fast picking (a bounding volume hierarchy that keeps the face
// order, so a hit names the same face the field engine numbers) and optional faces to highlight.
import { useEffect, useMemo, type RefObject } from 'react';
import type { ThreeEvent } from '@react-three/fiber';
import { BufferAttribute, BufferGeometry, DoubleSide, FrontSide, Sphere, Vector3, type Mesh } from 'three';
import { surfaceBounds } from '@/lib/studio/client/surface-geometry';
import { MeshBVH, acceleratedRaycast } from 'three-mesh-bvh';

export const SURFACE_COLOUR = '#e4dac3';

export function surfaceGeometry(positions: ArrayLike<number>, triangles: Uint32Array, faces?: ArrayLike<number>, normals?: Float32Array): BufferGeometry {
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(Float32Array.from(positions), 3));
  if (faces) {
    const index = new Uint32Array(3 * faces.length);
    for (let i = 0; i < faces.length; i++) for (let k = 0; k < 3; k++) index[3 * i + k] = triangles[3 * faces[i] + k];
    geometry.setIndex(new BufferAttribute(index, 1));
  } else {
    geometry.setIndex(new BufferAttribute(triangles, 1));
  }
  if (normals && normals.length === positions.length) geometry.setAttribute('normal', new BufferAttribute(normals, 3));
  else geometry.computeVertexNormals();
  // From the finite coordinates only: a refused surface may have a vertex that is not a number,
  // and three's own sphere would then be NaN (and every pick would miss).
  const { center, radius } = surfaceBounds(positions);
  geometry.boundingSphere = new Sphere(new Vector3(...center), radius);
  return geometry;
}

export type SurfacePointerHandler = (event: ThreeEvent<PointerEvent>) => void;

/**
 * The surface is opaque: a press on it must not also reach a marker behind it (the pointer's ray
 * goes on through the mesh, and three delivers the event to every object it meets).
 */
function hiding(handler: SurfacePointerHandler): SurfacePointerHandler {
  return (event) => {
    event.stopPropagation();
    handler(event);
  };
}

export function SurfaceMesh({
  positions,
  triangles,
  meshRef,
  colour = SURFACE_COLOUR,
  opacity = 1,
  closed = false,
  normals,
  onPointerDown,
  onPointerMove,
  onPointerUp,
  onPointerLeave,
  onDrawn,
  hierarchy,
  geometry: shared,
}: {
  positions: ArrayLike<number>;
  triangles: Uint32Array;
  meshRef?: RefObject<Mesh | null>;
  colour?: string;
  opacity?: number;
  /** Vertex normals to shade with (computed from the mesh when absent). */
  normals?: Float32Array;
  /** A closed surface is only ever seen from outside: its back faces need not be drawn. */
  closed?: boolean;
  onPointerDown?: SurfacePointerHandler;
  onPointerMove?: SurfacePointerHandler;
  onPointerUp?: SurfacePointerHandler;
  onPointerLeave?: SurfacePointerHandler;
  /** Called after each frame that draws the surface. */
  onDrawn?: () => void;
  /** A picking hierarchy built elsewhere on these same arrays (OpenedSurface's `pickHierarchy`). */
  hierarchy?: { readonly roots: readonly ArrayBuffer[]; readonly indirectBuffer: Uint32Array | Uint16Array };
  /**
   * The geometry of these same arrays, made and disposed by the caller (useDrawnSurface: kept when
   * the prepared surface replaces the surface as read); made here from the arrays when absent.
   */
  geometry?: BufferGeometry;
}) {
  const own = useMemo(() => (shared ? null : surfaceGeometry(positions, triangles, undefined, normals)), [normals, positions, shared, triangles]);
  const geometry = shared ?? own!;
  // Nothing picks on a surface without handlers or a ref (the surface shown while it is prepared):
  // it needs no hierarchy, whose building would hold the main thread for half a second at a million faces.
  const picked = !!(meshRef || onPointerDown || onPointerMove || onPointerUp);
  useEffect(() => {
    const release = () => own?.dispose();
    if (!picked) return release;
    if (hierarchy && !geometry.boundsTree) {
      // Built by the field worker on the same arrays: taken as it is, nothing to compute here.
      // Version 1 of the layout (lib/groom/place/skin.ts checks it): without it three-mesh-bvh would "fix up" the buffers.
      const serialized = { version: 1, roots: [...hierarchy.roots], index: triangles, indirectBuffer: hierarchy.indirectBuffer } as unknown as Parameters<typeof MeshBVH.deserialize>[0];
      geometry.boundsTree = MeshBVH.deserialize(serialized, geometry, { setIndex: false });
      return release;
    }
    // The picking hierarchy is built once the page is idle, so it does not hold up the first
    // field; until then a pick tests every face.
    const build = () => {
      geometry.boundsTree ??= new MeshBVH(geometry, { indirect: true });
    };
    const idle = typeof requestIdleCallback === 'function' ? requestIdleCallback(build, { timeout: 1500 }) : setTimeout(build, 200);
    return () => {
      if (typeof cancelIdleCallback === 'function' && typeof idle === 'number') cancelIdleCallback(idle);
      release();
    };
  }, [geometry, hierarchy, own, picked, triangles]);
  return (
    <mesh
      ref={meshRef}
      geometry={geometry}
      raycast={acceleratedRaycast}
      onPointerDown={onPointerDown && hiding(onPointerDown)}
      onPointerMove={onPointerMove && hiding(onPointerMove)}
      onPointerUp={onPointerUp && hiding(onPointerUp)}
      onPointerLeave={onPointerLeave}
      {...(onDrawn ? { onAfterRender: onDrawn } : {})}
    >
      <meshLambertMaterial
        color={colour}
        side={closed ? FrontSide : DoubleSide}
        transparent={opacity < 1}
        opacity={opacity}
        polygonOffset
        polygonOffsetFactor={1}
        polygonOffsetUnits={1}
      />
    </mesh>
  );
}
