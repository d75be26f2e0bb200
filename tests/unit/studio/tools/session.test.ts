import { describe, expect, it } from 'vitest';
import { canUndo, createEditorState, currentSpec, undo, undoLabel } from '@/lib/studio/client/editor-state';
import { RAIL_TOOLS, TOOLS, toolOfKey } from '@/lib/studio/client/tools';
import { chooseTool, holdsPointer, pointerDown, pointerMove, pointerUp, pressMarker, startSession, toolKey } from '@/lib/studio/client/tools/session';
import { bramble, contextOf, hitAt, run } from './fixtures';

describe('dragging a marker, with any tool but those that draw lines', () => {
  it('a press picks the marker, each new vertex is shown, the release makes one history entry', () => {
    const start = bramble();
    const { editor, session, said } = run(start, startSession('whorl'), [
      (s) => pressMarker(s, { kind: 'singularity', index: 0 }),
      (s, c) => pointerDown(s, hitAt(1), c),
      (s, c) => pointerMove(s, hitAt(2, { x: 110, y: 100 }), c),
      (s, c) => pointerMove(s, hitAt(2, { x: 112, y: 100 }), c),
      (s, c) => pointerMove(s, hitAt(3, { x: 120, y: 100 }), c),
      (s, c) => pointerUp(s, hitAt(3, { x: 120, y: 100 }), c),
      (s, c) => pointerUp(s, null, c),
    ]);
    expect(said.every((words) => !words)).toBe(true);
    expect(session.drag).toBeNull();
    expect(currentSpec(editor).field.singularities).toHaveLength(4);
    expect(currentSpec(editor).field.singularities[0].point).toEqual([0.3, 0, 1]);
    expect(editor.selection).toEqual({ kind: 'singularity', index: 0 });
    expect(editor.past).toHaveLength(1);
    expect(undoLabel(editor)).toBe('Move whorl 1');
    expect(currentSpec(undo(editor))).toBe(currentSpec(start));
  });

  it('holds the pointer while dragging; a pin is moved by its point, its file vertex dropped', () => {
    const opened = bramble();
    const spec = currentSpec(opened);
    const start = createEditorState({ ...spec, pins: spec.pins.map((pin, i) => (i === 1 ? { attribute: pin.attribute, value: pin.value, vertex: 5 } : pin)) });
    const pressed = pressMarker(startSession(), { kind: 'pin', index: 1 });
    expect(holdsPointer(pressed.session)).toBe(true);
    const { editor } = run(start, pressed.session, [(s, c) => pointerMove(s, hitAt(6), c), (s, c) => pointerUp(s, null, c)]);
    const pin = currentSpec(editor).pins[1];
    expect(pin.point).toEqual([0.6, 0, 1]);
    expect(currentSpec(start).pins[1].vertex).toBe(5);
    expect(pin.vertex).toBeUndefined();
    expect(undoLabel(editor)).toBe('Move length pin 2');
  });

  it('a press on a marker while drawing a parting, crest or flow stroke picks nothing and says how to go on', () => {
    const start = bramble();
    for (const tool of ['parting', 'crest', 'flow'] as const) {
      const { editor, session, said } = run(start, startSession(tool), [(s) => pressMarker(s, { kind: 'singularity', index: 0 }), (s, c) => pointerUp(s, null, c)]);
      expect(editor.selection).toBeNull();
      expect(session.drag).toBeNull();
      expect(currentSpec(editor)).toBe(currentSpec(start));
      expect(said[0]).toBe(`${TOOLS[tool].label} draws on the surface: click beside the marker. To pick a marker, use Turn & pick.`);
    }
  });

  it('a drag that only presses leaves no history entry', () => {
    const start = bramble();
    const { editor } = run(start, startSession(), [(s) => pressMarker(s, { kind: 'singularity', index: 1 }), (s, c) => pointerUp(s, null, c)]);
    expect(canUndo(editor)).toBe(false);
    expect(editor.selection).toEqual({ kind: 'singularity', index: 1 });
  });
});

describe('keys and picking tools', () => {
  it('each rail tool has its own key; the remainder tool has none', () => {
    expect(RAIL_TOOLS.map((tool) => tool.shortcut)).toEqual(['V', 'W', 'S', 'I', 'P', 'C', 'F', 'N', 'T']);
    expect(toolOfKey('w')?.id).toBe('whorl');
    expect(toolOfKey('x')).toBeUndefined();
    expect(TOOLS.remainder.shortcut).toBeNull();
    for (const [id, tool] of Object.entries(TOOLS)) expect(tool.id).toBe(id);
  });

  it('Escape goes back to looking from any tool; picking a tool clears the notice', () => {
    const context = contextOf(bramble());
    const escaped = toolKey(startSession('pin'), 'Escape', context)!;
    expect(escaped.session.tool).toBe('look');
    const picked = chooseTool(startSession('look'), 'crest', context);
    expect(picked.session.tool).toBe('crest');
    expect(picked.notice).toBeNull();
  });

  it('switching tools mid-stroke drops the stroke and lets the view turn again', () => {
    const start = bramble();
    const { editor, session } = run(start, startSession('flow'), [
      (s, c) => pointerDown(s, hitAt(0), c),
      (s, c) => pointerMove(s, hitAt(5, undefined, [0.5, 0, 1]), c),
      (s, c) => chooseTool(s, 'saddle', c),
      (s, c) => pointerUp(s, null, c),
    ]);
    expect(session.tool).toBe('saddle');
    expect(holdsPointer(session)).toBe(false);
    expect(currentSpec(editor)).toBe(currentSpec(start));
  });
});
