// The edits the Tints panel and the tint brush make (lib/studio/client/spec-edits.ts): maps and
// masks put in place, removed, and a mask in use refused in words.
import { describe, expect, it } from 'vitest';
import { encodeMap, encodeMask } from '@/lib/groom/place/maps';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { applyCheckedEdit, createEditorState, undo } from '@/lib/studio/client/editor-state';
import { TINT_RAMP, tintColours } from '@/lib/studio/client/paint';
import { gridPlane } from '@/tests/fixtures/shapes';

const grid = gridPlane(4, 4);
const nV = grid.positions.length / 3;
const ones = new Float64Array(nV).fill(1);

describe('map and mask edits', () => {
  it('adds a map, paints it in place (one per attribute), removes it undoably, and leaves no empty list behind', () => {
    let editor = createEditorState(parseGroomSpec({ specVersion: 3, units: 'cm', field: {} }));
    editor = applyCheckedEdit(editor, { type: 'set-map', map: encodeMap('length', ones, grid) }).state;
    expect(editor.present.label).toBe('Add a length map');
    editor = applyCheckedEdit(editor, { type: 'set-map', map: encodeMap('length', ones.map((_x, v) => 1 + v / nV), grid) }).state;
    expect(editor.present.label).toBe('Paint the length map');
    expect(editor.present.spec.maps!.length).toBe(1);
    editor = applyCheckedEdit(editor, { type: 'remove-map', attribute: 'length' }).state;
    expect(editor.present.label).toBe('Remove the length map');
    expect('maps' in editor.present.spec).toBe(false);
    expect(undo(editor).present.spec.maps!.length).toBe(1);
  });

  it('refuses to remove a mask a guide set grows on, naming the set', () => {
    let editor = createEditorState(parseGroomSpec({ specVersion: 3, units: 'cm', field: {} }));
    editor = applyCheckedEdit(editor, { type: 'set-mask', mask: encodeMask('cap', ones, grid) }).state;
    editor = applyCheckedEdit(editor, { type: 'add-guide-set', set: { ...parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, guideSets: [{ name: 'crown', region: { mask: 'cap' } }], masks: [encodeMask('cap', ones, grid)] }).guideSets![0] } }).state;
    const refused = applyCheckedEdit(editor, { type: 'remove-mask', name: 'cap' });
    expect(refused.refused).toMatch(/Guide set “crown” grows on the mask “cap”/);
    expect(refused.state).toBe(editor);
  });
});

describe('the tint ramp', () => {
  it('shows 1× (a map) and 0 (a mask) as the bare surface exactly, doubling and halving equally far from it, every channel in [0, 1]', () => {
    const bare = Array.from(TINT_RAMP.bare, (x) => Math.fround(x));
    expect(Array.from(tintColours([1], 'map'))).toEqual(bare);
    expect(Array.from(tintColours([0], 'mask'))).toEqual(bare);
    const [twice, half] = [tintColours([2], 'map'), tintColours([0.5], 'map')];
    const away = (c: Float32Array, to: readonly number[]) => Math.hypot(...[0, 1, 2].map((k) => (c[k] - TINT_RAMP.bare[k]) / (to[k] - TINT_RAMP.bare[k]))) / Math.sqrt(3);
    expect(away(twice, TINT_RAMP.high)).toBeCloseTo(0.5, 6);
    expect(away(half, TINT_RAMP.low)).toBeCloseTo(0.5, 6);
    expect(Array.from(tintColours([0, 10, 0.001, 4, 0.25], 'map')).every((x) => x >= 0 && x <= 1)).toBe(true);
  });
});
