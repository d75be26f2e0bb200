import { describe, expect, it } from 'vitest';
import { currentSpec, undoLabel } from '@/lib/studio/client/editor-state';
import { flowTool } from '@/lib/studio/client/tools/flow';
import { holdsPointer, pointerDown, pointerMove, pointerUp, sessionDraft, startSession, type ToolSession } from '@/lib/studio/client/tools/session';
import { bramble, hitAt, run } from './fixtures';

const along = (x: number) => hitAt(0, { x: 100 + 100 * x, y: 100 }, [x, 0.123456789, 1]);

describe('a flow stroke by dragging', () => {
  it('takes a point every one and a half mean edges, holds the pointer meanwhile, and is one stroke when let go', () => {
    const start = bramble();
    let during: ToolSession | null = null;
    const { editor, session } = run(start, startSession('flow'), [
      (s, c) => pointerDown(s, along(0), c),
      ...[0.05, 0.1, 0.16, 0.2, 0.31, 0.4, 0.47].map((x) => (s: ToolSession, c: Parameters<typeof pointerMove>[2]) => pointerMove(s, along(x), c)),
      (s) => ((during = s), { session: s, changes: [] }),
      (s, c) => pointerUp(s, along(0.5), c),
      (s, c) => pointerUp(s, null, c),
    ]);
    expect(holdsPointer(during!)).toBe(true);
    expect(sessionDraft(during!)).toEqual([[0, 0.1234568, 1], [0.16, 0.1234568, 1], [0.31, 0.1234568, 1], [0.47, 0.1234568, 1]]);
    const strokes = currentSpec(editor).field.strokes;
    expect(strokes).toHaveLength(currentSpec(start).field.strokes.length + 1);
    expect(strokes.at(-1)!.points).toHaveLength(4);
    expect(undoLabel(editor)).toBe('Draw flow stroke');
    expect(holdsPointer(session)).toBe(false);
    expect(sessionDraft(session)).toEqual([]);
  });

  it('a drag too short for two points adds nothing and says so; a release off the surface ends the stroke too', () => {
    const start = bramble();
    const short = run(start, startSession('flow'), [(s, c) => pointerDown(s, along(0), c), (s, c) => pointerMove(s, along(0.1), c), (s, c) => pointerUp(s, null, c)]);
    expect(currentSpec(short.editor)).toBe(currentSpec(start));
    expect(short.said.at(-1)).toBe('A flow stroke needs a longer drag across the surface.');

    const off = run(start, startSession('flow'), [(s, c) => pointerDown(s, along(0), c), (s, c) => pointerMove(s, along(0.3), c), (s, c) => pointerUp(s, null, c)]);
    expect(currentSpec(off.editor).field.strokes).toHaveLength(currentSpec(start).field.strokes.length + 1);
  });

  it('moving without a press draws nothing', () => {
    const idle = flowTool.enter();
    expect(flowTool.holds(idle)).toBe(false);
    const start = bramble();
    const { session } = run(start, startSession('flow'), [(s, c) => pointerMove(s, along(0.3), c)]);
    expect(sessionDraft(session)).toEqual([]);
  });
});
