import { describe, expect, it } from 'vitest';
import { currentSpec, select, undoLabel } from '@/lib/studio/client/editor-state';
import { chooseTool, clickAt, pointerDown, pointerUp, startSession } from '@/lib/studio/client/tools/session';
import { pinTool } from '@/lib/studio/client/tools/pin';
import { saddleTool } from '@/lib/studio/client/tools/saddle';
import { whorlTool } from '@/lib/studio/client/tools/whorl';
import { OPTIONS, bramble, carryOut, contextOf, hitAt, run } from './fixtures';

describe('placing by a click', () => {
  it('a click with the whorl tool places a whorl at the vertex under the pointer, selected, as one undoable step', () => {
    const start = bramble();
    const context = contextOf(start);
    const pressed = whorlTool.pointerDown(whorlTool.enter(), hitAt(3), context);
    const released = whorlTool.pointerUp(pressed.state, hitAt(3, { x: 103, y: 98 }), context);
    const { editor, said } = carryOut(start, released);
    expect(said).toBeNull();
    expect(currentSpec(editor).field.singularities.at(-1)).toEqual({ point: [0.3, 0, 1], index: 1, handedness: 'counterclockwise' });
    expect(editor.selection).toEqual({ kind: 'singularity', index: 4 });
    expect(undoLabel(editor)).toBe('Add whorl');
  });

  it('a click with the saddle tool places a saddle; the same release heard twice (surface and page) places it once', () => {
    const start = bramble();
    const { editor } = run(start, startSession('saddle'), [
      (s, c) => pointerDown(s, hitAt(5), c),
      (s, c) => pointerUp(s, hitAt(5), c),
      (s, c) => pointerUp(s, null, c),
    ]);
    const added = currentSpec(editor).field.singularities.slice(4);
    expect(added).toEqual([{ point: [0.5, 0, 1], index: -1, handedness: 'counterclockwise' }]);
    expect(undoLabel(editor)).toBe('Add saddle');
  });

  it('a press that travels is the view being turned: nothing is placed', () => {
    const start = bramble();
    const context = contextOf(start);
    const pressed = saddleTool.pointerDown(saddleTool.enter(), hitAt(5, { x: 100, y: 100 }), context);
    const released = saddleTool.pointerUp(pressed.state, hitAt(6, { x: 140, y: 100 }), context);
    expect(released.changes ?? []).toEqual([]);
    expect(saddleTool.pointerUp(saddleTool.enter(), hitAt(5), context).changes ?? []).toEqual([]);
  });

  it('the any-index tool and the pin tool place what the tool rail chose', () => {
    const start = bramble();
    const options = { ...OPTIONS, index: -2, attribute: 'curl' as const, value: 2.5 };
    const placed = run(start, startSession('singularity'), [(s, c) => clickAt(s, hitAt(2), c), (s, c) => chooseTool(s, 'pin', c), (s, c) => clickAt(s, hitAt(7), c)], { options });
    const spec = currentSpec(placed.editor);
    expect(spec.field.singularities.at(-1)).toMatchObject({ point: [0.2, 0, 1], index: -2 });
    expect(spec.pins.at(-1)).toEqual({ attribute: 'curl', point: [0.7, 0, 1], value: 2.5 });
    expect(placed.editor.selection).toEqual({ kind: 'pin', index: spec.pins.length - 1 });
    expect(pinTool.draft(pinTool.enter())).toEqual([]);
  });

  it('an edit the groom schema refuses changes nothing and says why', () => {
    const start = bramble();
    const options = { ...OPTIONS, value: -4 };
    const { editor, said } = run(start, startSession('pin'), [(s, c) => clickAt(s, hitAt(7), c)], { options });
    expect(currentSpec(editor)).toBe(currentSpec(start));
    expect(said[0]).toMatch(/\S/);
  });

  it('the remainder tool puts what remains on the piece clicked, then hands back to looking', () => {
    const start = bramble();
    // Two pieces: vertices 0–9 on piece 0, 10–19 on piece 1, vertex 19 on the curve between them.
    const pieceOfVertex = Int32Array.from({ length: 20 }, (_, v) => (v === 19 ? -1 : v < 10 ? 0 : 1));
    const pieces = [
      { piece: 0, component: 0, borderedBy: ['parting 1'], demanded: 1, placed: 1, remainder: 0 },
      { piece: 1, component: 0, borderedBy: ['parting 1'], demanded: 1, placed: 2, remainder: -1 },
    ];
    const solve = { budget: { balanced: false, pieces, pieceOfVertex } };
    const placed = run(start, startSession('remainder'), [(s, c) => clickAt(s, hitAt(12), c)], { solve });
    expect(currentSpec(placed.editor).field.singularities.at(-1)).toMatchObject({ point: [1.2, 0, 1], index: -1 });
    expect(placed.session.tool).toBe('look');

    const nothing = run(start, startSession('remainder'), [(s, c) => clickAt(s, hitAt(4), c)], { solve });
    expect(currentSpec(nothing.editor)).toBe(currentSpec(start));
    expect(nothing.said[0]).toBe('Nothing remains to be placed on this piece of the surface.');
    expect(nothing.session.tool).toBe('look');

    const onCurve = run(start, startSession('remainder'), [(s, c) => clickAt(s, hitAt(19), c)], { solve });
    expect(currentSpec(onCurve.editor)).toBe(currentSpec(start));
    expect(onCurve.said[0]).toBe('That point is on a parting or crest; click beside it.');
  });

  it('a click on bare surface with "Turn & pick" drops the selection', () => {
    const start = select(bramble(), { kind: 'pin', index: 1 });
    const { editor } = run(start, startSession('look'), [(s, c) => clickAt(s, hitAt(1), c)]);
    expect(editor.selection).toBeNull();
    expect(currentSpec(editor)).toBe(currentSpec(start));
  });
});
