'use client';
// Settings of the field itself (its order, how it meets the border, an overall turn, the up axis)
// and of how the stage draws it (strokes or streamlines, and how many).
import { useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import type { DisplayOptions, OpenedSurface } from '@/lib/studio/client/protocol';
import { NumberField } from '../ui/NumberField';
import type { EditorActions } from './editor-actions';

const BOUNDARY_WORDS = {
  free: 'Free — the smoothest field, no sum asked of the indices',
  tangent: 'Along the border — hair follows the edge',
  normal: 'Across the border — hair points into the surface',
} as const;

export function FieldPanel({ spec, surface, actions, display, onDisplay }: { spec: GroomSpec; surface: OpenedSurface | null; actions: EditorActions; display: DisplayOptions; onDisplay: (display: DisplayOptions) => void }) {
  const hasBorder = !!surface && surface.components.some((c) => c.boundaryLoopCount > 0);
  const [orderError, setOrderError] = useState<string | null>(null);
  const maxStrokes = Math.max(500, Math.min(60_000, surface?.faceCount ?? 20_000));
  return (
    <div className="flex flex-col gap-5">
      <fieldset className="flex flex-col gap-2">
        <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">Drawing the field</legend>
        <div className="flex gap-4 text-sm text-loam">
          <label className="flex items-center gap-1.5">
            <input type="radio" name="drawing" checked={display.drawing === 'strokes'} onChange={() => onDisplay({ ...display, drawing: 'strokes' })} />
            Short strokes
          </label>
          <label className="flex items-center gap-1.5">
            <input type="radio" name="drawing" checked={display.drawing === 'streamlines'} onChange={() => onDisplay({ ...display, drawing: 'streamlines' })} />
            Streamlines
          </label>
        </div>
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          <span className="flex justify-between">
            Density<span className="tabular-nums text-loam">about {display.density.toLocaleString('en-GB')} strokes</span>
          </span>
          <input
            type="range"
            min={Math.log(500)}
            max={Math.log(maxStrokes)}
            step={0.01}
            value={Math.log(Math.min(maxStrokes, display.density))}
            onChange={(event) => onDisplay({ ...display, density: Math.round(Math.exp(Number(event.target.value)) / 50) * 50 })}
            className="accent-bracken"
          />
        </label>
        <p className="text-xs text-loam-soft">Each stroke shades from light at its tail to dark at its head: the way the hair points.</p>
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">The field</legend>
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          Directions per point
          <select
            value={spec.field.order}
            onChange={(event) => {
              // A new order can make placed indices impossible (not multiples of 1/n): say why.
              setOrderError(actions.edit({ type: 'set-field', settings: { order: Number(event.target.value) } }));
            }}
            className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam"
          >
            <option value={1}>1 — hair direction</option>
            <option value={2}>2 — lines (no head or tail)</option>
            <option value={4}>4 — crosses</option>
            {[3, 5, 6, 7, 8, 9, 10, 11, 12].map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
          {orderError && <span className="font-medium text-hawthorn">{orderError}</span>}
        </label>
        {hasBorder && (
          <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
            At the border
            <select value={spec.field.boundary} onChange={(event) => actions.edit({ type: 'set-field', settings: { boundary: event.target.value as GroomSpec['field']['boundary'] } })} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
              {(Object.keys(BOUNDARY_WORDS) as (keyof typeof BOUNDARY_WORDS)[]).map((mode) => (
                <option key={mode} value={mode}>
                  {BOUNDARY_WORDS[mode]}
                </option>
              ))}
            </select>
            <span className="font-normal">Changing this prepares the solver again (a few seconds on a large surface).</span>
          </label>
        )}
        <NumberField label="Turn the whole field" unit="°" value={spec.field.rotation} min={-360} max={360} onCommit={(rotation) => actions.edit({ type: 'set-field', settings: { rotation } })} />
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          Up is
          <select value={spec.upAxis} onChange={(event) => actions.edit({ type: 'replace', spec: { ...spec, upAxis: event.target.value as GroomSpec['upAxis'] }, label: 'Change the up axis' })} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
            <option value="y">+Y (hair falls toward −Y)</option>
            <option value="z">+Z (hair falls toward −Z)</option>
          </select>
        </label>
      </fieldset>
      {surface && (
        <dl className="grid grid-cols-2 gap-x-3 gap-y-1 rounded-xl bg-chalk p-3 text-xs text-loam">
          <dt className="text-loam-soft">Faces</dt>
          <dd className="tabular-nums">{surface.faceCount.toLocaleString('en-GB')}</dd>
          <dt className="text-loam-soft">Vertices</dt>
          <dd className="tabular-nums">{surface.vertexCount.toLocaleString('en-GB')}</dd>
          {surface.components.map((c, i) => (
            <div key={i} className="col-span-2 grid grid-cols-2 gap-x-3">
              <dt className="text-loam-soft">{surface.components.length > 1 ? `Piece ${i + 1}` : 'Shape'}</dt>
              <dd>
                χ = {c.eulerCharacteristic}, genus {c.genus}, {c.boundaryLoopCount} border loop{c.boundaryLoopCount === 1 ? '' : 's'}
              </dd>
            </div>
          ))}
          <dt className="text-loam-soft">Solver prepared in</dt>
          <dd className="tabular-nums">{(surface.timings.prepareMilliseconds / 1000).toFixed(1)} s</dd>
        </dl>
      )}
    </div>
  );
}
