'use client';
// Matching places by hand for a move by alignment: the groom's surface and the chosen one side by
// side; a click on the left, then a click on the same place on the right, makes one landmark pair
// (a line of the landmarks box, in each file's own coordinates). The chosen surface is read in a
// field worker of its own, with the reader the server's transfer uses.
import { useEffect, useMemo, useRef, useState } from 'react';
import type { Mesh } from 'three';
import type { ThreeEvent } from '@react-three/fiber';
import { fetchData } from '@/lib/http/client';
import type { Vec3 } from '@/lib/studio/client/features';
import { startFieldWorker } from '@/lib/studio/client/field-client';
import type { InspectedSurface } from '@/lib/studio/client/protocol';
import { surfaceBounds } from '@/lib/studio/client/surface-geometry';
import type { SurfaceDetailResponse } from '@/lib/studio/types';
import { Stage, type StageApi } from '../scene/Stage';
import { SurfaceMesh } from '../scene/SurfaceMesh';

const PAIRED = '#e8b04a';
const WAITING = '#d8452b';
/** A press that moves further than this (pixels) turned the view; it places nothing. */
const CLICK_SLOP = 4;

type Drawn = Pick<InspectedSurface, 'positions' | 'triangles'>;

function Dots({ points, colour, size }: { points: readonly Vec3[]; colour: string; size: number }) {
  return points.map((p, i) => (
    <mesh key={i} position={p} raycast={() => undefined}>
      <sphereGeometry args={[size, 12, 8]} />
      <meshBasicMaterial color={colour} depthTest={false} />
    </mesh>
  ));
}

/** One surface that takes clicks as places: turning the view (a drag) places nothing. */
function PickView({ surface, label, upAxis, testId, paired, waiting, onPick }: { surface: Drawn; label: string; upAxis: 'y' | 'z'; testId: string; paired: readonly Vec3[]; waiting: Vec3 | null; onPick: (point: Vec3) => void }) {
  const api = useRef<StageApi | null>(null);
  const mesh = useRef<Mesh | null>(null);
  const pressed = useRef<{ x: number; y: number } | null>(null);
  const box = useMemo(() => surfaceBounds(surface.positions), [surface]);
  const size = box.radius * 0.025;
  const down = (event: ThreeEvent<PointerEvent>) => {
    pressed.current = event.button === 0 ? { x: event.nativeEvent.clientX, y: event.nativeEvent.clientY } : null;
  };
  const up = (event: ThreeEvent<PointerEvent>) => {
    const start = pressed.current;
    pressed.current = null;
    if (!start || Math.hypot(event.nativeEvent.clientX - start.x, event.nativeEvent.clientY - start.y) > CLICK_SLOP) return;
    onPick([event.point.x, event.point.y, event.point.z]);
  };
  return (
    <div className="h-56 overflow-hidden rounded-xl" data-testid={testId}>
      <Stage label={label} center={box.center} radius={box.radius} upAxis={upAxis} apiRef={api} pickTarget={mesh}>
        <SurfaceMesh positions={surface.positions} triangles={surface.triangles} meshRef={mesh} onPointerDown={down} onPointerUp={up} />
        <Dots points={paired} colour={PAIRED} size={size} />
        {waiting && <Dots points={[waiting]} colour={WAITING} size={size * 1.3} />}
      </Stage>
    </div>
  );
}

/** Reads one of the groomer's surfaces for drawing, through its presigned file link. */
function useTargetSurface(surfaceId: string): { surface: InspectedSurface | null; failure: string | null } {
  const [state, setState] = useState<{ id: string; surface: InspectedSurface | null; failure: string | null }>({ id: surfaceId, surface: null, failure: null });
  useEffect(() => {
    let live = true;
    const client = startFieldWorker();
    fetchData<SurfaceDetailResponse>(`/api/studio/surfaces/${encodeURIComponent(surfaceId)}`)
      .then(({ surface }) => {
        if (surface.state !== 'ready') throw new Error(`${surface.name} is not ready to carry a groom.`);
        return client.request({ type: 'inspect', source: { kind: 'url', url: surface.fileUrl, fileName: surface.fileName } });
      })
      .then((read) => live && setState({ id: surfaceId, surface: read, failure: null }))
      .catch((error: unknown) => live && setState({ id: surfaceId, surface: null, failure: error instanceof Error ? error.message : 'The surface could not be read.' }))
      .finally(() => client.terminate());
    return () => {
      live = false;
      client.terminate();
    };
  }, [surfaceId]);
  return state.id === surfaceId ? state : { surface: null, failure: null };
}

/**
 * The two views. `pairs` are the landmarks already written (drawn as dots on both sides);
 * `onPair` receives each new pair once its second place is clicked.
 */
export function LandmarkPicker({ groomSurface, upAxis, targetId, targetName, pairs, onPair }: { groomSurface: Drawn; upAxis: 'y' | 'z'; targetId: string; targetName: string; pairs: readonly { from: Vec3; to: Vec3 }[]; onPair: (from: Vec3, to: Vec3) => void }) {
  const target = useTargetSurface(targetId);
  const [waiting, setWaiting] = useState<Vec3 | null>(null);
  return (
    <div className="flex flex-col gap-2" data-testid="landmark-picker">
      <p className="text-xs text-loam">
        Click a place on this surface, then the same place on {targetName}: each pair becomes a line of the landmarks below. Three pairs or more, spread
        apart and not in one row (the tip of the nose, the tail root, an ear tip). Drag to turn a view.
      </p>
      <div className="grid grid-cols-2 gap-2">
        <PickView surface={groomSurface} label="This groom's surface: click a place" upAxis={upAxis} testId="landmarks-from" paired={pairs.map((p) => p.from)} waiting={waiting} onPick={setWaiting} />
        {target.surface ? (
          <PickView
            surface={target.surface}
            label={`${targetName}: click the same place`}
            upAxis={upAxis}
            testId="landmarks-to"
            paired={pairs.map((p) => p.to)}
            waiting={null}
            onPick={(point) => {
              if (!waiting) return;
              onPair(waiting, point);
              setWaiting(null);
            }}
          />
        ) : (
          <p className="flex h-56 items-center justify-center rounded-xl bg-tarn/10 p-3 text-center text-xs text-loam" role="status">
            {target.failure ?? `Reading ${targetName}…`}
          </p>
        )}
      </div>
      <p className="text-xs text-loam" role="status" data-testid="landmark-status">
        {waiting ? `Now click the same place on ${targetName}.` : `${pairs.length} pair${pairs.length === 1 ? '' : 's'} matched${pairs.length < 3 ? ` — ${3 - pairs.length} more needed` : ''}.`}
      </p>
    </div>
  );
}
