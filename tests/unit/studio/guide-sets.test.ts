import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import { applyCheckedEdit, createEditorState, currentSpec, redo, undo, undoLabel } from '@/lib/studio/client/editor-state';
import { GUIDE_SET_PALETTE, guideSetColours, newGuideSet } from '@/lib/studio/client/guide-sets';
import { FIRST_SET_NAME, checkedSpecEdit } from '@/lib/studio/client/spec-edits';

const bramble = (): GroomSpec => parseGroomSpec(DEMO_GROOMS[0].spec);

describe('guide sets in the editor', () => {
  it('adding the first set keeps the groom’s one block as a set of its own, on the same groups', () => {
    const spec = bramble();
    const step = applyCheckedEdit(createEditorState(spec), { type: 'add-guide-set', set: newGuideSet(spec) });
    expect(step.refused).toBeNull();
    const sets = currentSpec(step.state).guideSets!;
    expect(sets.map((s) => s.name)).toEqual([FIRST_SET_NAME, 'Set 2']);
    const { regions, ...settings } = spec.guides;
    expect(sets[0].region).toEqual({ groups: regions });
    expect(sets[0].guides).toEqual({ ...settings, regions: [] });
    expect(sets[1].region).toEqual({ groups: [] });
    expect(undoLabel(step.state)).toBe('Add guide set “Set 2”');
  });

  it('renames, regions and settings are undoable steps; a refused one says why', () => {
    const spec = bramble();
    let state = applyCheckedEdit(createEditorState(spec), { type: 'add-guide-set', set: newGuideSet(spec) }).state;
    const ears = { ...currentSpec(state).guideSets![1], name: 'Ears' };
    state = applyCheckedEdit(state, { type: 'update-guide-set', index: 1, set: ears, what: 'rename' }).state;
    expect(undoLabel(state)).toBe('Rename guide set “Set 2” to “Ears”');
    state = applyCheckedEdit(state, { type: 'update-guide-set', index: 1, set: { ...ears, region: { groups: ['ears'] } }, what: 'region' }).state;
    expect(undoLabel(state)).toBe('Change where guide set “Ears” grows');
    const longer = { ...currentSpec(state).guideSets![1], guides: { ...ears.guides, length: 3.2 } };
    state = applyCheckedEdit(state, { type: 'update-guide-set', index: 1, set: longer, what: 'settings' }).state;
    expect(currentSpec(state).guideSets![1]).toMatchObject({ name: 'Ears', region: { groups: ['ears'] }, guides: { length: 3.2 } });
    expect(currentSpec(undo(state)).guideSets![1].guides.length).toBe(spec.guides.length);
    expect(currentSpec(redo(undo(state))).guideSets![1].guides.length).toBe(3.2);
    const clash = applyCheckedEdit(state, { type: 'update-guide-set', index: 1, set: { ...longer, name: FIRST_SET_NAME }, what: 'rename' });
    expect(clash.refused).toMatch(/is already the name of guide set 0/);
    expect(clash.state).toBe(state);
  });

  it('deleting the last set gives the groom back one block of settings', () => {
    const spec = bramble();
    let next = checkedSpecEdit(spec, { type: 'add-guide-set', set: newGuideSet(spec) });
    if (!next.ok) throw new Error('refused');
    next = checkedSpecEdit(next.spec, { type: 'remove-guide-set', index: 1 });
    if (!next.ok) throw new Error('refused');
    expect(next.spec.guideSets).toHaveLength(1);
    next = checkedSpecEdit(next.spec, { type: 'remove-guide-set', index: 0 });
    if (!next.ok) throw new Error('refused');
    // Back where it began: the same spec as before any set, field for field.
    expect(next.spec).toEqual(spec);
  });

  it('colours each set’s guides from its root colour to its tip colour', () => {
    const colours = guideSetColours({ count: 3, pointsPerGuide: 3, sets: [{ name: 'a', first: 0, count: 1 }, { name: 'b', first: 1, count: 2 }] })!;
    expect(colours).toHaveLength(3 * 2 * 2 * 3);
    // '#21474c' (Tarn's root) red channel through the sRGB curve (IEC 61966-2-1): ((0x21/255 + 0.055)/1.055)^2.4.
    expect(colours[0]).toBeCloseTo(((0x21 / 255 + 0.055) / 1.055) ** 2.4, 6);
    // Set b's first segment starts at Bracken's root colour, not Tarn's.
    expect(colours[12]).toBeCloseTo(((0x7a / 255 + 0.055) / 1.055) ** 2.4, 6);
    expect(GUIDE_SET_PALETTE[1].name).toBe('Bracken');
    expect(guideSetColours({ count: 3, pointsPerGuide: 3 })).toBeNull();
  });

  it('deleting a parting renumbers the sets that grow beside later partings, and refuses to strand a set', () => {
    const spec = parseGroomSpec({
      ...DEMO_GROOMS[0].spec,
      field: { ...DEMO_GROOMS[0].spec.field, partings: [{ vertices: [0, 1] }, { vertices: [2, 3] }] },
      guideSets: [
        { name: 'Beside the second', region: { partings: [1], from: { vertex: 9 } } },
        { name: 'Beside the first', region: { partings: [0], from: { vertex: 9 } } },
      ],
    });
    const refused = checkedSpecEdit(spec, { type: 'remove', feature: { kind: 'parting', index: 0 } });
    expect(refused).toEqual({ ok: false, problems: [{ path: '(the whole spec)', message: 'Guide set “Beside the first” grows on one side of this parting; give the set another region before deleting it.' }] });
    const fewer = { ...spec, guideSets: spec.guideSets!.slice(0, 1) };
    const done = checkedSpecEdit(fewer, { type: 'remove', feature: { kind: 'parting', index: 0 } });
    expect(done.ok && done.spec.guideSets![0].region.partings).toEqual([0]);
  });
});
