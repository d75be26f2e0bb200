// The editor's state as a plain value: the spec being edited with its undo and redo history, the
// selected feature, and an unfinished gesture (a drag whose intermediate positions are shown but
// become one history entry when the pointer is let go). Every function returns a new state.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { featureExists, sameFeature, type FeatureRef } from './features';
import type { TwinSurface } from './mirror-edits';
import { applySpecEdit, checkedSpecEdit, describeSpecEdit, refusalText, type SpecEdit } from './spec-edits';

export interface HistoryEntry {
  readonly spec: GroomSpec;
  /** What the edit that led to this spec did, in words ("Move whorl 2"); the first entry says where the spec came from. */
  readonly label: string;
}

export interface EditorState {
  readonly past: readonly HistoryEntry[];
  readonly present: HistoryEntry;
  readonly future: readonly HistoryEntry[];
  readonly selection: FeatureRef | null;
  /** While a drag runs: the entry before it. Its intermediate specs replace `present` without history. */
  readonly gestureBase: HistoryEntry | null;
  /** The open surface as twin sides read it (not history): mirrored twists are then exact (see `applySpecEdit`). */
  readonly twinSurface?: TwinSurface;
}

/** Most undo steps kept; the oldest go first. */
export const HISTORY_LIMIT = 200;

export function createEditorState(spec: GroomSpec, label = 'Opened'): EditorState {
  return { past: [], present: { spec, label }, future: [], selection: null, gestureBase: null };
}

export function currentSpec(state: EditorState): GroomSpec {
  return state.present.spec;
}

/** The state with the open surface twin sides read (null: none known, mirrors stated by points alone). */
export function withTwinSurface(state: EditorState, twinSurface: TwinSurface | null): EditorState {
  const { twinSurface: _old, ...rest } = state;
  return twinSurface ? { ...rest, twinSurface } : rest;
}

// An added feature is selected: it is appended, so its number is the length of its list before
// the edit (its mirror image, when symmetry adds one, comes after it).
function selectionAfter(before: GroomSpec, spec: GroomSpec, selection: FeatureRef | null, edit: SpecEdit): FeatureRef | null {
  if (edit.type === 'add-singularity') return { kind: 'singularity', index: before.field.singularities.length };
  if (edit.type === 'add-curve') return { kind: edit.kind, index: (edit.kind === 'parting' ? before.field.partings : before.field.crests).length };
  if (edit.type === 'add-stroke') return { kind: 'stroke', index: before.field.strokes.length };
  if (edit.type === 'add-pin') return { kind: 'pin', index: before.pins.length };
  if (!selection) return null;
  if (edit.type === 'remove' && edit.feature.kind === selection.kind) {
    if (edit.feature.index === selection.index) return null;
    if (edit.feature.index < selection.index) return { kind: selection.kind, index: selection.index - 1 };
  }
  return featureExists(spec, selection) ? selection : null;
}

/**
 * Applies an edit as one undoable step (the redo list is dropped). `spec` may be given when the
 * caller already holds the checked, resolved result of the edit (see `checkedSpecEdit`).
 */
export function applyEdit(state: EditorState, edit: SpecEdit, spec?: GroomSpec): EditorState {
  const base = state.gestureBase ? endGesture(state) : state;
  const next = spec ?? applySpecEdit(base.present.spec, edit, base.twinSurface);
  const entry: HistoryEntry = { spec: next, label: describeSpecEdit(base.present.spec, edit) };
  return {
    past: [...base.past, base.present].slice(-HISTORY_LIMIT),
    present: entry,
    future: [],
    selection: selectionAfter(base.present.spec, next, base.selection, edit),
    gestureBase: null,
    ...(base.twinSurface ? { twinSurface: base.twinSurface } : {}),
  };
}

/** A state after an edit that was checked first: unchanged, with the reason in words, when it was refused. */
export interface CheckedStep {
  readonly state: EditorState;
  readonly refused: string | null;
}

/** Applies an edit as one undoable step if the groom schema accepts the result (see `checkedSpecEdit`). */
export function applyCheckedEdit(state: EditorState, edit: SpecEdit): CheckedStep {
  const checked = checkedSpecEdit(state.present.spec, edit, state.twinSurface);
  return checked.ok ? { state: applyEdit(state, edit, checked.spec), refused: null } : { state, refused: refusalText(checked.problems) };
}

/** Shows a step of a gesture if the groom schema accepts the result. */
export function previewCheckedEdit(state: EditorState, edit: SpecEdit): CheckedStep {
  const checked = checkedSpecEdit(state.present.spec, edit, state.twinSurface);
  return checked.ok ? { state: previewEdit(state, edit, checked.spec), refused: null } : { state, refused: refusalText(checked.problems) };
}

/**
 * Shows an intermediate step of a gesture (a drag): the spec changes, the history does not until
 * `endGesture`. Consecutive calls replace each other.
 */
export function previewEdit(state: EditorState, edit: SpecEdit, spec?: GroomSpec): EditorState {
  const base = state.gestureBase ?? state.present;
  const next = spec ?? applySpecEdit(state.present.spec, edit, state.twinSurface);
  return { ...state, gestureBase: base, present: { spec: next, label: describeSpecEdit(base.spec, edit) } };
}

/** Ends a gesture: one history entry if anything changed, none if the drag came back where it began. */
export function endGesture(state: EditorState): EditorState {
  const base = state.gestureBase;
  if (!base) return state;
  if (base.spec === state.present.spec || JSON.stringify(base.spec) === JSON.stringify(state.present.spec)) {
    return { ...state, present: base, gestureBase: null };
  }
  return { ...state, past: [...state.past, base].slice(-HISTORY_LIMIT), future: [], gestureBase: null };
}

/** Abandons a gesture: the spec goes back to what it was before the drag. */
export function cancelGesture(state: EditorState): EditorState {
  return state.gestureBase ? { ...state, present: state.gestureBase, gestureBase: null } : state;
}

export function canUndo(state: EditorState): boolean {
  return state.past.length > 0 || state.gestureBase !== null;
}

export function canRedo(state: EditorState): boolean {
  return state.future.length > 0 && state.gestureBase === null;
}

export function undo(state: EditorState): EditorState {
  if (state.gestureBase) return cancelGesture(state);
  const previous = state.past[state.past.length - 1];
  if (!previous) return state;
  return {
    ...state,
    past: state.past.slice(0, -1),
    present: previous,
    future: [state.present, ...state.future],
    selection: state.selection && featureExists(previous.spec, state.selection) ? state.selection : null,
  };
}

export function redo(state: EditorState): EditorState {
  if (state.gestureBase) return state;
  const [next, ...rest] = state.future;
  if (!next) return state;
  return {
    ...state,
    past: [...state.past, state.present],
    present: next,
    future: rest,
    selection: state.selection && featureExists(next.spec, state.selection) ? state.selection : null,
  };
}

/** What undo would take back and what redo would bring back, for the buttons' titles. */
export function undoLabel(state: EditorState): string | null {
  if (state.gestureBase) return state.present.label;
  return state.past.length > 0 ? state.present.label : null;
}

export function redoLabel(state: EditorState): string | null {
  return state.future[0]?.label ?? null;
}

export function select(state: EditorState, selection: FeatureRef | null): EditorState {
  if (sameFeature(state.selection, selection) || (!selection && !state.selection)) return state;
  return { ...state, selection: selection && featureExists(state.present.spec, selection) ? selection : null };
}
