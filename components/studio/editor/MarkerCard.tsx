'use client';
// A small card beside the picked marker on the stage: a singularity's twist and turn, or a pin's
// factor, changed right where it stands. It follows the marker as the view turns (its position is
// written straight to the element at each drawn frame, without re-rendering the page).
import { useFrame, useThree } from '@react-three/fiber';
import { useEffect, useRef, type RefObject } from 'react';
import { Vector3 } from 'three';
import type { GroomSpec, SingularitySpec } from '@/lib/groom/spec/spec';
import { featureLabel, formatIndex, type FeatureRef, type Vec3 } from '@/lib/studio/client/features';
import type { EditorActions } from './editor-actions';

/** Inside the canvas: keeps `element` next to the screen position of `point`. */
export function ScreenAnchor({ point, element }: { point: Vec3 | null; element: RefObject<HTMLDivElement | null> }) {
  const camera = useThree((state) => state.camera);
  const size = useThree((state) => state.size);
  const invalidate = useThree((state) => state.invalidate);
  const scratch = useRef(new Vector3());
  useEffect(() => invalidate(), [invalidate, point]);
  useFrame(() => {
    const card = element.current;
    if (!card) return;
    if (!point) {
      card.style.visibility = 'hidden';
      return;
    }
    const p = scratch.current.set(...point).project(camera);
    const behind = p.z > 1;
    const x = ((p.x + 1) / 2) * size.width;
    const y = ((1 - p.y) / 2) * size.height;
    card.style.visibility = behind ? 'hidden' : 'visible';
    card.style.transform = `translate(${Math.round(Math.min(size.width - 250, x + 18))}px, ${Math.round(Math.max(8, Math.min(size.height - 200, y - 40)))}px)`;
  });
  return null;
}

export function MarkerCard({ spec, feature, actions, element, onNotice }: { spec: GroomSpec; feature: FeatureRef | null; actions: EditorActions; element: RefObject<HTMLDivElement | null>; onNotice: (words: string) => void }) {
  /** Deleting takes one click, so the stage says how to bring the feature back. */
  const remove = () => {
    const label = featureLabel(spec, feature!);
    if (actions.edit({ type: 'remove', feature: feature! }) === null) onNotice(`${label} deleted. Undo (Ctrl+Z) brings it back.`);
  };
  const singularity = feature?.kind === 'singularity' ? spec.field.singularities[feature.index] : undefined;
  const pin = feature?.kind === 'pin' ? spec.pins[feature.index] : undefined;
  const show = !!feature && (!!singularity || !!pin);
  const update = (next: SingularitySpec, live: boolean) => {
    const change = { type: 'update-singularity' as const, index: feature!.index, singularity: next };
    return live ? actions.preview(change) : actions.edit(change);
  };
  return (
    <div
      ref={element}
      className="pointer-events-auto absolute left-0 top-0 z-10 w-60 rounded-2xl bg-chalk/95 p-3 text-loam shadow-xl"
      style={{ visibility: 'hidden', display: show ? 'block' : 'none' }}
      role="group"
      aria-label={feature && show ? `${featureLabel(spec, feature)} on the surface` : undefined}
      data-testid="marker-card"
    >
      {feature && singularity && (
        <div className="flex flex-col gap-2">
          <p className="text-sm font-bold">
            {featureLabel(spec, feature)} <span className="font-normal text-loam-soft">index {formatIndex(singularity.index, spec.field.order)}</span>
          </p>
          <label className="flex items-center gap-2 text-xs">
            <input
              type="checkbox"
              checked={singularity.twist === undefined}
              onChange={(event) => {
                const { twist: _twist, ...rest } = singularity;
                update(event.target.checked ? rest : { ...rest, twist: 0 }, false);
              }}
            />
            Twist chosen by the solve
          </label>
          {singularity.twist !== undefined && (
            <>
              <label className="flex flex-col gap-0.5 text-xs font-semibold text-loam-soft">
                <span className="flex justify-between">
                  Twist <span className="tabular-nums text-loam">{singularity.twist}°</span>
                </span>
                <input
                  type="range"
                  min={0}
                  max={180}
                  step={5}
                  value={singularity.twist}
                  onChange={(event) => update({ ...singularity, twist: Number(event.target.value) }, true)}
                  onPointerUp={actions.finish}
                  onKeyUp={actions.finish}
                  onBlur={actions.finish}
                  className="accent-bracken"
                />
                <span className="flex justify-between font-normal">
                  <span>out</span>
                  <span>spiral</span>
                  <span>in</span>
                </span>
              </label>
              <div className="flex gap-1" role="group" aria-label="Turn, seen from outside">
                {(['counterclockwise', 'clockwise'] as const).map((turn) => (
                  <button
                    key={turn}
                    type="button"
                    aria-pressed={singularity.handedness === turn}
                    onClick={() => update({ ...singularity, handedness: turn }, false)}
                    className={`flex-1 rounded-full px-2 py-1 text-xs font-semibold ${singularity.handedness === turn ? 'bg-tarn text-chalk' : 'border border-tarn/30 text-tarn'}`}
                  >
                    {turn === 'counterclockwise' ? 'counter-clockwise' : 'clockwise'}
                  </button>
                ))}
              </div>
            </>
          )}
          <button type="button" onClick={remove} className="self-start text-xs font-semibold text-hawthorn underline">
            Delete
          </button>
        </div>
      )}
      {feature && pin && (
        <div className="flex flex-col gap-2">
          <p className="text-sm font-bold">{featureLabel(spec, feature)}</p>
          <label className="flex flex-col gap-0.5 text-xs font-semibold text-loam-soft">
            <span className="flex justify-between">
              Factor <span className="tabular-nums text-loam">× {pin.value}</span>
            </span>
            <input
              type="range"
              min={0}
              max={5}
              step={0.05}
              value={Math.min(5, pin.value)}
              onChange={(event) => actions.preview({ type: 'update-pin', index: feature.index, pin: { ...pin, value: Number(event.target.value) } })}
              onPointerUp={actions.finish}
              onKeyUp={actions.finish}
              onBlur={actions.finish}
              className="accent-bracken"
            />
          </label>
          <button type="button" onClick={remove} className="self-start text-xs font-semibold text-hawthorn underline">
            Delete
          </button>
        </div>
      )}
    </div>
  );
}
