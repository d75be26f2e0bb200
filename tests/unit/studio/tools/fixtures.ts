// What the tool tests share: Bramble's spec in a fresh editor, a context around it, hits on the
// surface at a vertex and a spot of the screen, and a way to run a tool's steps and their changes.
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { createEditorState, type EditorState } from '@/lib/studio/client/editor-state';
import type { Vec3 } from '@/lib/studio/client/features';
import { applyChanges, type SessionStep, type ToolSession } from '@/lib/studio/client/tools/session';
import type { SurfaceHit, ToolContext, ToolOptions, ToolStep } from '@/lib/studio/client/tools/tool';

export const OPTIONS: ToolOptions = { index: 2, attribute: 'length', value: 1.5, closed: false };

export function bramble(): EditorState {
  return createEditorState(parseGroomSpec(DEMO_GROOMS[0].spec));
}

/** A surface with edges about 0.1 long. */
export function contextOf(editor: EditorState, more: Partial<ToolContext> = {}): ToolContext {
  return { editor, options: OPTIONS, surface: { meanEdge: 0.1 }, solve: null, ...more };
}

/** A hit at a vertex placed at (vertex / 10, 0, 1), the pointer at a spot of the screen. */
export function hitAt(vertex: number, screen: { x: number; y: number } = { x: 100, y: 100 }, point?: Vec3): SurfaceHit {
  const place: Vec3 = [vertex / 10, 0, 1];
  return { point: point ?? place, face: vertex, vertex, vertexPoint: place, screen };
}

/** The editor after a tool's step (its changes carried out), and the words of any refusal or notice. */
export function carryOut(editor: EditorState, step: ToolStep<unknown> | SessionStep): { editor: EditorState; said: string | null } {
  const { editor: next, refused } = applyChanges(editor, step.changes ?? []);
  return { editor: next, said: refused ?? step.notice ?? null };
}

/** Runs session steps one after another on an editor, each with a context of the editor as it then is. */
export function run(
  editor: EditorState,
  session: ToolSession,
  steps: ((session: ToolSession, context: ToolContext) => SessionStep | null)[],
  more: Partial<ToolContext> = {},
): { editor: EditorState; session: ToolSession; said: (string | null | undefined)[] } {
  const said: (string | null | undefined)[] = [];
  for (const next of steps) {
    const step = next(session, contextOf(editor, more));
    if (!step) {
      said.push(undefined);
      continue;
    }
    const done = applyChanges(editor, step.changes);
    editor = done.editor;
    session = step.session;
    said.push(done.refused ?? step.notice);
  }
  return { editor, session, said };
}
