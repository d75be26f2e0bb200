'use client';
// The tools over the stage, with the options the active one needs and a line saying what it does.
import { NumberField } from '../ui/NumberField';
import { COLOURS } from './EditorScene';
import { PinAttributeSelect } from './PinAttributeSelect';
import { RAIL_TOOLS, TOOLS, type ToolId, type ToolOptions } from '@/lib/studio/client/tools';
import { targetLabel, type BrushOptions } from '@/lib/studio/client/paint';
import type { BrushMode } from '@/lib/groom/place/paint';

const MODES: readonly { mode: BrushMode; label: string }[] = [
  { mode: 'paint', label: 'Tint' },
  { mode: 'smooth', label: 'Even out' },
  { mode: 'erase', label: 'Clear' },
];

/** The tint brush's choices: what it does, its reach in surface units, how strongly, and its edge. */
function BrushOptionsCard({ brush, onBrush }: { brush: BrushOptions; onBrush: (brush: BrushOptions) => void }) {
  const mask = brush.paints?.kind === 'mask';
  return (
    <div className="absolute left-[10.5rem] top-3 z-10 flex w-56 flex-col gap-2 rounded-2xl bg-chalk/95 p-3 shadow-lg" aria-label="Brush options" role="group">
      <p className="text-xs font-semibold text-loam">{brush.paints ? `Tinting ${targetLabel(brush.paints)}` : 'Pick a map or mask in the Tints panel (Guides tab).'}</p>
      <div className="flex gap-1" role="radiogroup" aria-label="Brush does">
        {MODES.map(({ mode, label }) => (
          <button key={mode} type="button" role="radio" aria-checked={brush.mode === mode} onClick={() => onBrush({ ...brush, mode })} className={`flex-1 rounded-full px-2 py-1 text-xs font-semibold ${brush.mode === mode ? 'bg-tarn text-chalk' : 'border-2 border-tarn/25 text-tarn'}`}>
            {label}
          </button>
        ))}
      </div>
      {brush.mode === 'paint' && <NumberField label={mask ? 'Share (0 outside, 1 inside)' : 'Factor (1× is no change)'} value={brush.target} min={0} max={mask ? 1 : 10} onCommit={(target) => onBrush({ ...brush, target })} />}
      <NumberField label="Radius (surface units)" value={brush.radius} min={0} max={1e9} onCommit={(radius) => (radius > 0 ? onBrush({ ...brush, radius }) : 'The radius must be more than 0.')} />
      <NumberField label="Strength (0 – 1)" value={brush.strength} min={0} max={1} onCommit={(strength) => onBrush({ ...brush, strength })} />
      <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
        Edge
        <select value={brush.falloff} onChange={(event) => onBrush({ ...brush, falloff: event.target.value as BrushOptions['falloff'] })} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
          <option value="smooth">Soft (fades to the rim)</option>
          <option value="hard">Hard (even to the rim)</option>
        </select>
      </label>
    </div>
  );
}

const SWATCH: Partial<Record<ToolId, string>> = {
  whorl: COLOURS.whorl,
  saddle: COLOURS.saddle,
  singularity: COLOURS.other,
  parting: COLOURS.parting,
  crest: COLOURS.crest,
  flow: COLOURS.flow,
  pin: COLOURS.pin,
  tint: COLOURS.tint,
};

export function ToolRail({
  tool,
  onTool,
  options,
  onOptions,
  order,
  draftLength,
  onFinish,
  onCancel,
  onFrameAll,
}: {
  tool: ToolId;
  onTool: (tool: ToolId) => void;
  options: ToolOptions;
  onOptions: (options: ToolOptions) => void;
  order: number;
  draftLength: number;
  onFinish: () => void;
  onCancel: () => void;
  onFrameAll: () => void;
}) {
  const hint = TOOLS[tool].hint;
  return (
    <>
      <div role="toolbar" aria-label="Tools" aria-orientation="vertical" className="absolute left-3 top-3 z-10 flex w-36 flex-col gap-1 rounded-2xl bg-tarn/90 p-1.5 shadow-lg">
        {RAIL_TOOLS.map((t) => (
          <button
            key={t.id}
            type="button"
            aria-pressed={tool === t.id}
            title={`${t.label} (${t.shortcut})`}
            onClick={() => onTool(t.id)}
            className={`flex items-center gap-2 rounded-xl px-2.5 py-1.5 text-left text-sm font-semibold ${tool === t.id ? 'bg-chalk text-tarn-deep' : 'text-chalk hover:bg-tarn-deep'}`}
          >
            <span aria-hidden="true" className="h-2.5 w-2.5 shrink-0 rounded-full border border-chalk/50" style={{ background: SWATCH[t.id] ?? 'transparent' }} />
            {t.label}
          </button>
        ))}
        <button type="button" onClick={onFrameAll} title="Show the whole surface (Home)" className="mt-1 rounded-xl border border-chalk/30 px-2.5 py-1.5 text-left text-sm font-semibold text-chalk hover:bg-tarn-deep">
          Frame all
        </button>
      </div>

      {(tool === 'singularity' || tool === 'pin' || tool === 'parting' || tool === 'crest') && (
        <div className="absolute left-[10.5rem] top-3 z-10 flex w-56 flex-col gap-2 rounded-2xl bg-chalk/95 p-3 shadow-lg" aria-label="Tool options" role="group">
          {tool === 'singularity' && (
            <NumberField
              label={`Index (a multiple of 1/${order})`}
              value={options.index}
              min={-8}
              max={8}
              onCommit={(index) => {
                if (index === 0) return 'An index of 0 is no singularity.';
                if (Math.abs(index * order - Math.round(index * order)) > 1e-9) return `Use a multiple of 1/${order}.`;
                onOptions({ ...options, index });
              }}
            />
          )}
          {tool === 'pin' && (
            <>
              <PinAttributeSelect value={options.attribute} onChange={(attribute) => onOptions({ ...options, attribute })} />
              <NumberField label="Factor on the global value" value={options.value} min={0} max={10} onCommit={(value) => onOptions({ ...options, value })} />
            </>
          )}
          {(tool === 'parting' || tool === 'crest') && (
            <>
              <label className="flex items-center gap-2 text-sm text-loam">
                <input type="checkbox" checked={options.closed} onChange={(event) => onOptions({ ...options, closed: event.target.checked })} />
                Closed loop
              </label>
              <p className="text-xs text-loam-soft">{draftLength === 0 ? 'No points yet.' : `${draftLength} point${draftLength === 1 ? '' : 's'} so far.`}</p>
              <div className="flex gap-2">
                <button type="button" onClick={onFinish} disabled={draftLength < 2} className="rounded-full bg-bracken px-3 py-1 text-sm font-semibold text-chalk disabled:opacity-40">
                  Finish
                </button>
                <button type="button" onClick={onCancel} disabled={draftLength === 0} className="rounded-full border-2 border-tarn/30 px-3 py-1 text-sm font-semibold text-tarn disabled:opacity-40">
                  Discard
                </button>
              </div>
            </>
          )}
        </div>
      )}

      {tool === 'tint' && options.brush && <BrushOptionsCard brush={options.brush} onBrush={(brush) => onOptions({ ...options, brush })} />}

      {hint && (
        <p className="pointer-events-none absolute bottom-3 left-3 z-10 max-w-[60%] rounded-xl bg-tarn/85 px-3 py-2 text-xs text-chalk" data-testid="tool-hint">
          {hint}
        </p>
      )}
    </>
  );
}
