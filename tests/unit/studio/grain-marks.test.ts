import { beforeAll, describe, expect, it } from 'vitest';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import { applyEdit, createEditorState, undo } from '@/lib/studio/client/editor-state';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import { describeMarks, marksLeft, takeAllMarks, takeMark } from '@/lib/studio/client/grain-marks';
import { applySpecEdit } from '@/lib/studio/client/spec-edits';
import { roundedCube } from '@/tests/fixtures/shapes';

const display = { drawing: 'strokes', density: 500 } as const;

describe('reading the grain in the field worker and taking its marks', () => {
  const engine = new FieldEngine();
  const base: GroomSpec = parseGroomSpec({ specVersion: 2, units: 'cm', field: { order: 4, singularities: [{ point: [0, 0, 1], index: 1 }] } });

  beforeAll(async () => {
    const bytes = new TextEncoder().encode(surfaceToObj(roundedCube(10, 0.25), 'box')).buffer as ArrayBuffer;
    await engine.open({ kind: 'bytes', bytes, fileName: 'box.obj' }, 'free');
  });

  // Source: a smooth cross field on a cube has eight +1/4 singularities, one per corner (the
  // classic cross-field result; the engine's own test is tests/unit/field/suggest.test.ts).
  it('reads eight +1/4 marks on a rounded box, whatever is placed, each on a vertex of the surface', () => {
    const reading = engine.readGrain(base, { toward: 'nothing', weight: 1 });
    expect(reading.order).toBe(4);
    expect(reading.marks.map((m) => m.index)).toEqual(Array(8).fill(0.25));
    const p = engine.prepared!.mesh.positions;
    for (const m of reading.marks) expect(m.point).toEqual([p[3 * m.vertex], p[3 * m.vertex + 1], p[3 * m.vertex + 2]]);
    expect(describeMarks(reading.marks, 4)).toBe('8 grain marks: 8 × +1/4.');
    expect(engine.readGrain(base, { toward: 'bending', weight: 4 }).marks).toHaveLength(8);
  });

  it('taking marks one by one places ordinary singularities; taking all replaces the placed ones; the field then has exactly those, measured', () => {
    const { marks } = engine.readGrain(base, { toward: 'nothing', weight: 1 });
    let state = createEditorState(base);
    state = applyEdit(state, takeMark(marks[0]));
    expect(state.present.spec.field.singularities).toHaveLength(2);
    expect(marksLeft(state.present.spec, marks)).toEqual(marks.slice(1));
    expect(marksLeft(undo(state).present.spec, marks)).toEqual(marks);

    const all = takeAllMarks(state.present.spec, marks);
    state = applyEdit(state, all);
    const spec = state.present.spec;
    expect(spec.field.singularities.map((s) => s.index)).toEqual(Array(8).fill(0.25));
    expect(marksLeft(spec, marks)).toEqual([]);
    expect(state.present.label).toBe("Take the grain's 8 singularities");
    expect(undo(state).present.spec.field.singularities).toHaveLength(2);

    const report = engine.solve(spec, display, false);
    expect(report.error).toBeNull();
    expect(report.proof).toMatchObject({ strays: 0, mismatches: 0, nonZeroCount: 8 });
    expect(report.singularities.map((s) => s.vertex).sort((a, b) => a - b)).toEqual(marks.map((m) => m.vertex).sort((a, b) => a - b));
  });

  it('says when the smoothest field needs no singularity', () => {
    expect(describeMarks([], 1)).toBe('No grain mark: the smoothest field here needs no singularity.');
    expect(describeMarks([{ vertex: 1, index: 1, point: [0, 0, 0], normal: [0, 0, 1] }, { vertex: 2, index: -1, point: [1, 0, 0], normal: [0, 0, 1] }], 1)).toBe('2 grain marks: 1 whorl, 1 saddle.');
    expect(applySpecEdit(base, takeMark({ vertex: 1, index: -1, point: [1, 2, 3], normal: [0, 0, 1] })).field.singularities[1]).toMatchObject({ point: [1, 2, 3], index: -1 });
  });
});
