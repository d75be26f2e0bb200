// The tint brush as a state machine (lib/studio/client/tools/tint.ts): a stroke is one history
// entry written at release, mirrored with twin sides on, undone whole.
import { describe, expect, it } from 'vitest';
import { decodeMap, decodeMask } from '@/lib/groom/place/maps';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { createEditorState, undo, type EditorState } from '@/lib/studio/client/editor-state';
import { defaultBrush, preparePaintSurface, type BrushOptions } from '@/lib/studio/client/paint';
import { chooseTool, holdsPointer, pointerDown, pointerMove, pointerUp, startSession, toolKey } from '@/lib/studio/client/tools/session';
import type { SurfaceHit } from '@/lib/studio/client/tools/tool';
import { gridPlane } from '@/tests/fixtures/shapes';
import { OPTIONS, run } from './fixtures';

/** A 1 × 1 grid of 20 × 20 squares: symmetric across the plane x = y (each square's diagonal runs along it). */
const grid = gridPlane(20, 20);
const paint = preparePaintSurface(grid);
const nV = grid.positions.length / 3;

function editorOf(more: Partial<GroomSpecInput> = {}): EditorState {
  return createEditorState(parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, ...more }));
}

/** A hit at (x, y) on the face that holds it (as the stage's ray finds it): the grid's square, then its half. */
function hit(x: number, y: number): SurfaceHit {
  const tri = grid.triangles, p = grid.positions;
  const i = Math.min(19, Math.floor((x + 0.5) * 20)), j = Math.min(19, Math.floor((y + 0.5) * 20));
  // gridPlane's squares split along (i, j)–(i + 1, j + 1): the first half below that diagonal.
  const u = (x + 0.5) * 20 - i, v = (y + 0.5) * 20 - j;
  const face = 2 * (j * 20 + i) + (v > u ? 1 : 0);
  return { point: [x, y, 0], face, vertex: tri[3 * face], vertexPoint: [p[3 * tri[3 * face]], p[3 * tri[3 * face] + 1], 0], screen: { x: 0, y: 0 } };
}

const brush = (more: Partial<BrushOptions> = {}): BrushOptions => ({ ...defaultBrush(0.05), paints: { kind: 'map', attribute: 'length' }, radius: 0.15, strength: 1, ...more });
const more = (b: BrushOptions | undefined) => ({ options: { ...OPTIONS, ...(b ? { brush: b } : {}) }, paint });

/** A drag from (x0, y) to (x1, y) in steps of 0.01, then a release. */
function stroke(editor: EditorState, b: BrushOptions | undefined, x0: number, x1: number, y: number) {
  const session = chooseTool(startSession(), 'tint', { editor, options: OPTIONS, surface: { meanEdge: 0.05 }, solve: null }).session;
  const steps: Parameters<typeof run>[2] = [(s, c) => pointerDown(s, hit(x0, y), c)];
  for (let x = x0; x <= x1 + 1e-9; x += 0.01) steps.push((s, c) => pointerMove(s, hit(x, y), c));
  steps.push((s, c) => pointerUp(s, hit(x1, y), c));
  return run(editor, session, steps, more(b));
}

const mapOf = (editor: EditorState) => decodeMap(editor.present.spec.maps!.find((m) => m.attribute === 'length')!, grid);

describe('the tint brush', () => {
  it('says what to do when nothing is picked to paint, and changes nothing', () => {
    const editor = editorOf();
    const done = stroke(editor, undefined, -0.2, 0.2, 0);
    expect(done.said[0]).toMatch(/Pick the map or mask to tint/);
    expect(done.editor.present.spec).toBe(editor.present.spec);
  });

  it('makes one history entry per stroke, written at release: the map painted along the drag and 1× elsewhere', () => {
    const editor = editorOf();
    const done = stroke(editor, brush({ target: 2 }), -0.2, 0.2, 0);
    expect(done.editor.past.length).toBe(1);
    expect(done.editor.present.label).toBe('Tint the length map');
    const values = mapOf(done.editor);
    const p = grid.positions;
    for (let v = 0; v < nV; v++) {
      const x = p[3 * v], y = p[3 * v + 1];
      // Nearest point of the drag's segment.
      const d = Math.hypot(Math.max(0, Math.abs(x) - 0.2), y);
      if (d > 0.15 + 1e-9) expect(values[v]).toBe(1);
      if (d < 0.05) expect(values[v]).toBeGreaterThan(1.5);
      expect(values[v]).toBeLessThanOrEqual(2);
    }
    expect(undo(done.editor).present.spec).toBe(editor.present.spec);
  });

  it('holds the pointer while dragging (the view must not turn), and Escape drops the stroke unwritten', () => {
    const editor = editorOf();
    const context = { editor, surface: { meanEdge: 0.05 }, solve: null, ...more(brush()) };
    const down = pointerDown(chooseTool(startSession(), 'tint', context).session, hit(0, 0), context);
    expect(holdsPointer(down.session)).toBe(true);
    const dropped = toolKey(down.session, 'Escape', context)!;
    expect(holdsPointer(dropped.session)).toBe(false);
    expect(dropped.changes.filter((c) => c.type === 'apply')).toEqual([]);
  });

  it('erases back to exactly 1× (full strength, hard edge): a map of ones again', () => {
    const painted = stroke(editorOf(), brush({ target: 3 }), -0.1, 0.1, 0).editor;
    const erased = stroke(painted, brush({ mode: 'erase', falloff: 'hard', radius: 0.3 }), -0.15, 0.15, 0).editor;
    expect(erased.past.length).toBe(2);
    expect(mapOf(erased).every((x) => x === 1)).toBe(true);
  });

  it('paints a mask between 0 and 1, its own name in the history', () => {
    const done = stroke(editorOf(), brush({ paints: { kind: 'mask', name: 'cheek' }, target: 1, falloff: 'hard' }), 0, 0.1, 0.1);
    expect(done.editor.present.label).toBe('Tint mask “cheek”');
    const mask = decodeMask(done.editor.present.spec.masks![0], grid);
    expect(Math.max(...mask)).toBe(1);
    expect(Math.min(...mask)).toBe(0);
  });

  it('with twin sides on, paints the mirror image in the same stroke: the value at each vertex equals its mirror vertex’s', () => {
    // The plane x = y: vertex (i, j) mirrors onto (j, i).
    const editor = editorOf({ symmetry: { normal: [1, -1, 0], offset: 0 } });
    // Off the grid's lines, so that each dab starts inside one face (a point on an edge may march from either face,
    // whose distances differ within fast marching's first-order error).
    const done = stroke(editor, brush({ target: 2.5 }), 0.053, 0.303, -0.213);
    expect(done.editor.past.length).toBe(1);
    const values = mapOf(done.editor);
    const at = (i: number, j: number) => j * 21 + i;
    let painted = 0;
    for (let j = 0; j <= 20; j++) {
      for (let i = 0; i <= 20; i++) {
        // Within the 16-bit code step (2.5 − 1) / 65535.
        expect(Math.abs(values[at(i, j)] - values[at(j, i)])).toBeLessThanOrEqual(1.5 / 65535);
        if (values[at(i, j)] > 1) painted++;
      }
    }
    // Near (0.2, −0.2) and its image (−0.2, 0.2), i.e. grid squares (14, 6) and (6, 14).
    expect(values[at(14, 6)]).toBeGreaterThan(2);
    expect(values[at(6, 14)]).toBeGreaterThan(2);
    expect(painted).toBeGreaterThan(20);
  });

  it('a drag shorter than a quarter of the radius makes no new dab', () => {
    const editor = editorOf();
    const context = { editor, surface: { meanEdge: 0.05 }, solve: null, ...more(brush({ radius: 0.2 })) };
    const down = pointerDown(chooseTool(startSession(), 'tint', context).session, hit(0, 0), context);
    const moved = pointerMove(down.session, hit(0.04, 0), context);
    expect(moved.session).toBe(down.session);
    const further = pointerMove(down.session, hit(0.06, 0), context);
    expect(further.session).not.toBe(down.session);
  });
});
