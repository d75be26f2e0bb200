'use client';
// A rejected surface drawn from the file the groomer picked (read in the field worker with
// lib/field's reader, the same reader and numbering the server's check used), with the first
// faces, edges and vertices of each problem marked.
import { useEffect, useMemo, useRef, useState } from 'react';
import type { Mesh } from 'three';
import type { SurfaceProblem } from '@/lib/studio/client/api';
import { startFieldWorker } from '@/lib/studio/client/field-client';
import type { InspectedSurface } from '@/lib/studio/client/protocol';
import { problemMarks, surfaceBounds } from '@/lib/studio/client/surface-geometry';
import { LineLayer } from '../scene/LineLayer';
import { Stage, type StageApi } from '../scene/Stage';
import { SurfaceMesh } from '../scene/SurfaceMesh';
import { surfaceGeometry } from '../scene/SurfaceMesh';

const MARK = '#d8452b';

function MarkedFaces({ surface, faces }: { surface: InspectedSurface; faces: number[] }) {
  const geometry = useMemo(() => surfaceGeometry(surface.positions, surface.triangles, faces), [faces, surface]);
  useEffect(() => () => geometry.dispose(), [geometry]);
  return (
    <mesh geometry={geometry} raycast={() => undefined}>
      <meshBasicMaterial color={MARK} side={2} polygonOffset polygonOffsetFactor={-2} polygonOffsetUnits={-2} />
    </mesh>
  );
}

export function ProblemView({ file, problems }: { file: File; problems: readonly SurfaceProblem[] }) {
  const [surface, setSurface] = useState<InspectedSurface | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const api = useRef<StageApi | null>(null);
  const mesh = useRef<Mesh | null>(null);
  useEffect(() => {
    let live = true;
    const client = startFieldWorker();
    file
      .arrayBuffer()
      .then((bytes) => client.request({ type: 'inspect', source: { kind: 'bytes', bytes, fileName: file.name } }))
      .then((read) => live && setSurface(read))
      .catch((error: unknown) => live && setFailure(error instanceof Error ? error.message : 'The file could not be read.'))
      .finally(() => client.terminate());
    return () => {
      live = false;
      client.terminate();
    };
  }, [file]);

  const marks = useMemo(() => (surface ? problemMarks(problems, surface.positions, surface.triangles) : null), [problems, surface]);
  const box = useMemo(() => (surface ? surfaceBounds(surface.positions) : null), [surface]);
  const dots = useMemo(() => {
    if (!surface || !marks || !box) return null;
    // A small cross at each marked vertex.
    const r = box.radius * 0.015;
    const out: number[] = [];
    for (const v of marks.vertices) {
      const [x, y, z] = [surface.positions[3 * v], surface.positions[3 * v + 1], surface.positions[3 * v + 2]];
      // A vertex that is not a number is nowhere to be marked (its problem's words say which it is).
      if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) continue;
      out.push(x - r, y, z, x + r, y, z, x, y - r, z, x, y + r, z, x, y, z - r, x, y, z + r);
    }
    return Float32Array.from(out);
  }, [box, marks, surface]);

  if (failure) return <p className="text-sm text-loam-soft">The file cannot be drawn either: {failure}</p>;
  if (!surface || !marks || !box) return <p className="text-sm text-loam-soft" role="status">Reading the file to show where the problems are…</p>;
  if (marks.marked.length === 0) return <p className="text-sm text-loam-soft">The problems are not at particular faces, so there is nothing to point at in a picture.</p>;
  return (
    <div className="flex flex-col gap-2">
      <div className="h-80 overflow-hidden rounded-2xl" data-testid="problem-view">
        <Stage label="The rejected surface with the faces that have problems marked in red" center={box.center} radius={box.radius} upAxis="y" apiRef={api} pickTarget={mesh}>
          <SurfaceMesh positions={surface.positions} triangles={surface.triangles} meshRef={mesh} opacity={0.85} />
          {marks.faces.length > 0 && <MarkedFaces surface={surface} faces={marks.faces} />}
          {marks.edges.length > 0 && <LineLayer lines={Float32Array.from(marks.edges)} tail={MARK} head={MARK} depthTest={false} />}
          {dots && dots.length > 0 && <LineLayer lines={dots} tail={MARK} head={MARK} depthTest={false} />}
        </Stage>
      </div>
      <p className="text-xs text-loam-soft">
        Marked in red: the first {marks.faces.length > 0 ? `${marks.faces.length} faces` : ''}
        {marks.faces.length > 0 && (marks.edges.length > 0 || marks.vertices.length > 0) ? ', ' : ''}
        {marks.edges.length > 0 ? `${marks.edges.length / 6} edges` : ''}
        {marks.vertices.length > 0 && marks.edges.length === 0 ? `${marks.vertices.length} vertices` : ''} named in the report. Drag to turn the view.
      </p>
    </div>
  );
}
