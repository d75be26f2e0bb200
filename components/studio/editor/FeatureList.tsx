'use client';
// The side list: every feature of the coat as numbers that can be typed — where it is, its index,
// twist and turn, a curve's points, a pin's value — with the measured index beside the requested
// one. Reachable by keyboard from top to bottom; the picked feature opens its fields.
import { memo } from 'react';
import type { CurveSpec, GroomSpec, PinSpec, SingularitySpec } from '@/lib/groom/spec/spec';
import { featureLabel, formatIndex, listFeatures, roundPoint, sameFeature, singularityKind, type FeatureRef, type Vec3 } from '@/lib/studio/client/features';
import type { SolveReport } from '@/lib/studio/client/protocol';
import { NumberField } from '../ui/NumberField';
import { PinAttributeSelect } from './PinAttributeSelect';
import type { EditorActions } from './editor-actions';

type Place = { point?: readonly [number, number, number]; vertex?: number };

const ADDERS = [
  ['whorl', 'Add whorl'],
  ['saddle', 'Add saddle'],
  ['singularity', 'Add singularity'],
  ['parting', 'Add parting'],
  ['crest', 'Add crest'],
  ['stroke', 'Add flow stroke'],
  ['pin', 'Add pin'],
] as const;

export const FeatureList = memo(function FeatureList({
  spec,
  selection,
  solve,
  errorFeature,
  errorMessage,
  actions,
}: {
  spec: GroomSpec;
  selection: FeatureRef | null;
  solve: SolveReport | null;
  errorFeature: FeatureRef | null;
  errorMessage: string | null;
  actions: EditorActions;
}) {
  const features = listFeatures(spec);
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-col gap-1.5">
        <div className="flex flex-wrap gap-1.5" role="group" aria-label="Add a feature">
          {ADDERS.map(([kind, label]) => (
            <button key={kind} type="button" onClick={() => actions.addFromList(kind)} className="rounded-full border-2 border-tarn/25 bg-chalk px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn">
              {label}
            </button>
          ))}
        </div>
        <p className="text-xs text-loam-soft">New features go to the surface point in the middle of the view; type exact places below.</p>
      </div>
      {features.length === 0 ? (
        <p className="rounded-xl bg-chalk p-3 text-sm text-loam-soft">No features yet. With none, the field is the smoothest one the surface allows — on a closed surface the index budget still asks for singularities.</p>
      ) : (
        <ul className="flex flex-col gap-2" aria-label="Features">
          {features.map((ref) => (
            <li key={`${ref.kind}-${ref.index}`}>
              <FeatureRow spec={spec} feature={ref} open={sameFeature(selection, ref)} solve={solve} error={sameFeature(errorFeature, ref) ? errorMessage : null} actions={actions} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
});

function summary(spec: GroomSpec, ref: FeatureRef, solve: SolveReport | null): string {
  const order = spec.field.order;
  switch (ref.kind) {
    case 'singularity': {
      const s = spec.field.singularities[ref.index];
      const check = solve?.singularities.length === spec.field.singularities.length ? solve.singularities[ref.index] : null;
      const measured = check?.measured;
      return `index ${formatIndex(s.index, order)}${measured !== null && measured !== undefined ? ` · measured ${formatIndex(measured, order)}` : ''}`;
    }
    case 'parting':
    case 'crest': {
      const c = (ref.kind === 'parting' ? spec.field.partings : spec.field.crests)[ref.index];
      return `${(c.points ?? c.vertices ?? []).length} points${c.closed ? ', closed' : ''}`;
    }
    case 'stroke':
      return `${spec.field.strokes[ref.index].points.length} points`;
    case 'pin': {
      const pin = spec.pins[ref.index];
      return `× ${pin.value}`;
    }
  }
}

function FeatureRow({ spec, feature, open, solve, error, actions }: { spec: GroomSpec; feature: FeatureRef; open: boolean; solve: SolveReport | null; error: string | null; actions: EditorActions }) {
  const label = featureLabel(spec, feature);
  const bodyId = `feature-${feature.kind}-${feature.index}`;
  return (
    <div role="group" aria-label={label} className={`rounded-xl border-2 ${open ? 'border-bracken bg-chalk' : error ? 'border-hawthorn bg-chalk' : 'border-transparent bg-chalk/70'}`} data-testid="feature-row">
      <div className="flex items-center gap-1 px-2 py-1.5">
        <button type="button" aria-expanded={open} aria-controls={bodyId} onClick={() => actions.select(open ? null : feature)} className="min-w-0 flex-1 rounded-lg px-1.5 py-0.5 text-left hover:bg-vellum">
          <span className="block truncate text-sm font-bold text-loam">{label}</span>
          <span className="block truncate text-xs text-loam-soft">{summary(spec, feature, solve)}</span>
        </button>
        <button type="button" onClick={() => actions.lookAt(feature)} className="rounded-full px-2 py-1 text-xs font-semibold text-tarn hover:bg-vellum" aria-label={`Look at ${label}`}>
          Look at
        </button>
        <button type="button" onClick={() => actions.edit({ type: 'remove', feature })} className="rounded-full px-2 py-1 text-xs font-semibold text-hawthorn hover:bg-hawthorn-pale" aria-label={`Delete ${label}`}>
          Delete
        </button>
      </div>
      {error && <p className="px-3.5 pb-2 text-xs font-medium text-hawthorn">{error}</p>}
      {open && (
        <div id={bodyId} className="flex flex-col gap-3 border-t border-vellum px-3.5 py-3">
          {feature.kind === 'singularity' && <SingularityFields spec={spec} index={feature.index} solve={solve} actions={actions} />}
          {(feature.kind === 'parting' || feature.kind === 'crest') && <CurveFields spec={spec} kind={feature.kind} index={feature.index} actions={actions} />}
          {feature.kind === 'stroke' && <StrokeFields spec={spec} index={feature.index} actions={actions} />}
          {feature.kind === 'pin' && <PinFields spec={spec} index={feature.index} actions={actions} />}
        </div>
      )}
    </div>
  );
}

function PlaceFields({ place, onPlace, prefix = '' }: { place: Place; onPlace: (place: Place) => string | null; prefix?: string }) {
  const byVertex = place.vertex !== undefined;
  const point = place.point ?? [0, 0, 0];
  return (
    <div className="flex flex-col gap-1.5">
      <div className="flex items-center justify-between gap-2">
        <span className="text-xs font-semibold text-loam-soft">{prefix || 'Place'}</span>
        <label className="flex items-center gap-1 text-xs text-loam-soft">
          by
          <select
            value={byVertex ? 'vertex' : 'point'}
            aria-label={`${prefix || 'Place'} given by`}
            onChange={(event) => onPlace(event.target.value === 'vertex' ? { vertex: 0 } : { point: [0, 0, 0] })}
            className="rounded-md border border-vellum bg-white px-1 py-0.5 text-xs text-loam"
          >
            <option value="point">point</option>
            <option value="vertex">file vertex</option>
          </select>
        </label>
      </div>
      {byVertex ? (
        <NumberField label={`${prefix ? `${prefix} ` : ''}vertex`} value={place.vertex} min={0} integer onCommit={(vertex) => onPlace({ vertex })} />
      ) : (
        <div className="grid grid-cols-3 gap-1.5">
          {(['x', 'y', 'z'] as const).map((axis, k) => (
            <NumberField
              key={axis}
              label={`${prefix ? `${prefix} ` : ''}${axis}`}
              value={point[k]}
              compact
              onCommit={(value) => {
                const next = [...point] as Vec3;
                next[k] = value;
                return onPlace({ point: next });
              }}
            />
          ))}
        </div>
      )}
    </div>
  );
}

function withPlace<T extends Place>(item: T, place: Place): T {
  const { point: _point, vertex: _vertex, ...rest } = item;
  return { ...rest, ...(place.vertex !== undefined ? { vertex: place.vertex } : { point: roundPoint(place.point ?? [0, 0, 0]) }) } as T;
}

function SingularityFields({ spec, index, solve, actions }: { spec: GroomSpec; index: number; solve: SolveReport | null; actions: EditorActions }) {
  const s = spec.field.singularities[index];
  const order = spec.field.order;
  const kind = singularityKind(s.index);
  const update = (singularity: SingularitySpec) => actions.edit({ type: 'update-singularity', index, singularity });
  const check = solve?.singularities.length === spec.field.singularities.length ? solve.singularities[index] : null;
  const matches = check && check.measured !== null && Math.abs(check.measured - check.requested) < 1e-6;
  return (
    <>
      <div className="grid grid-cols-2 gap-2">
        <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
          Kind
          <select
            value={kind}
            onChange={(event) => update({ ...s, index: event.target.value === 'whorl' ? 1 : event.target.value === 'saddle' ? -1 : s.index === 1 || s.index === -1 ? 2 : s.index })}
            className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam"
          >
            <option value="whorl">Whorl (+1)</option>
            <option value="saddle">Saddle (−1)</option>
            <option value="other">Another index</option>
          </select>
        </label>
        {kind === 'other' ? (
          <NumberField
            label="Index"
            value={s.index}
            min={-8}
            max={8}
            onCommit={(value) => {
              if (value === 0) return 'An index of 0 is no singularity; delete it instead.';
              if (Math.abs(value * order - Math.round(value * order)) > 1e-9) return `Use a multiple of 1/${order} (the field's order is ${order}).`;
              return update({ ...s, index: value });
            }}
          />
        ) : (
          <div />
        )}
      </div>
      <div className="flex flex-col gap-1.5">
        <label className="flex items-center gap-2 text-sm text-loam">
          <input
            type="checkbox"
            checked={s.twist === undefined}
            onChange={(event) => {
              const { twist: _twist, ...rest } = s;
              update(event.target.checked ? rest : { ...rest, twist: 0 });
            }}
          />
          Let the solve choose the twist
        </label>
        {s.twist !== undefined && (
          <div className="grid grid-cols-2 gap-2">
            <NumberField label="Twist" unit="°" value={s.twist} min={0} max={180} onCommit={(twist) => update({ ...s, twist })} />
            <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
              Turn (seen from outside)
              <select value={s.handedness} onChange={(event) => update({ ...s, handedness: event.target.value as SingularitySpec['handedness'] })} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
                <option value="counterclockwise">counter-clockwise</option>
                <option value="clockwise">clockwise</option>
              </select>
            </label>
          </div>
        )}
        <p className="text-xs text-loam-soft">Twist 0° sends hair out of the point, 180° into it, between them a spiral.</p>
      </div>
      <PlaceFields place={s} onPlace={(place) => update(withPlace(s, place))} />
      <p className="rounded-lg bg-vellum px-2.5 py-1.5 text-xs text-loam" data-testid="singularity-check">
        Asked {formatIndex(s.index, order)}
        {check ? ` at vertex ${check.vertex}` : ''} ·{' '}
        {check?.measured === null || check?.measured === undefined ? (
          'not measured yet'
        ) : (
          <>
            measured <strong>{formatIndex(check.measured, order)}</strong> {matches ? '✓' : '✗'}
          </>
        )}
      </p>
    </>
  );
}

function PointList({ points, onPoints, minimum, label }: { points: readonly (readonly [number, number, number])[]; onPoints: (points: Vec3[]) => string | null; minimum: number; label: string }) {
  return (
    <div className="flex flex-col gap-2">
      <ol className="flex max-h-72 flex-col gap-2 overflow-y-auto pr-1">
        {points.map((p, i) => (
          <li key={i} className="flex items-end gap-1.5">
            <div className="flex-1">
              <PlaceFields
                prefix={`${label} ${i + 1}`}
                place={{ point: p }}
                onPlace={(place) => {
                  if (!place.point) return 'Points of a curve are given as x, y, z.';
                  const next = points.map((q) => [...q] as Vec3);
                  next[i] = roundPoint(place.point);
                  return onPoints(next);
                }}
              />
            </div>
            <button
              type="button"
              disabled={points.length <= minimum}
              onClick={() => onPoints(points.filter((_, j) => j !== i).map((q) => [...q] as Vec3))}
              className="mb-0.5 rounded-full px-2 py-1 text-xs font-semibold text-hawthorn hover:bg-hawthorn-pale disabled:opacity-30"
              aria-label={`Remove ${label.toLowerCase()} ${i + 1}`}
            >
              Remove
            </button>
          </li>
        ))}
      </ol>
      <button type="button" onClick={() => onPoints([...points.map((q) => [...q] as Vec3), [...points[points.length - 1]] as Vec3])} className="self-start rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn">
        Add a point
      </button>
    </div>
  );
}

function CurveFields({ spec, kind, index, actions }: { spec: GroomSpec; kind: 'parting' | 'crest'; index: number; actions: EditorActions }) {
  const curve = (kind === 'parting' ? spec.field.partings : spec.field.crests)[index];
  const update = (next: CurveSpec) => actions.edit({ type: 'update-curve', kind, index, curve: next });
  return (
    <>
      <p className="text-xs text-loam-soft">{kind === 'parting' ? 'Hair flows away from the parting on both sides.' : 'Hair flows toward the crest from both sides.'} Points are joined along the mesh edges.</p>
      <label className="flex items-center gap-2 text-sm text-loam">
        <input type="checkbox" checked={curve.closed} onChange={(event) => update({ ...curve, closed: event.target.checked })} />
        Closed loop (counts 0 in the index budget; an open curve counts +1)
      </label>
      {curve.points ? (
        <PointList label="Point" points={curve.points} minimum={2} onPoints={(points) => update({ ...curve, points })} />
      ) : (
        <p className="text-sm text-loam-soft">Given by file vertices {curve.vertices!.join(', ')}.</p>
      )}
    </>
  );
}

function StrokeFields({ spec, index, actions }: { spec: GroomSpec; index: number; actions: EditorActions }) {
  const stroke = spec.field.strokes[index];
  return (
    <>
      <p className="text-xs text-loam-soft">The field follows the stroke from its first point to its last.</p>
      <PointList label="Point" points={stroke.points} minimum={2} onPoints={(points) => actions.edit({ type: 'update-stroke', index, stroke: { points } })} />
    </>
  );
}

function PinFields({ spec, index, actions }: { spec: GroomSpec; index: number; actions: EditorActions }) {
  const pin = spec.pins[index];
  const update = (next: PinSpec) => actions.edit({ type: 'update-pin', index, pin: next });
  return (
    <>
      <div className="grid grid-cols-2 gap-2">
        <PinAttributeSelect value={pin.attribute} onChange={(attribute) => update({ ...pin, attribute })} />
        <NumberField label="Factor" value={pin.value} min={0} max={10} onCommit={(value) => update({ ...pin, value })} />
      </div>
      <p className="text-xs text-loam-soft">The guide setting is multiplied by this factor here, blended smoothly toward the other pins of the same attribute.</p>
      <PlaceFields place={pin} onPlace={(place) => update(withPlace(pin, place))} />
    </>
  );
}
