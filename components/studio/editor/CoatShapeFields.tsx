'use client';
// The coat's shaping in the guide settings form (the groom's own block or the picked set's): the
// widths, the tufts at both levels with their gather and loners, and the waver. Each concern is a
// group that folds away. Bounds come from the spec's schema (COAT_SETTING_RANGES), so a value the
// form accepts is one the spec accepts; each change is one undoable edit, which the editor
// autosaves and the field worker grows again.
import { useState, type ReactNode } from 'react';
import type { GuideSettings } from '@/lib/groom/spec/spec';
import { COAT_SETTING_RANGES as R, GATHER_DEFAULTS, WAVER_WAVES_DEFAULT, type SettingRange } from '@/lib/groom/spec/guide-settings';
import { NumberField, formatNumber } from '../ui/NumberField';
import { SettingSlider } from './SettingSlider';

type Tufts = NonNullable<GuideSettings['tufts']>;
type Gather = Tufts['gather'];
type Change = (changes: Partial<GuideSettings>) => string | null | void;

/** NumberField's bounds for a range, and the words for a lower bound that is itself refused (a density of 0). */
function bounds(range: SettingRange) {
  return {
    min: range.above ? undefined : range.min,
    max: range.max,
    check: (value: number) => (range.above && value <= range.min ? `Use more than ${formatNumber(range.min)}.` : null),
  };
}

function Bounded({ label, range, value, unit, onCommit }: { label: string; range: SettingRange; value: number | undefined; unit?: string; onCommit: (value: number) => string | null | void }) {
  const { min, max, check } = bounds(range);
  return <NumberField label={label} unit={unit} value={value} min={min} max={max} onCommit={(v) => check(v) ?? onCommit(v)} />;
}

function Group({ title, summary, children }: { title: string; summary: string; children: ReactNode }) {
  const [open, setOpen] = useState(false);
  return (
    <details open={open} onToggle={(event) => setOpen(event.currentTarget.open)} className="rounded-xl border-2 border-vellum px-3 py-2">
      <summary className="cursor-pointer text-xs font-bold uppercase tracking-[0.12em] text-bracken">
        {title} <span className="font-normal normal-case tracking-normal text-loam-soft">— {summary}</span>
      </summary>
      <div className="flex flex-col gap-2 pt-2">{children}</div>
    </details>
  );
}

function GatherFields({ label, gather, onEdit, onPreview, onFinish }: { label: string; gather: Gather; onEdit: (gather: Gather) => string | null | void; onPreview: (gather: Gather) => void; onFinish: () => void }) {
  return (
    <>
      <SettingSlider label={`${label} at the root`} percent value={gather.root} min={R.gatherRoot.min} max={R.gatherRoot.max} step={0.01} onPreview={(root) => onPreview({ ...gather, root })} onFinish={onFinish} />
      <SettingSlider label={`${label} at the tip`} percent value={gather.tip} min={R.gatherTip.min} max={R.gatherTip.max} step={0.01} onPreview={(tip) => onPreview({ ...gather, tip })} onFinish={onFinish} />
      <Bounded label={`${label}: rise (1 even; more closes nearer the tip)`} range={R.gatherRise} value={gather.rise} onCommit={(rise) => onEdit({ ...gather, rise })} />
    </>
  );
}

export function CoatShapeFields({ settings: g, units, onEdit, onPreview, onFinish }: { settings: GuideSettings; units: string; onEdit: Change; onPreview: (changes: Partial<GuideSettings>) => void; onFinish: () => void }) {
  const tufts = g.tufts;
  const withTufts = (changes: Partial<Tufts>) => ({ tufts: { ...tufts!, ...changes } });
  const waver = g.waver;
  return (
    <div className="flex flex-col gap-2" data-testid="coat-shape">
      <Group title="Width" summary={`${formatNumber(g.width, 3)} → ${formatNumber(g.tipWidth, 3)} ${units}`}>
        <div className="grid grid-cols-2 gap-2">
          <Bounded label="Root width" unit={units} range={R.width} value={g.width} onCommit={(width) => onEdit({ width })} />
          <Bounded label="Tip width" unit={units} range={R.tipWidth} value={g.tipWidth} onCommit={(tipWidth) => onEdit({ tipWidth })} />
        </div>
        <p className="text-xs text-loam-soft">Each guide tapers evenly from its root width to its tip width; width pins and maps scale both.</p>
      </Group>

      <Group title="Tufts" summary={tufts ? `${formatNumber(tufts.density, 3)} per cm²${tufts.inner ? ', with inner tufts' : ''}` : 'off'}>
        <label className="flex items-center gap-2 text-sm text-loam">
          <input
            type="checkbox"
            checked={tufts !== undefined}
            onChange={(event) => {
              if (event.target.checked) onEdit({ tufts: { density: 0.2, gather: GATHER_DEFAULTS, loners: 0 } });
              else onEdit({ tufts: undefined });
            }}
          />
          Gather the guides into tufts
        </label>
        {tufts && (
          <>
            <Bounded label="Tufts per cm²" range={R.tuftDensity} value={tufts.density} onCommit={(density) => onEdit(withTufts({ density }))} />
            <GatherFields label="Gather" gather={tufts.gather} onEdit={(gather) => onEdit(withTufts({ gather }))} onPreview={(gather) => onPreview(withTufts({ gather }))} onFinish={onFinish} />
            <SettingSlider label="Loners (guides kept out of every tuft)" percent value={tufts.loners} min={R.loners.min} max={R.loners.max} step={0.01} onPreview={(loners) => onPreview(withTufts({ loners }))} onFinish={onFinish} />
            <label className="flex items-center gap-2 pt-1 text-sm text-loam">
              <input
                type="checkbox"
                checked={tufts.inner !== undefined}
                onChange={(event) => {
                  if (event.target.checked) onEdit(withTufts({ inner: { density: tufts.density * 4, gather: GATHER_DEFAULTS } }));
                  else {
                    const { inner: _off, ...outer } = tufts;
                    onEdit({ tufts: outer });
                  }
                }}
              />
              Inner tufts inside each tuft
            </label>
            {tufts.inner && (
              <div className="flex flex-col gap-2 border-l-2 border-vellum pl-3">
                <Bounded label="Inner tufts per cm²" range={R.tuftDensity} value={tufts.inner.density} onCommit={(density) => onEdit(withTufts({ inner: { ...tufts.inner!, density } }))} />
                <GatherFields
                  label="Inner gather"
                  gather={tufts.inner.gather}
                  onEdit={(gather) => onEdit(withTufts({ inner: { ...tufts.inner!, gather } }))}
                  onPreview={(gather) => onPreview(withTufts({ inner: { ...tufts.inner!, gather } }))}
                  onFinish={onFinish}
                />
              </div>
            )}
            <p className="text-xs text-loam-soft">Each guide joins the nearest tuft; its points are drawn that share of the way onto the tuft’s centre curve, from the root’s share to the tip’s.</p>
          </>
        )}
      </Group>

      <Group title="Waver" summary={waver ? `${formatNumber(waver.amplitude, 3)} ${units}, ${formatNumber(waver.waves, 3)} waves` : 'off'}>
        <label className="flex items-center gap-2 text-sm text-loam">
          <input
            type="checkbox"
            checked={waver !== undefined}
            onChange={(event) => {
              if (event.target.checked) onEdit({ waver: { amplitude: Number((g.length * 0.05).toPrecision(3)), waves: WAVER_WAVES_DEFAULT } });
              else onEdit({ waver: undefined });
            }}
          />
          Let the guides waver
        </label>
        {waver && (
          <div className="grid grid-cols-2 gap-2">
            <Bounded label="Waver at the tip" unit={units} range={R.waverAmplitude} value={waver.amplitude} onCommit={(amplitude) => onEdit({ waver: { ...waver, amplitude } })} />
            <Bounded label="Waves along the guide" range={R.waverWaves} value={waver.waves} onCommit={(waves) => onEdit({ waver: { ...waver, waves } })} />
          </div>
        )}
      </Group>
    </div>
  );
}
