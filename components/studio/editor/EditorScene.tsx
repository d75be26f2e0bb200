'use client';
// What the editor draws on its stage: the surface, the field (strokes or streamlines), the guides,
// and the features — markers for singularities and pins, lines for partings, crests and flow
// strokes, and the path of a curve being drawn.
import type { ThreeEvent } from '@react-three/fiber';
import { memo, useMemo, useRef, type RefObject } from 'react';
import { DoubleSide, Quaternion, Vector3, type BufferGeometry, type Mesh } from 'three';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { sameFeature, singularityKind, type FeatureRef, type Vec3 } from '@/lib/studio/client/features';
import { placeOnSurface } from '@/lib/studio/client/marker-places';
import type { GrainMark, GrownGuides, OpenedSurface, SolveReport } from '@/lib/studio/client/protocol';
import { guideSegments } from '@/lib/studio/client/surface-geometry';
import { guideSetColours } from '@/lib/studio/client/guide-sets';
import { CLICK_TRAVEL } from '@/lib/studio/client/tools/clicks';
import { FatLine } from '../scene/FatLine';
import { LineLayer } from '../scene/LineLayer';
import { SurfaceMesh, type SurfacePointerHandler } from '../scene/SurfaceMesh';
import { TintOverlay } from './TintOverlay';

export const COLOURS = {
  strokeTail: '#a39a88',
  strokeHead: '#231d18',
  guideRoot: '#21474c',
  guideTip: '#c9d9ad',
  parting: '#b3552c',
  crest: '#21474c',
  flow: '#c28a12',
  whorl: '#e9bb4d',
  saddle: '#a3b883',
  other: '#f6f2e9',
  pin: '#8e3f1d',
  selected: '#b3552c',
  wrong: '#a3301c',
  border: '#e9bb4d',
  draft: '#8e3f1d',
  grain: '#f6f2e9',
  tint: '#d0692b',
};

export interface MarkerHandlers {
  onMarkerDown(feature: FeatureRef, event: ThreeEvent<PointerEvent>): void;
}

const UP = new Vector3(0, 1, 0);

function orientation(normal: Vec3): Quaternion {
  const n = new Vector3(...normal);
  if (n.lengthSq() === 0) n.set(0, 1, 0);
  return new Quaternion().setFromUnitVectors(UP, n.normalize());
}

const SingularityMarker = memo(function SingularityMarker({
  index,
  at,
  size,
  selected,
  wrong,
  feature,
  handlers,
}: {
  index: number;
  at: { point: Vec3; normal: Vec3 };
  size: number;
  selected: boolean;
  wrong: boolean;
  feature: FeatureRef;
  handlers: MarkerHandlers;
}) {
  const kind = singularityKind(index);
  const rotation = useMemo(() => orientation(at.normal), [at.normal]);
  const colour = wrong ? COLOURS.wrong : kind === 'whorl' ? COLOURS.whorl : kind === 'saddle' ? COLOURS.saddle : COLOURS.other;
  return (
    <group position={at.point} quaternion={rotation}>
      <mesh onPointerDown={(event) => handlers.onMarkerDown(feature, event)} position={[0, size * 0.6, 0]}>
        {kind === 'whorl' ? <sphereGeometry args={[size * 0.55, 20, 14]} /> : kind === 'saddle' ? <octahedronGeometry args={[size * 0.65]} /> : <dodecahedronGeometry args={[size * 0.6]} />}
        <meshStandardMaterial color={colour} roughness={0.5} />
      </mesh>
      <mesh rotation={[Math.PI / 2, 0, 0]} raycast={() => undefined}>
        <torusGeometry args={[size * (selected ? 1.25 : 0.9), size * (selected ? 0.16 : 0.09), 8, 40]} />
        <meshStandardMaterial color={selected ? COLOURS.selected : colour} side={DoubleSide} />
      </mesh>
    </group>
  );
}, sameMarker);

const PinMarker = memo(function PinMarker({ at, size, selected, feature, handlers }: { at: { point: Vec3; normal: Vec3 }; size: number; selected: boolean; feature: FeatureRef; handlers: MarkerHandlers }) {
  const rotation = useMemo(() => orientation(at.normal), [at.normal]);
  return (
    <group position={at.point} quaternion={rotation}>
      <mesh position={[0, size * 0.9, 0]} rotation={[Math.PI, 0, 0]} onPointerDown={(event) => handlers.onMarkerDown(feature, event)}>
        <coneGeometry args={[size * 0.4, size * 1.6, 4]} />
        <meshStandardMaterial color={selected ? COLOURS.selected : COLOURS.pin} roughness={0.6} />
      </mesh>
    </group>
  );
}, sameMarker);

/**
 * A grain mark: the ghost of a suggested whorl or saddle, see-through and ringed, which a click
 * takes into the spec. The click is a press and a release on the ghost close together, as the
 * tools count clicks: Chromium sends no DOM click once the view's orbit controls have captured
 * the pointer, so R3F's onClick would never come. It swallows its own pointer events, so the
 * active tool does not also act.
 */
const GrainMarkGhost = memo(function GrainMarkGhost({ mark, size, onTake }: { mark: GrainMark; size: number; onTake: (mark: GrainMark) => void }) {
  const kind = singularityKind(mark.index);
  const rotation = useMemo(() => orientation(mark.normal), [mark.normal]);
  const press = useRef<{ x: number; y: number } | null>(null);
  const colour = kind === 'whorl' ? COLOURS.whorl : kind === 'saddle' ? COLOURS.saddle : COLOURS.grain;
  return (
    <group position={mark.point} quaternion={rotation} name="grain-mark">
      <mesh
        position={[0, size * 0.6, 0]}
        onPointerDown={(event) => {
          if (event.nativeEvent.button !== 0) return;
          event.stopPropagation();
          press.current = { x: event.nativeEvent.clientX, y: event.nativeEvent.clientY };
        }}
        onPointerUp={(event) => {
          event.stopPropagation();
          const start = press.current;
          press.current = null;
          if (start && Math.hypot(event.nativeEvent.clientX - start.x, event.nativeEvent.clientY - start.y) <= CLICK_TRAVEL) onTake(mark);
        }}
      >
        <sphereGeometry args={[size * 0.7, 16, 12]} />
        <meshStandardMaterial color={colour} transparent opacity={0.45} depthWrite={false} />
      </mesh>
      <mesh rotation={[Math.PI / 2, 0, 0]} raycast={() => undefined}>
        <torusGeometry args={[size * 1.1, size * 0.06, 6, 40]} />
        <meshStandardMaterial color={colour} transparent opacity={0.7} side={DoubleSide} />
      </mesh>
    </group>
  );
});

/** Markers are drawn again only when something about them changed (not on every render of the page). */
function sameMarker<P extends { at: { point: Vec3; normal: Vec3 }; feature: FeatureRef }>(a: P, b: P): boolean {
  for (const key of Object.keys(a) as (keyof P)[]) {
    if (key === 'at' || key === 'feature') continue;
    if (a[key] !== b[key]) return false;
  }
  return a.at.point.every((x, i) => x === b.at.point[i]) && a.at.normal.every((x, i) => x === b.at.normal[i]) && a.feature.kind === b.feature.kind && a.feature.index === b.feature.index;
}

/** A flow stroke's polyline; its geometry is rebuilt only when the stroke itself changes. */
const StrokeLine = memo(function StrokeLine({ points, selected }: { points: readonly (readonly number[])[]; selected: boolean }) {
  const flat = useMemo(() => Float32Array.from(points.flat()), [points]);
  return <FatLine points={flat} colour={selected ? COLOURS.selected : COLOURS.flow} width={selected ? 5 : 3} dashed />;
});

export function EditorScene({
  surface,
  spec,
  solve,
  fieldLines,
  fieldShade,
  fieldFaded,
  guides,
  guidesFaded,
  showGuides,
  selection,
  draft,
  draftPath,
  meshRef,
  handlers,
  pointer,
  onFieldDrawn,
  onSurfaceDrawn,
  grainMarks,
  onTakeMark,
  tint = null,
  surfaceGeometry,
}: {
  surface: OpenedSurface;
  /** The surface's geometry when the page keeps it (useDrawnSurface); made from `surface` when absent. */
  surfaceGeometry?: BufferGeometry;
  spec: GroomSpec;
  solve: SolveReport | null;
  fieldLines: Float32Array | null;
  fieldShade: Float32Array | null;
  fieldFaded: boolean;
  guides: GrownGuides | null;
  guidesFaded: boolean;
  showGuides: boolean;
  selection: FeatureRef | null;
  draft: readonly Vec3[];
  draftPath: Float32Array | null;
  meshRef: RefObject<Mesh | null>;
  handlers: MarkerHandlers;
  pointer: { down: SurfacePointerHandler; move: SurfacePointerHandler; up: SurfacePointerHandler };
  onFieldDrawn: () => void;
  onSurfaceDrawn?: () => void;
  /** Grain marks still to take (none when no reading is in view). */
  grainMarks: readonly GrainMark[];
  onTakeMark: (mark: GrainMark) => void;
  /** The map or mask the brush paints, drawn over the surface (`version` changes when the values change in place). */
  tint?: { readonly values: Float64Array; readonly kind: 'map' | 'mask'; readonly version: number } | null;
}) {
  const size = surface.diagonal * 0.014;
  const guideLines = useMemo(() => (guides ? guideSegments(guides) : null), [guides]);
  const guideColours = useMemo(() => (guides ? guideSetColours(guides) : null), [guides]);
  const reportFits = (list: readonly unknown[] | undefined, length: number) => !!list && list.length === length;
  const singularVertices = reportFits(solve?.singularities, spec.field.singularities.length) ? solve!.singularities : null;
  const pinVertices = reportFits(solve?.pinVertices, spec.pins.length) ? solve!.pinVertices : null;
  const curves = solve && solve.curves.length === spec.field.partings.length + spec.field.crests.length ? solve.curves : null;

  return (
    <>
      <SurfaceMesh positions={surface.positions} triangles={surface.triangles} normals={surface.vertexNormals} closed={surface.components.every((c) => c.boundaryLoopCount === 0)} meshRef={meshRef} onPointerDown={pointer.down} onPointerMove={pointer.move} onPointerUp={pointer.up} onDrawn={onSurfaceDrawn} hierarchy={surface.pickHierarchy} geometry={surfaceGeometry} />
      {tint && tint.values.length === surface.vertexCount && <TintOverlay positions={surface.positions} triangles={surface.triangles} normals={surface.vertexNormals} values={tint.values} kind={tint.kind} version={tint.version} />}
      {surface.boundaryLines.length > 0 && <LineLayer lines={surface.boundaryLines} tail={COLOURS.border} head={COLOURS.border} name="border" />}
      {fieldLines && (
        <LineLayer lines={fieldLines} shade={fieldShade} tail={COLOURS.strokeTail} head={COLOURS.strokeHead} opacity={fieldFaded ? 0.3 : 1} onDrawn={onFieldDrawn} name="field" />
      )}
      {showGuides && guideLines && <LineLayer lines={guideLines.lines} shade={guideLines.shade} colours={guideColours} tail={COLOURS.guideRoot} head={COLOURS.guideTip} opacity={guidesFaded ? 0.35 : 1} name="guides" />}
      {spec.field.singularities.map((s, index) => {
        const at = placeOnSurface(surface, singularVertices?.[index].vertex, s.point);
        if (!at) return null;
        const check = singularVertices?.[index];
        const wrong = !!check && check.measured !== null && Math.abs(check.measured - check.requested) > 1e-6;
        const feature: FeatureRef = { kind: 'singularity', index };
        return <SingularityMarker key={`s${index}`} index={s.index} at={at} size={size} selected={sameFeature(selection, feature)} wrong={wrong} feature={feature} handlers={handlers} />;
      })}
      {spec.pins.map((pin, index) => {
        const at = placeOnSurface(surface, pinVertices?.[index], pin.point);
        if (!at) return null;
        const feature: FeatureRef = { kind: 'pin', index };
        return <PinMarker key={`p${index}`} at={at} size={size} selected={sameFeature(selection, feature)} feature={feature} handlers={handlers} />;
      })}
      {curves?.map((curve, i) => {
        const feature: FeatureRef = i < spec.field.partings.length ? { kind: 'parting', index: i } : { kind: 'crest', index: i - spec.field.partings.length };
        const selected = sameFeature(selection, feature);
        return <FatLine key={`c${i}`} points={curve.points} colour={selected ? COLOURS.selected : curve.kind === 'parting' ? COLOURS.parting : COLOURS.crest} width={selected ? 6 : 4} />;
      })}
      {spec.field.strokes.map((stroke, index) => (
        <StrokeLine key={`k${index}`} points={stroke.points} selected={sameFeature(selection, { kind: 'stroke', index })} />
      ))}
      {grainMarks.map((mark) => (
        <GrainMarkGhost key={`g${mark.vertex}`} mark={mark} size={size} onTake={onTakeMark} />
      ))}
      {draftPath && <FatLine points={draftPath} colour={COLOURS.draft} width={4} dashed />}
      {draft.map((point, i) => (
        <mesh key={`d${i}`} position={point} raycast={() => undefined}>
          <sphereGeometry args={[size * 0.3, 10, 8]} />
          <meshStandardMaterial color={COLOURS.draft} />
        </mesh>
      ))}
    </>
  );
}
