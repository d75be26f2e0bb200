import { describe, expect, it } from 'vitest';
import { currentSpec, undoLabel } from '@/lib/studio/client/editor-state';
import { partingTool } from '@/lib/studio/client/tools/parting';
import { chooseTool, clickAt, sessionDraft, startSession, toolKey } from '@/lib/studio/client/tools/session';
import { OPTIONS, bramble, contextOf, hitAt, run } from './fixtures';

describe('drawing a parting or a crest from clicked points', () => {
  it('clicked points are kept as the draft; Enter makes them one parting', () => {
    const start = bramble();
    const drawn = run(start, startSession('parting'), [(s, c) => clickAt(s, hitAt(1), c), (s, c) => clickAt(s, hitAt(2), c), (s, c) => clickAt(s, hitAt(4), c)]);
    expect(sessionDraft(drawn.session)).toEqual([[0.1, 0, 1], [0.2, 0, 1], [0.4, 0, 1]]);
    expect(currentSpec(drawn.editor)).toBe(currentSpec(start));
    const finished = run(drawn.editor, drawn.session, [(s, c) => toolKey(s, 'Enter', c)]);
    expect(currentSpec(finished.editor).field.partings).toEqual([{ points: [[0.1, 0, 1], [0.2, 0, 1], [0.4, 0, 1]], closed: false }]);
    expect(undoLabel(finished.editor)).toBe('Draw parting');
    expect(sessionDraft(finished.session)).toEqual([]);
    expect(finished.session.tool).toBe('parting');
  });

  it('a second click on the last point finishes a crest, closed when the rail says so', () => {
    const start = bramble();
    const options = { ...OPTIONS, closed: true };
    const drawn = run(start, startSession('crest'), [1, 5, 9, 9].map((v) => (s, c) => clickAt(s, hitAt(v), c)), { options });
    expect(currentSpec(drawn.editor).field.crests).toEqual([{ points: [[0.1, 0, 1], [0.5, 0, 1], [0.9, 0, 1]], closed: true }]);
    expect(drawn.editor.selection).toEqual({ kind: 'crest', index: 0 });
  });

  it('Escape drops the points and goes back to looking', () => {
    const start = bramble();
    const { editor, session } = run(start, startSession('parting'), [(s, c) => clickAt(s, hitAt(1), c), (s, c) => clickAt(s, hitAt(2), c), (s, c) => toolKey(s, 'Escape', c)]);
    expect(currentSpec(editor)).toBe(currentSpec(start));
    expect(session.tool).toBe('look');
    expect(sessionDraft(session)).toEqual([]);
  });

  it('picking another tool mid-curve finishes the curve; a single point is dropped', () => {
    const start = bramble();
    const switched = run(start, startSession('parting'), [(s, c) => clickAt(s, hitAt(1), c), (s, c) => clickAt(s, hitAt(3), c), (s, c) => chooseTool(s, 'flow', c)]);
    expect(currentSpec(switched.editor).field.partings).toHaveLength(1);
    expect(switched.session.tool).toBe('flow');
    expect(switched.said).toEqual([undefined, undefined, null]);

    const single = run(start, startSession('crest'), [(s, c) => clickAt(s, hitAt(1), c), (s, c) => chooseTool(s, 'whorl', c)]);
    expect(currentSpec(single.editor)).toBe(currentSpec(start));
  });

  it('Enter with nothing drawn, and keys the tool does not use, are left to the page', () => {
    const context = contextOf(bramble());
    expect(partingTool.key(partingTool.enter(), 'Enter', context)).toBeNull();
    expect(toolKey(startSession('parting'), 'Delete', context)).toBeNull();
    expect(toolKey(startSession('parting'), 'Enter', context)).toBeNull();
  });
});
