'use client';
// "Tints": the groom's painted maps (each attribute's factor per vertex) and masks (a share per
// vertex, for guide sets to grow on). Add one, pick the one the tint brush paints (it is drawn on
// the surface in the tint ramp, with a legend), remove one. Every change is an edit of the spec,
// undoable and autosaved; painting itself is the tint tool's (lib/studio/client/tools/tint.ts).
import { useState } from 'react';
import { MAP_ATTRIBUTES, type GroomSpec, type MapAttribute } from '@/lib/groom/spec/spec';
import { TINT_RAMP, targetLabel, writeValues, type BrushOptions, type PaintTarget } from '@/lib/studio/client/paint';
import type { OpenedSurface } from '@/lib/studio/client/protocol';
import type { EditorActions } from './editor-actions';
import { MapAttributeSelect } from './MapAttributeSelect';

const css = (rgb: readonly number[]) => `rgb(${rgb.map((x) => Math.round(255 * x)).join(' ')})`;

function samePaint(a: PaintTarget | null, b: PaintTarget): boolean {
  return !!a && a.kind === b.kind && (a.kind === 'map' ? a.attribute === (b as typeof a).attribute : a.name === (b as typeof a).name);
}

export function TintsPanel({ spec, surface, actions, brush, onBrush, onPaint }: {
  spec: GroomSpec;
  surface: OpenedSurface | null;
  actions: EditorActions;
  brush: BrushOptions | null;
  onBrush: (brush: BrushOptions) => void;
  /** Picks the tint tool. */
  onPaint: () => void;
}) {
  const [problem, setProblem] = useState<string | null>(null);
  const [newAttribute, setNewAttribute] = useState<MapAttribute | ''>('');
  const [maskName, setMaskName] = useState('');
  const maps = spec.maps ?? [];
  const masks = spec.masks ?? [];
  const free = MAP_ATTRIBUTES.filter((a) => !maps.some((m) => m.attribute === a));
  const attribute = newAttribute && free.includes(newAttribute) ? newAttribute : free[0];
  const paints = brush?.paints ?? null;

  const pick = (target: PaintTarget) => {
    if (brush) onBrush({ ...brush, paints: target, ...(target.kind === 'mask' && brush.target > 1 ? { target: 1 } : {}) });
    onPaint();
  };
  /** Adds a map or mask of its unpainted values and picks it for the brush. */
  const add = (target: PaintTarget) => {
    if (!surface) return;
    const nV = surface.vertexCount;
    const blank = new Float64Array(nV).fill(target.kind === 'map' ? 1 : 0);
    const refused = actions.edit(writeValues(target, blank, { positions: surface.positions, triangles: surface.triangles }, target.kind === 'map' ? `Add a ${target.attribute} map` : `Add mask “${target.name}”`));
    setProblem(refused);
    if (!refused) pick(target);
  };
  const remove = (target: PaintTarget) => {
    const refused = actions.edit(target.kind === 'map' ? { type: 'remove-map', attribute: target.attribute } : { type: 'remove-mask', name: target.name });
    setProblem(refused);
    if (!refused && brush && samePaint(paints, target)) onBrush({ ...brush, paints: null });
  };

  const row = (target: PaintTarget, range: string) => (
    <li key={`${target.kind}:${target.kind === 'map' ? target.attribute : target.name}`} className="flex items-center gap-2 text-sm">
      <button
        type="button"
        aria-pressed={samePaint(paints, target)}
        onClick={() => pick(target)}
        title={`Tint ${targetLabel(target)} with the brush`}
        className={`flex flex-1 items-center justify-between rounded-lg px-2 py-1 text-left ${samePaint(paints, target) ? 'bg-vellum font-semibold text-loam' : 'text-loam-soft hover:bg-vellum/60'}`}
      >
        <span>{target.kind === 'map' ? target.attribute : target.name}</span>
        <span className="text-xs tabular-nums">{range}</span>
      </button>
      <button type="button" onClick={() => remove(target)} aria-label={`Remove ${targetLabel(target)}`} className="rounded-full px-2 text-xs font-semibold text-hawthorn hover:bg-hawthorn/10">
        Remove
      </button>
    </li>
  );

  return (
    <fieldset className="flex flex-col gap-2 rounded-xl bg-chalk p-3" aria-label="Tints" data-testid="tints-panel">
      <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">Tints</legend>
      <p className="text-xs text-loam-soft">Painted maps scale a setting where they are painted (1× is no change); painted masks mark where a guide set grows.</p>
      {maps.length + masks.length > 0 ? (
        <ul className="flex flex-col gap-1" data-testid="tint-list">
          {maps.map((m) => row({ kind: 'map', attribute: m.attribute }, m.low === m.high ? `${m.low}× everywhere` : `${m.low.toFixed(2)}× – ${m.high.toFixed(2)}×`))}
          {masks.map((m) => row({ kind: 'mask', name: m.name }, 'mask'))}
        </ul>
      ) : (
        <p className="text-xs text-loam-soft">No painted maps or masks yet.</p>
      )}
      {free.length > 0 && (
        <div className="flex items-end gap-2">
          <MapAttributeSelect label="Map for" value={attribute} options={free} onChange={setNewAttribute} className="flex-1" />
          <button type="button" disabled={!surface} onClick={() => add({ kind: 'map', attribute })} className="rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn disabled:opacity-40">
            Add map
          </button>
        </div>
      )}
      <form
        className="flex items-end gap-2"
        onSubmit={(event) => {
          event.preventDefault();
          const name = maskName.trim();
          if (!name) return setProblem('Give the mask a name.');
          if (masks.some((m) => m.name === name)) return setProblem(`There is already a mask named “${name}”.`);
          add({ kind: 'mask', name });
          setMaskName('');
        }}
      >
        <label className="flex flex-1 flex-col gap-1 text-xs font-semibold text-loam-soft">
          Mask name
          <input type="text" value={maskName} maxLength={100} onChange={(event) => setMaskName(event.target.value)} className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam" />
        </label>
        <button type="submit" disabled={!surface} className="rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn disabled:opacity-40">
          Add mask
        </button>
      </form>
      {paints && (
        <div className="flex flex-col gap-1" data-testid="tint-legend">
          <span className="text-xs font-semibold text-loam-soft">On the surface: {targetLabel(paints)}</span>
          <div
            aria-hidden
            className="h-2.5 rounded-full"
            style={{ background: paints.kind === 'map' ? `linear-gradient(90deg, ${css(TINT_RAMP.low)}, ${css(TINT_RAMP.bare)}, ${css(TINT_RAMP.high)})` : `linear-gradient(90deg, ${css(TINT_RAMP.bare)}, ${css(TINT_RAMP.mask)})` }}
          />
          <div className="flex justify-between text-xs text-loam-soft">
            {paints.kind === 'map' ? (
              <>
                <span>low: {TINT_RAMP.lowest}× or less</span>
                <span>1×</span>
                <span>high: {TINT_RAMP.highest}× or more</span>
              </>
            ) : (
              <>
                <span>low: outside</span>
                <span>high: inside</span>
              </>
            )}
          </div>
        </div>
      )}
      {problem && (
        <p role="alert" className="text-xs text-hawthorn">
          {problem}
        </p>
      )}
    </fieldset>
  );
}
