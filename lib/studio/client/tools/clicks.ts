// Tools that act on a click on the surface (a press and a release close together), and the click
// test the drawing tools share: a press that travels further is the view being turned.
import { NO_DRAFT, type SurfaceHit, type Tool, type ToolContext, type ToolId, type ToolStep } from './tool';

/** How far, in CSS pixels, the pointer may travel between press and release for a click. */
export const CLICK_TRAVEL = 5;

export interface Press {
  readonly x: number;
  readonly y: number;
}

/** The hit of a release that completes a click begun at `press`, or null. */
export function clickHit(press: Press | null, hit: SurfaceHit | null): SurfaceHit | null {
  if (!press || !hit) return null;
  return Math.hypot(hit.screen.x - press.x, hit.screen.y - press.y) <= CLICK_TRAVEL ? hit : null;
}

export interface ClickState {
  readonly press: Press | null;
}

/** What a click does: the changes, words when it could not, the tool to go on with. */
export type ClickResult = Omit<ToolStep<ClickState>, 'state'>;

/** A tool whose only act is a click on the surface. */
export function clickTool(about: { id: ToolId; label: string; shortcut: string | null; hint: string }, click: (hit: SurfaceHit, context: ToolContext) => ClickResult): Tool<ClickState> {
  const idle: ClickState = { press: null };
  return {
    ...about,
    enter: () => idle,
    pointerDown: (_state, hit) => ({ state: { press: hit.screen } }),
    pointerMove: (state) => ({ state }),
    pointerUp(state, hit, context) {
      if (!state.press) return { state };
      const clicked = clickHit(state.press, hit);
      return clicked ? { ...click(clicked, context), state: idle } : { state: idle };
    },
    key: () => null,
    exit: () => ({ state: idle }),
    draft: () => NO_DRAFT,
    joinsDraft: false,
    picksMarkers: true,
    holds: () => false,
  };
}
