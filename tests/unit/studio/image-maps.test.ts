import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { encodeMap } from '@/lib/groom/place/maps';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { MAP_ATTRIBUTES } from '@/lib/groom/spec/maps';
import { applyCheckedEdit, createEditorState, currentSpec, undo, undoLabel } from '@/lib/studio/client/editor-state';
import { MAP_ATTRIBUTE_WORDS, fileToBase64, imageMapEdit } from '@/lib/studio/client/image-maps';
import { addSingularity } from '@/lib/studio/client/spec-edits';

// The editor's side of a map read from an image (components/studio/editor/ImageMapControl.tsx):
// the map the server answers enters the spec as one undoable edit.

const fox = DEMO_GROOMS[0];
const mesh = fox.surface();
const nV = mesh.positions.length / 3;

describe('a map from an image in the editor', () => {
  it('is one undoable edit that adds the map, and a second image of the same attribute replaces it', () => {
    const spec = parseGroomSpec(fox.spec);
    let state = createEditorState(spec);
    const first = encodeMap('length', new Float64Array(nV).fill(1.5), mesh, 16, { low: 0.5, high: 2.5 });
    const width = encodeMap('width', new Float64Array(nV).fill(2), mesh, 16, { low: 0, high: 2 });
    let step = applyCheckedEdit(state, imageMapEdit(currentSpec(state), first, 'fur-length.png'));
    expect(step.refused).toBeNull();
    state = applyCheckedEdit(step.state, imageMapEdit(currentSpec(step.state), width, 'width.tif')).state;
    expect(undoLabel(state)).toBe('Add the width map from width.tif');
    const second = encodeMap('length', new Float64Array(nV).fill(0.5), mesh, 16, { low: 0.5, high: 2.5 });
    step = applyCheckedEdit(state, imageMapEdit(currentSpec(state), second, 'shorter.png'));
    expect(undoLabel(step.state)).toBe('Replace the length map from shorter.png');
    expect(currentSpec(step.state).maps!.map((m) => [m.attribute, m.data])).toEqual([['length', second.data], ['width', width.data]]);
    expect(currentSpec(undo(step.state)).maps!.map((m) => m.data)).toEqual([first.data, width.data]);
    expect(currentSpec(undo(undo(undo(step.state)))).maps).toBeUndefined();
  });

  it('is the brush’s own set-map edit, carrying the map alone, so an edit made while the image was read is kept', () => {
    const spec = parseGroomSpec(fox.spec);
    const map = encodeMap('length', new Float64Array(nV).fill(1.5), mesh, 16, { low: 0.5, high: 2.5 });
    // The edit is made from the spec as it was when the image was sent …
    const edit = imageMapEdit(spec, map, 'fur-length.png');
    expect(edit).toEqual({ type: 'set-map', map, label: 'Add the length map from fur-length.png' });
    // … and the groomer placed a whorl before the server answered: a whole-spec replace would drop it.
    let state = applyCheckedEdit(createEditorState(spec), addSingularity([0, 1, 0], 1)).state;
    state = applyCheckedEdit(state, edit).state;
    expect(currentSpec(state).field.singularities).toHaveLength(spec.field.singularities.length + 1);
    expect(currentSpec(state).maps!.map((m) => m.data)).toEqual([map.data]);
    expect(undoLabel(state)).toBe('Add the length map from fur-length.png');
  });

  it('names every attribute a map may drive', () => {
    expect(Object.keys(MAP_ATTRIBUTE_WORDS).sort()).toEqual([...MAP_ATTRIBUTES].sort());
  });

  it('offers the breakup maps in words of their own, no two alike (the Tints panel and the image control list them)', () => {
    for (const attribute of ['tuftDensity', 'innerTuftDensity', 'innerGather', 'gatherRise', 'loners', 'waves', 'tipWidth'] as const) {
      expect(MAP_ATTRIBUTES).toContain(attribute);
      // Words, not the spec's camel-case name.
      expect(MAP_ATTRIBUTE_WORDS[attribute]).toMatch(/^[A-Z][^A-Z]*( [^A-Z]+)*$/);
    }
    const words = Object.values(MAP_ATTRIBUTE_WORDS);
    expect(new Set(words.map((w) => w.toLowerCase())).size).toBe(words.length);
    expect(MAP_ATTRIBUTE_WORDS.tipWidth).toBe('Tip width');
    expect(MAP_ATTRIBUTE_WORDS.width).toBe('Width (root and tip)');
  });

  it('sends the file as base64 (RFC 4648), byte for byte', async () => {
    const bytes = Uint8Array.from({ length: 70_000 }, (_x, i) => (i * 31) & 255);
    expect(await fileToBase64(new Blob([bytes]))).toBe(Buffer.from(bytes).toString('base64'));
  });
});
