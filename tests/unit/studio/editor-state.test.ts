import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import {
  applyEdit,
  canRedo,
  canUndo,
  createEditorState,
  currentSpec,
  endGesture,
  previewEdit,
  redo,
  redoLabel,
  select,
  undo,
  undoLabel,
} from '@/lib/studio/client/editor-state';
import { featureLabel, featureOfPath, formatIndex, listFeatures, pathOfFeature, roundPoint } from '@/lib/studio/client/features';
import { applySpecEdit, checkedSpecEdit } from '@/lib/studio/client/spec-edits';

const bramble = (): GroomSpec => parseGroomSpec(DEMO_GROOMS[0].spec);
const whorlAt = (x: number) => ({ point: [x, 0, 0] as [number, number, number], index: 1, handedness: 'counterclockwise' as const });

describe('spec edits', () => {
  it('add, change and delete each kind of feature without touching the spec they start from', () => {
    const spec = bramble();
    const frozen = JSON.stringify(spec);
    let next = applySpecEdit(spec, { type: 'add-singularity', singularity: { point: [0, 1, 0], index: -1, handedness: 'counterclockwise' } });
    next = applySpecEdit(next, { type: 'add-curve', kind: 'crest', curve: { points: [[0, 1, 0], [1, 0, 0]], closed: false } });
    next = applySpecEdit(next, { type: 'add-pin', pin: { attribute: 'curl', point: [0, 0, 1], value: 2 } });
    next = applySpecEdit(next, { type: 'remove', feature: { kind: 'singularity', index: 0 } });
    expect(JSON.stringify(spec)).toBe(frozen);
    expect(next.field.singularities).toHaveLength(spec.field.singularities.length);
    expect(next.field.singularities[0]).toEqual(spec.field.singularities[1]);
    expect(next.field.crests).toHaveLength(1);
    expect(next.pins.at(-1)).toEqual({ attribute: 'curl', point: [0, 0, 1], value: 2 });
  });

  it('refuses, with the spec path, an edit the groom schema would refuse', () => {
    const spec = bramble();
    const result = checkedSpecEdit(spec, { type: 'update-singularity', index: 0, singularity: { ...spec.field.singularities[0], twist: 200 } });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.problems[0].path).toBe('field.singularities[0].twist');
    const ok = checkedSpecEdit(spec, { type: 'set-guides', guides: { ...spec.guides, lift: 35 } });
    expect(ok.ok && ok.spec.guides.lift).toBe(35);
  });

  it('names features the way the side list shows them', () => {
    const spec = bramble();
    // Bramble: whorl, whorl, whorl (spiral), saddle; one flow stroke; three length pins.
    expect(listFeatures(spec).map((ref) => featureLabel(spec, ref))).toEqual([
      'Whorl 1', 'Whorl 2', 'Whorl 3', 'Saddle 1', 'Flow stroke 1', 'Length pin 1', 'Length pin 2', 'Length pin 3',
    ]);
    expect(featureOfPath('field.singularities[3].point')).toEqual({ kind: 'singularity', index: 3 });
    expect(featureOfPath('pins[1].value')).toEqual({ kind: 'pin', index: 1 });
    expect(featureOfPath('guides.density')).toBeNull();
    expect(pathOfFeature({ kind: 'crest', index: 2 })).toBe('field.crests[2]');
    expect(formatIndex(1)).toBe('+1');
    expect(formatIndex(-1)).toBe('−1');
    expect(formatIndex(0.5, 2)).toBe('+1/2');
    expect(formatIndex(-0.75, 4)).toBe('−3/4');
    expect(formatIndex(2e-12)).toBe('0');
    expect(roundPoint([0.1234567891, -12.3456789, 0])).toEqual([0.1234568, -12.34568, 0]);
  });
});

describe('undo and redo', () => {
  it('undo takes back each edit in turn, redo brings them back, a new edit drops the redo list', () => {
    const start = bramble();
    let state = createEditorState(start);
    expect(canUndo(state)).toBe(false);
    state = applyEdit(state, { type: 'add-singularity', singularity: whorlAt(1) });
    state = applyEdit(state, { type: 'add-singularity', singularity: { ...whorlAt(2), index: -1 } });
    expect(undoLabel(state)).toBe('Add saddle');
    expect(state.selection).toEqual({ kind: 'singularity', index: 5 });
    state = undo(state);
    expect(currentSpec(state).field.singularities).toHaveLength(5);
    expect(redoLabel(state)).toBe('Add saddle');
    state = undo(state);
    expect(currentSpec(state)).toBe(start);
    expect(canUndo(state)).toBe(false);
    state = redo(redo(state));
    expect(currentSpec(state).field.singularities).toHaveLength(6);
    state = undo(state);
    state = applyEdit(state, { type: 'remove', feature: { kind: 'pin', index: 0 } });
    expect(canRedo(state)).toBe(false);
    expect(undoLabel(state)).toBe('Delete length pin 1');
  });

  it('a drag is one history entry however many positions it passed through', () => {
    const start = bramble();
    let state = createEditorState(start);
    const s0 = start.field.singularities[0];
    for (let i = 1; i <= 20; i++) {
      state = previewEdit(state, { type: 'update-singularity', index: 0, singularity: { ...s0, point: [i, 0, 0] }, moved: true });
    }
    expect(currentSpec(state).field.singularities[0].point).toEqual([20, 0, 0]);
    expect(state.past).toHaveLength(0);
    state = endGesture(state);
    expect(state.past).toHaveLength(1);
    expect(undoLabel(state)).toBe('Move whorl 1');
    state = undo(state);
    expect(currentSpec(state)).toBe(start);
  });

  it('a drag that ends where it began leaves no entry; undo during a drag cancels it', () => {
    const start = bramble();
    const s0 = start.field.singularities[0];
    let state = previewEdit(createEditorState(start), { type: 'update-singularity', index: 0, singularity: { ...s0, point: [5, 5, 5] }, moved: true });
    state = previewEdit(state, { type: 'update-singularity', index: 0, singularity: s0, moved: true });
    state = endGesture(state);
    expect(state.past).toHaveLength(0);
    state = previewEdit(state, { type: 'update-singularity', index: 0, singularity: { ...s0, point: [5, 5, 5] }, moved: true });
    state = undo(state);
    expect(currentSpec(state)).toBe(start);
    expect(state.gestureBase).toBeNull();
  });

  it('selection follows deletions and is dropped when its feature disappears', () => {
    let state = select(createEditorState(bramble()), { kind: 'singularity', index: 2 });
    state = applyEdit(state, { type: 'remove', feature: { kind: 'singularity', index: 0 } });
    expect(state.selection).toEqual({ kind: 'singularity', index: 1 });
    state = applyEdit(state, { type: 'remove', feature: { kind: 'singularity', index: 1 } });
    expect(state.selection).toBeNull();
    expect(select(state, { kind: 'parting', index: 0 }).selection).toBeNull();
  });
});
