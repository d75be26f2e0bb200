import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { COAT_SETTING_RANGES, GATHER_DEFAULTS } from '@/lib/groom/spec/guide-settings';
import { parseGroomSpec, specToJson, validateGroomSpec, type GroomSpec, type GuideSettings } from '@/lib/groom/spec/spec';
import { applyCheckedEdit, createEditorState, currentSpec, endGesture, previewCheckedEdit, undo, undoLabel } from '@/lib/studio/client/editor-state';
import { newGuideSet } from '@/lib/studio/client/guide-sets';

// The coat's shaping controls (components/studio/editor/CoatShapeFields.tsx) edit the spec through
// these edits and take their bounds from COAT_SETTING_RANGES; the checks here hold both to the
// spec's own schema (lib/groom/spec/guide-settings.ts), the only authority on what a spec may say.

const bramble = (): GroomSpec => parseGroomSpec(DEMO_GROOMS[0].spec);

/** The spec's guides block with one setting changed, as the form would make it. */
function withSetting(spec: GroomSpec, key: keyof typeof COAT_SETTING_RANGES, value: number): unknown {
  const g = spec.guides;
  const tufts = { density: 0.2, gather: { ...GATHER_DEFAULTS }, loners: 0 };
  const changes: Record<keyof typeof COAT_SETTING_RANGES, () => Partial<GuideSettings>> = {
    width: () => ({ width: value, tipWidth: 0 }),
    tipWidth: () => ({ tipWidth: value }),
    tuftDensity: () => ({ tufts: { ...tufts, density: value } }),
    gatherRoot: () => ({ tufts: { ...tufts, gather: { ...tufts.gather, root: value } } }),
    gatherTip: () => ({ tufts: { ...tufts, gather: { ...tufts.gather, tip: value } } }),
    gatherRise: () => ({ tufts: { ...tufts, gather: { ...tufts.gather, rise: value } } }),
    loners: () => ({ tufts: { ...tufts, loners: value } }),
    waverAmplitude: () => ({ waver: { amplitude: value, waves: 3 } }),
    waverWaves: () => ({ waver: { amplitude: 0.1, waves: value } }),
  };
  return JSON.parse(specToJson({ ...spec, guides: { ...g, ...changes[key]() } as GuideSettings }));
}

describe('the coat shaping form’s ranges are the schema’s', () => {
  const spec = bramble();
  for (const [key, range] of Object.entries(COAT_SETTING_RANGES) as [keyof typeof COAT_SETTING_RANGES, (typeof COAT_SETTING_RANGES)[keyof typeof COAT_SETTING_RANGES]][]) {
    it(`${key}: [${range.above ? '(' : '['}${range.min}, ${range.max}]`, () => {
      const accepts = (value: number) => validateGroomSpec(withSetting(spec, key, value)).spec !== undefined;
      const step = Math.max(1e-9, Math.abs(range.max) * 1e-9);
      expect(accepts(range.max)).toBe(true);
      expect(accepts(range.max + Math.max(step, 1e-6))).toBe(false);
      expect(accepts(range.min)).toBe(!range.above);
      expect(accepts(range.min - 1e-6)).toBe(false);
      if (range.above) expect(accepts(range.min + 1e-6)).toBe(true);
    });
  }
});

describe('editing the coat’s shaping', () => {
  it('tufts of both levels, loners, waver and widths are each one undoable edit of the groom’s block', () => {
    const spec = bramble();
    expect(spec.guides.tufts).toBeUndefined();
    let state = createEditorState(spec);
    const set = (changes: Partial<GuideSettings>) => {
      const step = applyCheckedEdit(state, { type: 'set-guides', guides: { ...currentSpec(state).guides, ...changes } as GuideSettings });
      expect(step.refused).toBeNull();
      state = step.state;
    };
    set({ tufts: { density: 0.2, gather: GATHER_DEFAULTS, loners: 0 } });
    set({ tufts: { ...currentSpec(state).guides.tufts!, inner: { density: 0.8, gather: { root: 0, tip: 0.5, rise: 2 } } } });
    set({ waver: { amplitude: 0.05, waves: 4 } });
    set({ tipWidth: 0.004 });
    const grown = currentSpec(state).guides;
    expect(grown.tufts).toEqual({ density: 0.2, gather: { root: 0, tip: 0.8, rise: 1 }, loners: 0, inner: { density: 0.8, gather: { root: 0, tip: 0.5, rise: 2 } } });
    expect(grown.waver).toEqual({ amplitude: 0.05, waves: 4 });
    expect(grown.tipWidth).toBe(0.004);
    expect(undoLabel(state)).toBe('Change guide settings');
    // Four edits, four steps back to the opened spec.
    expect(currentSpec(undo(state)).guides.tipWidth).toBe(spec.guides.tipWidth);
    expect(currentSpec(undo(undo(undo(undo(state)))))).toEqual(spec);
    // Turning a concern off takes it out of the written spec, not as a null or an empty block.
    set({ tufts: undefined, waver: undefined });
    const written = JSON.parse(specToJson(currentSpec(state)));
    expect(Object.keys(written.guides)).not.toContain('tufts');
    expect(Object.keys(written.guides)).not.toContain('waver');
  });

  it('a slider’s gather and loners are previewed while held and become one step when let go', () => {
    const spec = parseGroomSpec({ ...DEMO_GROOMS[0].spec, guides: { ...DEMO_GROOMS[0].spec.guides, tufts: { density: 0.2 } } });
    let state = createEditorState(spec);
    for (const tip of [0.7, 0.5, 0.3]) {
      const g = currentSpec(state).guides;
      state = previewCheckedEdit(state, { type: 'set-guides', guides: { ...g, tufts: { ...g.tufts!, gather: { ...g.tufts!.gather, tip }, loners: tip / 3 } } }).state;
    }
    state = endGesture(state);
    expect(currentSpec(state).guides.tufts!.gather.tip).toBe(0.3);
    expect(currentSpec(undo(state)).guides.tufts!.gather.tip).toBe(0.8);
  });

  it('a setting out of the schema’s range is refused in words and leaves the spec as it was', () => {
    const spec = bramble();
    const state = createEditorState(spec);
    const tooMuch = applyCheckedEdit(state, { type: 'set-guides', guides: { ...spec.guides, tufts: { density: 0.2, gather: { root: 0, tip: 1.5, rise: 1 }, loners: 0 } } });
    expect(tooMuch.refused).toBe('Use a value up to 1.');
    expect(tooMuch.state).toBe(state);
    const waves = applyCheckedEdit(state, { type: 'set-guides', guides: { ...spec.guides, waver: { amplitude: 0.1, waves: 65 } } });
    expect(waves.refused).toBe('Use a value up to 64.');
  });

  it('a guide set’s tufts and waver are its own: the other set and the groom’s block keep theirs', () => {
    const spec = bramble();
    let state = applyCheckedEdit(createEditorState(spec), { type: 'add-guide-set', set: newGuideSet(spec) }).state;
    const second = currentSpec(state).guideSets![1];
    const step = applyCheckedEdit(state, {
      type: 'update-guide-set',
      index: 1,
      set: { ...second, guides: { ...second.guides, tufts: { density: 0.3, gather: GATHER_DEFAULTS, loners: 0.25 }, waver: { amplitude: 0.02, waves: 2 } } },
      what: 'settings',
    });
    expect(step.refused).toBeNull();
    state = step.state;
    const sets = currentSpec(state).guideSets!;
    expect(sets[1].guides.tufts).toMatchObject({ density: 0.3, loners: 0.25 });
    expect(sets[1].guides.waver).toEqual({ amplitude: 0.02, waves: 2 });
    expect(sets[0].guides.tufts).toBeUndefined();
    expect(undoLabel(state)).toMatch(/^Change how guide set “Set 2” grows$/);
  });
});
