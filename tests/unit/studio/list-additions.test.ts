import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { applyCheckedEdit, createEditorState, currentSpec, undoLabel } from '@/lib/studio/client/editor-state';
import { listedFeatureEdit, needsSecondPoint, type ListedFeature } from '@/lib/studio/client/list-additions';
import { featurePlace, placeOnSurface } from '@/lib/studio/client/marker-places';
import type { OpenedSurface } from '@/lib/studio/client/protocol';

const A: [number, number, number] = [0.1, 0.2, 0.3];
const B: [number, number, number] = [0.4, 0.5, 0.6];

describe('features added from the side list', () => {
  it('each kind is added with the values a new feature starts from, named as the history names it', () => {
    const labels: Record<ListedFeature, string> = {
      whorl: 'Add whorl',
      saddle: 'Add saddle',
      singularity: 'Add singularity',
      parting: 'Draw parting',
      crest: 'Draw crest',
      stroke: 'Draw flow stroke',
      pin: 'Add length pin',
    };
    for (const [kind, label] of Object.entries(labels) as [ListedFeature, string][]) {
      const step = applyCheckedEdit(createEditorState(parseGroomSpec(DEMO_GROOMS[0].spec)), listedFeatureEdit(kind, A, B));
      expect(step.refused, kind).toBeNull();
      expect(undoLabel(step.state), kind).toBe(label);
    }
    expect(listedFeatureEdit('whorl', A, B)).toEqual({ type: 'add-singularity', singularity: { point: A, index: 1, handedness: 'counterclockwise' } });
    expect(listedFeatureEdit('singularity', A, B)).toMatchObject({ singularity: { index: 2 } });
    expect(listedFeatureEdit('crest', A, B)).toEqual({ type: 'add-curve', kind: 'crest', curve: { points: [A, B], closed: false } });
    expect(['whorl', 'pin', 'stroke', 'parting'].map((kind) => needsSecondPoint(kind as ListedFeature))).toEqual([false, false, true, true]);
  });
});

describe('where a feature is shown', () => {
  const surface = {
    vertexCount: 2,
    positions: Float64Array.from([0, 0, 1, 1, 0, 0]),
    vertexNormals: Float32Array.from([0, 0, 1, 1, 0, 0]),
    center: [0, 0, 0],
  } as unknown as OpenedSurface;

  it('at the vertex the solve snapped it to, else at its own point facing away from the centre', () => {
    expect(placeOnSurface(surface, 1, [5, 5, 5])).toEqual({ point: [1, 0, 0], normal: [1, 0, 0] });
    expect(placeOnSurface(surface, 7, [0, 2, 0])).toEqual({ point: [0, 2, 0], normal: [0, 2, 0] });
    expect(placeOnSurface(surface, undefined, undefined)).toBeNull();
  });

  it('a solve that no longer fits the spec is not used; a curve is shown at its middle point', () => {
    const spec = currentSpec(createEditorState(parseGroomSpec(DEMO_GROOMS[0].spec)));
    expect(featurePlace(surface, spec, null, { kind: 'singularity', index: 0 })?.point).toEqual(spec.field.singularities[0].point);
    const withCurve = { ...spec, field: { ...spec.field, partings: [{ points: [A, B, [0, 3, 0] as [number, number, number]], closed: false }] } };
    expect(featurePlace(surface, withCurve, null, { kind: 'parting', index: 0 })?.point).toEqual(B);
    expect(featurePlace(surface, spec, null, { kind: 'pin', index: 99 })).toBeNull();
  });
});
