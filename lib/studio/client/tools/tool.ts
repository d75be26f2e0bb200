// What an editor tool is: a pure state machine over the pointer on the surface and the keyboard.
// Each step returns the tool's next state and the changes it asks of the editor state
// (editor-state.ts); the page only turns browser events into these steps and carries the changes
// out. No React, no DOM: every tool is tested with plain values.
import type { PinAttribute } from '@/lib/groom/spec/spec';
import type { EditorState } from '../editor-state';
import type { FeatureRef, Vec3 } from '../features';
import type { BrushOptions, PaintSurface } from '../paint';
import type { OpenedSurface, SolveReport } from '../protocol';
import type { SpecEdit } from '../spec-edits';

export type ToolId = 'look' | 'whorl' | 'saddle' | 'singularity' | 'parting' | 'crest' | 'flow' | 'pin' | 'remainder' | 'tint';

/** The choices the tool rail offers for the tools that need them. */
export interface ToolOptions {
  /** Index of the "any index" tool. */
  readonly index: number;
  readonly attribute: PinAttribute;
  readonly value: number;
  /** Whether a parting or crest being drawn closes into a loop. */
  readonly closed: boolean;
  /** The tint brush's choices (absent: the brush has nothing to paint yet). */
  readonly brush?: BrushOptions;
}

/** Where the pointer meets the surface. */
export interface SurfaceHit {
  readonly point: Vec3;
  readonly face: number;
  /** The corner of the face nearest the point, and its place rounded for the spec. */
  readonly vertex: number;
  readonly vertexPoint: Vec3;
  /** Where the pointer is on the screen, in CSS pixels. */
  readonly screen: { readonly x: number; readonly y: number };
}

/** What a tool may read besides its own state. */
export interface ToolContext {
  readonly editor: EditorState;
  readonly options: ToolOptions;
  readonly surface: Pick<OpenedSurface, 'meanEdge'>;
  readonly solve: Pick<SolveReport, 'budget'> | null;
  /** The surface prepared for the tint brush (absent until the surface is open). */
  readonly paint?: PaintSurface;
}

/** A change a tool asks of the editor state; `apply` is checked with the groom schema first. */
export type EditorChange =
  | { readonly type: 'apply'; readonly edit: SpecEdit }
  | { readonly type: 'preview'; readonly edit: SpecEdit }
  | { readonly type: 'end-gesture' }
  | { readonly type: 'select'; readonly feature: FeatureRef | null };

export interface ToolStep<S> {
  readonly state: S;
  readonly changes?: readonly EditorChange[];
  /** Words for the groomer about what could not be done. */
  readonly notice?: string;
  /** The tool to go on with (the remainder tool hands back to looking after its one click). */
  readonly then?: ToolId;
}

/** The draft of a tool that holds no points. */
export const NO_DRAFT: readonly Vec3[] = [];

export interface Tool<S> {
  readonly id: ToolId;
  readonly label: string;
  /** The key that picks the tool, or null for a tool picked otherwise (the remainder, from the budget). */
  readonly shortcut: string | null;
  /** What the tool does, in one line under the stage. */
  readonly hint: string;
  enter(): S;
  pointerDown(state: S, hit: SurfaceHit, context: ToolContext): ToolStep<S>;
  pointerMove(state: S, hit: SurfaceHit, context: ToolContext): ToolStep<S>;
  /** The pointer let go: over the surface (`hit`) or anywhere else (null). Both may come for one release. */
  pointerUp(state: S, hit: SurfaceHit | null, context: ToolContext): ToolStep<S>;
  /** A key pressed (`Enter`, `Escape`…); null when the tool does nothing with it. */
  key(state: S, key: string, context: ToolContext): ToolStep<S> | null;
  /** Leaving the tool: what it holds unfinished is finished or dropped. */
  exit(state: S, context: ToolContext): ToolStep<S>;
  /** The points drawn and not yet a feature, for the stage to show (the same array while they do not change). */
  draft(state: S): readonly Vec3[];
  /** Whether the stage shows the draft joined along the mesh (a curve) rather than as points alone. */
  readonly joinsDraft: boolean;
  /**
   * Whether a press on a marker picks it (and a drag moves it). The tools that draw lines say no:
   * a click that lands on a marker while drawing must not open its card (whose next click could
   * delete it).
   */
  readonly picksMarkers: boolean;
  /** Whether the tool holds the pointer (a stroke being dragged): the view must not turn meanwhile. */
  holds(state: S): boolean;
}
