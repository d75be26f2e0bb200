'use client';
// Guide settings, applied as they are changed: the field worker grows the guides again with
// lib/groom's growGuides — the same guides an export writes — and the stage shows them.
import type { GroomSpec, GuideSettings } from '@/lib/groom/spec/spec';
import { MAX_GUIDES } from '@/lib/groom/spec/spec';
import type { GrownGuides } from '@/lib/studio/client/protocol';
import type { SpecEdit } from '@/lib/studio/client/spec-edits';
import { useState } from 'react';
import { CoatShapeFields } from './CoatShapeFields';
import { GuideSetList } from './GuideSetList';
import { ImageMapControl } from './ImageMapControl';
import { SettingSlider as Slider } from './SettingSlider';
import { NumberField } from '../ui/NumberField';
import type { EditorActions } from './editor-actions';

export function GuidePanel({
  spec,
  groups,
  actions,
  guides,
  current,
  error,
  show,
  onShow,
  surfaceId,
}: {
  spec: GroomSpec;
  groups: readonly string[];
  actions: EditorActions;
  guides: GrownGuides | null;
  current: boolean;
  error: string | null;
  show: boolean;
  onShow: (show: boolean) => void;
  /** The stored surface the groom grows on (none in the practice editor, which has no server). */
  surfaceId?: string;
}) {
  const [picked, setPicked] = useState(0);
  const sets = spec.guideSets;
  const chosen = sets ? Math.min(picked, sets.length - 1) : 0;
  // With guide sets the form below edits the chosen set's settings; without, the groom's one block.
  const g = sets ? sets[chosen].guides : spec.guides;
  const units = spec.units;
  const edit = (guides: GuideSettings): SpecEdit => (sets ? { type: 'update-guide-set', index: chosen, set: { ...sets[chosen], guides }, what: 'settings' } : { type: 'set-guides', guides });
  const put = (guides: GuideSettings) => actions.edit(edit(guides));
  const set = (changes: Partial<GuideSettings>) => put({ ...g, ...changes } as GuideSettings);
  const preview = (changes: Partial<GuideSettings>) => actions.preview(edit({ ...g, ...changes } as GuideSettings));
  const byCount = g.count !== undefined;
  const { density: _density, count: _count, ...rest } = g;
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-1.5 rounded-xl bg-chalk p-3">
        <label className="flex items-center gap-2 text-sm font-semibold text-loam">
          <input type="checkbox" checked={show} onChange={(event) => onShow(event.target.checked)} />
          Show the guides on the surface
        </label>
        <p className="text-xs text-loam-soft" aria-live="polite" data-testid="guide-status">
          {error
            ? `Guides wait for a field that solves: ${error}`
            : guides
              ? `${guides.count.toLocaleString('en-GB')} guides over ${guides.areaSquareCm.toLocaleString('en-GB', { maximumFractionDigits: 0 })} cm², grown in ${(guides.milliseconds / 1000).toFixed(1)} s${guides.sets ? ` (${guides.sets.map((s) => `${s.name}: ${s.count.toLocaleString('en-GB')}`).join(', ')})` : ''}${current ? '' : ' — growing again for the latest change…'}`
              : show
                ? 'Growing the guides…'
                : 'Guides are hidden.'}
        </p>
      </div>

      <GuideSetList spec={spec} groups={groups} actions={actions} chosen={chosen} onChoose={setPicked} />

      <fieldset className="flex flex-col gap-2" aria-label={sets ? `Settings of ${sets[chosen].name}` : 'Guide settings'}>
        <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">{sets ? `How many in “${sets[chosen].name}”` : 'How many'}</legend>
        <div className="flex gap-4 text-sm text-loam">
          <label className="flex items-center gap-1.5">
            <input type="radio" name="amount" checked={!byCount} onChange={() => put({ ...rest, density: g.density ?? 1 } as GuideSettings)} />
            By density
          </label>
          <label className="flex items-center gap-1.5">
            <input type="radio" name="amount" checked={byCount} onChange={() => put({ ...rest, count: (sets ? guides?.sets?.[chosen]?.count : guides?.count) || 1000 } as GuideSettings)} />
            By count
          </label>
        </div>
        {byCount ? (
          <NumberField label="Guides" value={g.count} min={1} max={MAX_GUIDES} integer onCommit={(count) => put({ ...rest, count } as GuideSettings)} />
        ) : (
          <NumberField label="Guides per cm²" value={g.density} min={0.0001} max={10_000} onCommit={(density) => put({ ...rest, density } as GuideSettings)} />
        )}
        {!sets && groups.length > 0 && (
          <div className="flex flex-col gap-1">
            <span className="text-xs font-semibold text-loam-soft">Grow on (none ticked: the whole surface)</span>
            <div className="flex flex-wrap gap-x-4 gap-y-1">
              {groups.map((name) => (
                <label key={name} className="flex items-center gap-1.5 text-sm text-loam">
                  <input
                    type="checkbox"
                    checked={g.regions.includes(name)}
                    onChange={(event) => set({ regions: event.target.checked ? [...g.regions, name] : g.regions.filter((r) => r !== name) })}
                  />
                  {name}
                </label>
              ))}
            </div>
          </div>
        )}
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="pb-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">Shape</legend>
        <div className="grid grid-cols-2 gap-2">
          <NumberField label="Length" unit={units} value={g.length} min={1e-6} max={1e6} onCommit={(length) => set({ length })} />
        </div>
        <Slider label="Lift off the skin" unit="°" value={g.lift} min={0} max={90} step={1} onPreview={(lift) => preview({ lift })} onFinish={actions.finish} />
        <Slider label="Droop" value={g.droop} min={0} max={1} step={0.01} onPreview={(droop) => preview({ droop })} onFinish={actions.finish} />
        <Slider label="Jitter" value={g.jitter} min={0} max={1} step={0.01} onPreview={(jitter) => preview({ jitter })} onFinish={actions.finish} />
        <div className="grid grid-cols-2 gap-2">
          <NumberField label="Curl radius" unit={units} value={g.curl.amplitude} min={0} max={1e6} onCommit={(amplitude) => set({ curl: { ...g.curl, amplitude } })} />
          <NumberField label="Curl length" unit={units} value={g.curl.wavelength} min={1e-6} max={1e6} onCommit={(wavelength) => set({ curl: { ...g.curl, wavelength } })} />
          <NumberField label="Points per guide" value={g.pointsPerGuide} min={2} max={64} integer onCommit={(pointsPerGuide) => set({ pointsPerGuide })} />
          <NumberField label="Hairs per guide" value={g.hairsPerGuide} min={1} max={100_000} integer onCommit={(hairsPerGuide) => set({ hairsPerGuide })} />
        </div>
        <div className="flex items-end gap-2">
          <div className="flex-1">
            <NumberField label="Seed" value={g.seed} min={0} max={2 ** 32 - 1} integer onCommit={(seed) => set({ seed })} />
          </div>
          <button type="button" onClick={() => set({ seed: (g.seed * 2654435761 + 12345) % 2 ** 32 })} className="mb-0.5 rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn">
            Another seed
          </button>
        </div>
      </fieldset>
      <CoatShapeFields key={sets ? `set-${chosen}` : 'groom'} settings={g} units={units} onEdit={set} onPreview={preview} onFinish={actions.finish} />
      {surfaceId && <ImageMapControl spec={spec} surfaceId={surfaceId} actions={actions} />}
      <p className="text-xs text-loam-soft">Pins (Features → Add pin) vary length, lift, droop, curl, jitter or density over the surface.</p>
    </div>
  );
}
