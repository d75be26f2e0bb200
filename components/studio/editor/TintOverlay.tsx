'use client';
// The painted values of the map or mask the brush paints, drawn over the surface in the tint ramp
// (lib/studio/client/paint.ts). It shares the surface's positions and triangles, never takes a
// pick (the surface below does), and recolours in place while a stroke is dragged.
import { useEffect, useMemo } from 'react';
import { BufferAttribute, BufferGeometry, DoubleSide } from 'three';
import { tintColours, type PaintTarget } from '@/lib/studio/client/paint';

export function TintOverlay({ positions, triangles, normals, values, kind, version }: {
  positions: Float64Array;
  triangles: Uint32Array;
  normals: Float32Array;
  values: Float64Array;
  kind: PaintTarget['kind'];
  /** Changes whenever `values` were changed in place. */
  version: number;
}) {
  const geometry = useMemo(() => {
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(Float32Array.from(positions), 3));
    g.setIndex(new BufferAttribute(triangles, 1));
    if (normals.length === positions.length) g.setAttribute('normal', new BufferAttribute(normals, 3));
    else g.computeVertexNormals();
    g.setAttribute('color', new BufferAttribute(new Float32Array(positions.length), 3));
    return g;
  }, [normals, positions, triangles]);
  useEffect(() => () => geometry.dispose(), [geometry]);
  useEffect(() => {
    const colour = geometry.getAttribute('color') as BufferAttribute;
    if (values.length * 3 !== colour.array.length) return;
    tintColours(values, kind, colour.array as Float32Array);
    colour.needsUpdate = true;
  }, [geometry, values, kind, version]);
  return (
    <mesh geometry={geometry} raycast={() => undefined} name="tint" renderOrder={1}>
      <meshLambertMaterial vertexColors side={DoubleSide} />
    </mesh>
  );
}
