import { describe, expect, it } from 'vitest';
import { parseGroomSpec, type GroomSpec, type SingularitySpec } from '@/lib/groom/spec/spec';
import { applyCheckedEdit, createEditorState, currentSpec, endGesture, previewCheckedEdit, undo, undoLabel, withTwinSurface, type EditorState } from '@/lib/studio/client/editor-state';
import { addSingularity, moveFeature, type SpecEdit } from '@/lib/studio/client/spec-edits';
import { partnerOf, mirrorOf, planeWords, symmetryOfPlane, twinSurfaceOf, type TwinSurface } from '@/lib/studio/client/mirror-edits';
import type { Vec3 } from '@/lib/studio/client/features';
import { mirrorSpecFeatures } from '@/lib/groom/place/mirror-features';
import { solveGroomField } from '@/lib/groom/place/request';
import type { GroomSurface } from '@/lib/groom/place/surface';
import type { MirrorPlane } from '@/lib/groom/spec/symmetry';
import { mirrorSymmetricShape } from '@/tests/fixtures/shapes';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { surfaceToObj } from '@/lib/groom/demo/obj';

const twinned = (): GroomSpec => parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, symmetry: { axis: 'x', seam: 0.01 } });

function step(state: EditorState, edit: SpecEdit): EditorState {
  const result = applyCheckedEdit(state, edit);
  expect(result.refused).toBeNull();
  return result.state;
}

describe('twin sides: edits mirrored across the plane', () => {
  it('places a whorl on both sides as one undoable edit, and leaves one on the plane single', () => {
    let state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], 1));
    expect(currentSpec(state).field.singularities.map((s) => s.point)).toEqual([[0.5, 0.2, 0.3], [-0.5, 0.2, 0.3]]);
    expect(undoLabel(state)).toBe('Add whorl on both sides');
    // The one placed is selected, not its mirror.
    expect(state.selection).toEqual({ kind: 'singularity', index: 0 });
    expect(currentSpec(undo(state)).field.singularities).toEqual([]);
    state = step(state, addSingularity([0.004, 0.9, 0.1], -1));
    expect(currentSpec(state).field.singularities).toHaveLength(3);
  });

  it('places the budget’s remainder on one side only, which a mirror would unbalance again', () => {
    const state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], 1, true));
    expect(currentSpec(state).field.singularities).toHaveLength(1);
    expect(undoLabel(state)).toBe('Add whorl');
  });

  it('reverses the twist of the mirror: a clockwise spiral on one side turns anticlockwise on the other', () => {
    let state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], 1));
    const spiral: SingularitySpec = { point: [0.5, 0.2, 0.3], index: 1, twist: 60, handedness: 'clockwise' };
    state = step(state, { type: 'update-singularity', index: 0, singularity: spiral });
    expect(currentSpec(state).field.singularities[1]).toEqual({ point: [-0.5, 0.2, 0.3], index: 1, twist: 60, handedness: 'counterclockwise' });
  });

  it('moves the partner with a drag (one history entry) and deletes both together', () => {
    let state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], 1));
    state = step(state, addSingularity([0.3, -0.4, 0.2], 1));
    for (const x of [0.55, 0.6]) {
      const moved = previewCheckedEdit(state, moveFeature(currentSpec(state), { kind: 'singularity', index: 0 }, [x, 0.25, 0.3])!);
      expect(moved.refused).toBeNull();
      state = moved.state;
    }
    state = endGesture(state);
    expect(currentSpec(state).field.singularities.map((s) => s.point)).toEqual([[0.6, 0.25, 0.3], [-0.6, 0.25, 0.3], [0.3, -0.4, 0.2], [-0.3, -0.4, 0.2]]);
    expect(undoLabel(state)).toBe('Move whorl 1 on both sides');
    // Deleting the mirror (a later number) takes the original (an earlier one) too.
    state = step(state, { type: 'remove', feature: { kind: 'singularity', index: 1 } });
    expect(currentSpec(state).field.singularities.map((s) => s.point)).toEqual([[0.3, -0.4, 0.2], [-0.3, -0.4, 0.2]]);
  });

  it('mirrors partings and crests point by point, strokes with their directions, and pins', () => {
    let state = createEditorState(twinned());
    state = step(state, { type: 'add-curve', kind: 'parting', curve: { points: [[0.2, 0.5, 0.1], [0.4, 0.3, 0.2]], closed: false } });
    state = step(state, { type: 'add-curve', kind: 'crest', curve: { points: [[0.2, -0.5, 0.1], [0.4, -0.3, 0.2]], closed: false } });
    state = step(state, { type: 'add-stroke', stroke: { points: [[0.1, 0, 0.9], [0.3, 0.1, 0.8]] } });
    state = step(state, { type: 'add-pin', pin: { attribute: 'length', point: [0.7, 0.1, 0.1], value: 1.5 } });
    const spec = currentSpec(state);
    expect(spec.field.partings[1].points).toEqual([[-0.2, 0.5, 0.1], [-0.4, 0.3, 0.2]]);
    expect(spec.field.crests[1].points).toEqual([[-0.2, -0.5, 0.1], [-0.4, -0.3, 0.2]]);
    // The stroke's direction (0.2, 0.1, −0.1) becomes (−0.2, 0.1, −0.1).
    expect(spec.field.strokes[1].points).toEqual([[-0.1, 0, 0.9], [-0.3, 0.1, 0.8]]);
    expect(spec.pins[1]).toEqual({ attribute: 'length', point: [-0.7, 0.1, 0.1], value: 1.5 });
    // Changing the stroke changes its partner; the pin's value too.
    state = step(state, { type: 'update-stroke', index: 0, stroke: { points: [[0.1, 0, 0.9], [0.3, 0.2, 0.8]] } });
    state = step(state, { type: 'update-pin', index: 0, pin: { attribute: 'length', point: [0.7, 0.1, 0.1], value: 2 } });
    expect(currentSpec(state).field.strokes[1].points).toEqual([[-0.1, 0, 0.9], [-0.3, 0.2, 0.8]]);
    expect(currentSpec(state).pins[1].value).toBe(2);
  });

  it('turned off, keeps both sides as independent features; turned on again, pairs them again', () => {
    let state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], 1));
    const symmetry = currentSpec(state).symmetry!;
    state = step(state, { type: 'set-symmetry', symmetry: null });
    expect(currentSpec(state).symmetry).toBeUndefined();
    state = step(state, moveFeature(currentSpec(state), { kind: 'singularity', index: 0 }, [0.5, 0.3, 0.3])!);
    expect(currentSpec(state).field.singularities.map((s) => s.point)).toEqual([[0.5, 0.3, 0.3], [-0.5, 0.2, 0.3]]);
    state = step(state, { type: 'set-symmetry', symmetry });
    // No longer mirror images: each is edited alone.
    expect(partnerOf(currentSpec(state), { kind: 'singularity', index: 0 }, mirrorOf(currentSpec(state))!)).toBeNull();
    state = step(state, { type: 'remove', feature: { kind: 'singularity', index: 0 } });
    expect(currentSpec(state).field.singularities).toHaveLength(1);
  });

  it('merges the pair when a move puts the feature on the plane', () => {
    let state = step(createEditorState(twinned()), addSingularity([0.5, 0.2, 0.3], -1));
    state = step(state, moveFeature(currentSpec(state), { kind: 'singularity', index: 0 }, [0.005, 0.2, 0.3])!);
    expect(currentSpec(state).field.singularities.map((s) => s.point)).toEqual([[0.005, 0.2, 0.3]]);
  });
});

describe('the plane found on the open surface', () => {
  it('finds Bramble’s plane x = 0 in the field worker’s engine and writes it as the spec’s symmetry with the mean edge as the seam', async () => {
    const demo = DEMO_GROOMS.find((g) => g.id === 'bramble-fox-head')!;
    const engine = new FieldEngine(() => {});
    const opened = await engine.open({ kind: 'bytes', bytes: new TextEncoder().encode(surfaceToObj(demo.surface(), 'Bramble')).buffer as ArrayBuffer, fileName: 'bramble.obj' }, 'free');
    const found = engine.findMirror();
    expect(found.symmetric).toBe(true);
    expect(found.mismatch).toBeLessThan(1e-6);
    expect(found.seam).toBeCloseTo(opened.meanEdge, 12);
    const symmetry = symmetryOfPlane(found);
    expect(symmetry).toEqual({ axis: 'x', offset: 0, seam: Math.round(opened.meanEdge * 1e6) / 1e6 });
    expect(planeWords(symmetry)).toBe('x = 0');
    expect(parseGroomSpec({ ...demo.spec, symmetry }).symmetry).toEqual(symmetry);
  });

  it('words a plane that is not a world axis by its normal', () => {
    const symmetry = symmetryOfPlane({ normal: [Math.SQRT1_2, Math.SQRT1_2, 0], offset: 0.5, seam: 0.01 });
    expect(symmetry).toEqual({ normal: [Math.SQRT1_2, Math.SQRT1_2, 0], offset: 0.5, seam: 0.01 });
    expect(planeWords(symmetry)).toBe('0.707x + 0.707y = 0.5');
  });
});

describe('a twisted whorl’s twin in the editor is its exact mirror image', () => {
  // The editor reads where the open surface fixes a twist from the field worker (`twist-faces`,
  // here the worker's FieldEngine itself) and states the twin's `twistFrom` as lib/groom's
  // mirrorSpecFeatures does; the reference is that function and the field it solves to.
  const X: MirrorPlane = { normal: [1, 0, 0], offset: 0 };
  const open = async () => {
    const engine = new FieldEngine(() => {});
    const opened = await engine.open({ kind: 'bytes', bytes: new TextEncoder().encode(surfaceToObj(mirrorSymmetricShape(), 'symmetric')).buffer as ArrayBuffer, fileName: 'symmetric.obj' }, 'free');
    return { surface: engine.prepared!, twin: twinSurfaceOf(opened, engine.twistFaces()) };
  };
  const twinnedOn = (twin: TwinSurface | null) => withTwinSurface(createEditorState(parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, symmetry: { axis: 'x', seam: 0.01 } })), twin);
  const spiral = (point: Vec3): SingularitySpec => ({ point, index: 1, twist: 40, handedness: 'clockwise' });
  /** What mirrorSpecFeatures makes of the one whorl alone. */
  const reference = (surface: GroomSurface, s: SingularitySpec) => mirrorSpecFeatures(parseGroomSpec({ specVersion: 3, units: 'cm', field: { singularities: [s] } }), surface, X).field.singularities;

  it('on adding, twisting and dragging the whorl: the spec mirrorSpecFeatures gives, and fields mirrored within 1e-9', async () => {
    const { surface, twin } = await open();
    let state = step(twinnedOn(twin), addSingularity([0.7, 0.5, 0.5], 1));
    state = step(state, { type: 'update-singularity', index: 0, singularity: spiral([0.7, 0.5, 0.5]) });
    expect(undoLabel(state)).toBe('Change whorl 1 on both sides');
    const pair = currentSpec(state).field.singularities;
    expect(pair[1].twistFrom).toBeDefined();
    expect(pair).toEqual(reference(surface, spiral([0.7, 0.5, 0.5])));
    expect(mirrorGap(surface, currentSpec(state))).toBeLessThan(1e-9);
    // A drag of the whorl: its vertex (and first face) change, the twin's twistFrom with them.
    for (const point of [[0.65, 0.6, 0.5], [0.55, 0.7, 0.45]] as Vec3[]) {
      state = previewCheckedEdit(state, moveFeature(currentSpec(state), { kind: 'singularity', index: 0 }, point)!).state;
    }
    state = endGesture(state);
    expect(undoLabel(state)).toBe('Move whorl 1 on both sides');
    expect(currentSpec(state).field.singularities).toEqual(reference(surface, spiral([0.55, 0.7, 0.45])));
    expect(mirrorGap(surface, currentSpec(state))).toBeLessThan(1e-9);
    // Moving the twin instead brings the whorl along, as the twin's mirror: still exact.
    state = step(state, moveFeature(currentSpec(state), { kind: 'singularity', index: 1 }, [-0.7, 0.5, 0.5])!);
    expect(currentSpec(state).field.singularities[0].twistFrom).toBeDefined();
    expect(mirrorGap(surface, currentSpec(state))).toBeLessThan(1e-9);
  });

  it('without the surface the twin is stated by points alone, and its field is not the mirror image', async () => {
    const { surface } = await open();
    let state = step(twinnedOn(null), addSingularity([0.7, 0.5, 0.5], 1));
    state = step(state, { type: 'update-singularity', index: 0, singularity: spiral([0.7, 0.5, 0.5]) });
    expect(currentSpec(state).field.singularities[1].twistFrom).toBeUndefined();
    // The twin's twist is fixed in its own first face, not the mirror of the whorl's (lib/groom/README.md, "Mirror symmetry").
    expect(mirrorGap(surface, currentSpec(state))).toBeGreaterThan(1e-3);
  });

  it('keeps the surface through edits, undo and redo, and drops it when told', async () => {
    const { twin } = await open();
    let state = step(twinnedOn(twin), addSingularity([0.7, 0.5, 0.5], 1));
    expect(state.twinSurface).toBe(twin);
    expect(undo(state).twinSurface).toBe(twin);
    expect(withTwinSurface(state, null).twinSurface).toBeUndefined();
  });
});

/** The largest gap between a face's field vector reflected across x = 0 and its mirror face's vector (the shape is exactly symmetric). */
function mirrorGap(surface: GroomSurface, spec: GroomSpec): number {
  const d = solveGroomField(spec, surface).field.faceDirection;
  const t = surface.field.topology.triangles, p = surface.mesh.positions;
  const key = (a: number[]) => a.sort((x, y) => x - y).join(',');
  const faceOf = new Map<string, number>();
  for (let f = 0; f < t.length / 3; f++) faceOf.set(key([t[3 * f], t[3 * f + 1], t[3 * f + 2]]), f);
  const nearest = surface.nearestVertex();
  const mirrorVertex = (v: number) => nearest.find(-p[3 * v], p[3 * v + 1], p[3 * v + 2]).vertex;
  let gap = 0;
  for (let f = 0; f < t.length / 3; f++) {
    const g = faceOf.get(key([0, 1, 2].map((k) => mirrorVertex(t[3 * f + k]))))!;
    gap = Math.max(gap, Math.hypot(-d[3 * f] - d[3 * g], d[3 * f + 1] - d[3 * g + 1], d[3 * f + 2] - d[3 * g + 2]));
  }
  return gap;
}
