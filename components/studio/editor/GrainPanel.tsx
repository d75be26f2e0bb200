'use client';
// "Read the grain": the smoothest field of the spec's order with its singularities left free,
// optionally falling or following the bending, shown on the stage as grain marks to take.
import { useState } from 'react';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { formatIndex } from '@/lib/studio/client/features';
import { describeMarks, takeAllMarks, takeMark } from '@/lib/studio/client/grain-marks';
import type { GrainFollow, GrainMark } from '@/lib/studio/client/protocol';
import type { EditorActions } from './editor-actions';
import type { GrainSession } from './hooks/useGrain';

/** Most marks listed by name; the rest are on the stage and in "Take all". */
const LISTED_MARKS = 24;

function markName(mark: GrainMark, order: number): string {
  return mark.index === 1 ? 'Whorl mark' : mark.index === -1 ? 'Saddle mark' : `Mark ${formatIndex(mark.index, order)}`;
}

export function GrainPanel({ spec, grain, actions, onLookAt }: { spec: GroomSpec; grain: GrainSession; actions: EditorActions; onLookAt: (mark: GrainMark) => void }) {
  const [toward, setToward] = useState<GrainFollow['toward']>('nothing');
  const [weight, setWeight] = useState(1);
  const [refusal, setRefusal] = useState<string | null>(null);
  const even = spec.field.order % 2 === 0;
  const reading = grain.reading;
  return (
    <fieldset className="flex flex-col gap-2" aria-label="Read the grain">
      <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">Read the grain</legend>
      <p className="text-xs text-loam-soft">Where would the smoothest coat put its whorls and saddles? See-through marks appear on the surface; click one to place it there, or take them all.</p>
      <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
        Lean toward
        <select value={toward} onChange={(event) => setToward(event.target.value as GrainFollow['toward'])} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
          <option value="nothing">Nothing — smoothest only</option>
          <option value="fall">Falling — hair hangs down</option>
          {even && <option value="bending">The bending — along limbs and creases</option>}
        </select>
      </label>
      {toward !== 'nothing' && (
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          <span className="flex justify-between">
            How strongly<span className="tabular-nums text-loam">{weight.toFixed(1)}</span>
          </span>
          <input type="range" min={0.1} max={20} step={0.1} value={weight} onChange={(event) => setWeight(Number(event.target.value))} className="accent-bracken" />
        </label>
      )}
      <button
        type="button"
        disabled={grain.busy}
        onClick={() => grain.read({ toward: toward === 'bending' && !even ? 'nothing' : toward, weight })}
        className="self-start rounded-full bg-bracken px-4 py-1.5 text-sm font-semibold text-white disabled:opacity-50"
      >
        {grain.busy ? 'Reading…' : 'Read the grain'}
      </button>
      {grain.error && <p className="text-xs font-medium text-hawthorn">{grain.error}</p>}
      {reading && (
        <div className="flex flex-col gap-2 rounded-xl bg-chalk p-3 text-sm text-loam" data-testid="grain-reading">
          <p>{describeMarks(reading.marks, reading.order)}</p>
          <p className="text-xs text-loam-soft">{grain.left.length === 0 ? 'All taken.' : `${grain.left.length} still to take.`}</p>
          <div className="flex gap-2">
            <button
              type="button"
              disabled={reading.marks.length === 0}
              onClick={() => setRefusal(actions.edit(takeAllMarks(spec, reading.marks)))}
              className="rounded-full border-2 border-bracken px-3 py-1 text-xs font-semibold text-bracken disabled:opacity-50"
            >
              Take all
            </button>
            <button type="button" onClick={grain.dismiss} className="rounded-full border-2 border-vellum px-3 py-1 text-xs font-semibold text-loam">
              Dismiss
            </button>
          </div>
          {refusal && <p className="text-xs font-medium text-hawthorn">{refusal}</p>}
          {grain.left.length > 0 && (
            <ul className="flex flex-col gap-1 text-xs" aria-label="Marks still to take">
              {grain.left.slice(0, LISTED_MARKS).map((mark, i) => {
                const name = `${markName(mark, reading.order)} ${i + 1}`;
                return (
                  <li key={mark.vertex} className="flex items-center justify-between gap-2">
                    <span>{name}</span>
                    <span className="flex gap-1">
                      <button type="button" onClick={() => onLookAt(mark)} aria-label={`Look at ${name.toLowerCase()}`} className="rounded-full border border-vellum px-2 py-0.5 font-semibold text-loam">
                        Look at
                      </button>
                      <button type="button" onClick={() => setRefusal(actions.edit(takeMark(mark)))} aria-label={`Take ${name.toLowerCase()}`} className="rounded-full border border-bracken px-2 py-0.5 font-semibold text-bracken">
                        Take
                      </button>
                    </span>
                  </li>
                );
              })}
            </ul>
          )}
        </div>
      )}
    </fieldset>
  );
}
