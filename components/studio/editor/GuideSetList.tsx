'use client';
// The Guides panel's list of guide sets: add, pick, rename, delete, and where the picked set grows
// (face groups, one side of a parting, or a painted mask). Each set shows the colours it is drawn in. Every change
// is an edit of the spec, undoable and autosaved like any other.
import { useState } from 'react';
import type { GroomSpec, GuideSetRegion, GuideSetSpec } from '@/lib/groom/spec/spec';
import { featureLabel } from '@/lib/studio/client/features';
import { guideSetColour, newGuideSet } from '@/lib/studio/client/guide-sets';
import type { EditorActions } from './editor-actions';

export function GuideSetList({ spec, groups, actions, chosen, onChoose }: { spec: GroomSpec; groups: readonly string[]; actions: EditorActions; chosen: number; onChoose: (index: number) => void }) {
  const sets = spec.guideSets;
  const set = sets?.[chosen];
  const update = (next: GuideSetSpec, what: 'rename' | 'region') => actions.edit({ type: 'update-guide-set', index: chosen, set: next, what });
  return (
    <fieldset className="flex flex-col gap-2 rounded-xl bg-chalk p-3" aria-label="Guide sets">
      <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">Guide sets</legend>
      {sets ? (
        <ul className="flex flex-col gap-1" data-testid="guide-set-list">
          {sets.map((s, i) => {
            const colour = guideSetColour(i);
            return (
              <li key={`${i}:${s.name}`}>
                <button
                  type="button"
                  aria-pressed={i === chosen}
                  onClick={() => onChoose(i)}
                  className={`flex w-full items-center gap-2 rounded-lg px-2 py-1 text-left text-sm ${i === chosen ? 'bg-vellum font-semibold text-loam' : 'text-loam-soft hover:bg-vellum/60'}`}
                >
                  <span aria-hidden className="h-3 w-6 rounded-full" style={{ background: `linear-gradient(90deg, ${colour.root}, ${colour.tip})` }} />
                  {s.name}
                </button>
              </li>
            );
          })}
        </ul>
      ) : (
        <p className="text-xs text-loam-soft">One set of guides covers the groom. Add a set to grow another part of the surface with its own settings.</p>
      )}
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          onClick={() => {
            actions.edit({ type: 'add-guide-set', set: newGuideSet(spec, sets ? chosen : undefined) });
            onChoose(sets ? sets.length : 1);
          }}
          className="rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn"
        >
          Add a guide set
        </button>
        {set && (
          <button
            type="button"
            onClick={() => {
              actions.edit({ type: 'remove-guide-set', index: chosen });
              onChoose(Math.max(0, chosen - 1));
            }}
            className="rounded-full border-2 border-hawthorn/30 px-3 py-1 text-xs font-semibold text-hawthorn hover:border-hawthorn"
          >
            Delete this set
          </button>
        )}
      </div>
      {set && <SetName key={`${chosen}:${set.name}`} name={set.name} onCommit={(name) => name !== set.name && update({ ...set, name }, 'rename')} />}
      {set && <SetRegion spec={spec} groups={groups} region={set.region} onChange={(region) => update({ ...set, region }, 'region')} />}
    </fieldset>
  );
}

function SetName({ name, onCommit }: { name: string; onCommit: (name: string) => void }) {
  const [text, setText] = useState(name);
  const commit = () => (text.trim() ? onCommit(text.trim()) : setText(name));
  return (
    <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
      Set name
      <input
        type="text"
        value={text}
        maxLength={100}
        onChange={(event) => setText(event.target.value)}
        onBlur={commit}
        onKeyDown={(event) => event.key === 'Enter' && commit()}
        className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam"
      />
    </label>
  );
}

/** The markers a side of a parting can start from: every singularity and pin, by its place. */
function markers(spec: GroomSpec) {
  return [
    ...spec.field.singularities.map((s, index) => ({ label: featureLabel(spec, { kind: 'singularity', index }), place: s })),
    ...spec.pins.map((p, index) => ({ label: featureLabel(spec, { kind: 'pin', index }), place: p })),
  ].map(({ label, place }) => ({ label, from: place.point ? { point: place.point } : { vertex: place.vertex! } }));
}

function SetRegion({ spec, groups, region, onChange }: { spec: GroomSpec; groups: readonly string[]; region: GuideSetRegion; onChange: (region: GuideSetRegion) => void }) {
  const byMask = region.mask !== undefined;
  const bySide = region.partings !== undefined;
  const masks = spec.masks ?? [];
  const partings = spec.field.partings;
  const starts = markers(spec);
  const chosenStart = region.from ? starts.findIndex((m) => JSON.stringify(m.from) === JSON.stringify({ ...(region.from!.point ? { point: region.from!.point } : { vertex: region.from!.vertex }) })) : -1;
  const canSide = partings.length > 0 && starts.length > 0;
  const groupsOf = region.groups ?? [];
  return (
    <div className="flex flex-col gap-1.5">
      <span className="text-xs font-semibold text-loam-soft">This set grows on</span>
      <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-loam">
        <label className="flex items-center gap-1.5">
          <input type="radio" name="set-region" checked={!bySide && !byMask} onChange={() => onChange({ groups: [] })} />
          Face groups
        </label>
        <label className="flex items-center gap-1.5" title={canSide ? undefined : 'Draw a parting and place a marker on the side to grow on first.'}>
          <input type="radio" name="set-region" checked={bySide} disabled={!canSide} onChange={() => onChange({ partings: [0], from: starts[0].from })} />
          One side of a parting
        </label>
        <label className="flex items-center gap-1.5" title={masks.length > 0 ? undefined : 'Add a mask in the Tints panel and paint it first.'}>
          <input type="radio" name="set-region" checked={byMask} disabled={masks.length === 0} onChange={() => onChange({ mask: masks[0].name })} />
          A painted mask
        </label>
      </div>
      {byMask && (
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          Mask (faces whose corners are half painted or more)
          <select value={region.mask} onChange={(event) => onChange({ mask: event.target.value })} className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam">
            {masks.map((m) => (
              <option key={m.name} value={m.name}>
                {m.name}
              </option>
            ))}
          </select>
        </label>
      )}
      {!bySide && !byMask && groups.length > 0 && (
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          {groups.map((name) => (
            <label key={name} className="flex items-center gap-1.5 text-sm text-loam">
              <input type="checkbox" checked={groupsOf.includes(name)} onChange={(event) => onChange({ groups: event.target.checked ? [...groupsOf, name] : groupsOf.filter((g) => g !== name) })} />
              {name}
            </label>
          ))}
        </div>
      )}
      {!bySide && !byMask && <span className="text-xs text-loam-soft">{groupsOf.length === 0 ? 'No group ticked: the whole surface.' : ''}</span>}
      {bySide && (
        <div className="grid grid-cols-2 gap-2">
          <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
            Parting
            <select value={region.partings![0]} onChange={(event) => onChange({ ...region, partings: [Number(event.target.value)] })} className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam">
              {partings.map((_p, i) => (
                <option key={i} value={i}>
                  {featureLabel(spec, { kind: 'parting', index: i })}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
            The side holding
            <select value={Math.max(0, chosenStart)} onChange={(event) => onChange({ ...region, from: starts[Number(event.target.value)].from })} className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam">
              {starts.map((m, i) => (
                <option key={i} value={i}>
                  {m.label}
                </option>
              ))}
            </select>
          </label>
        </div>
      )}
    </div>
  );
}
