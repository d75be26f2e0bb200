// What the side panels and the marker card may do to the groom being edited, without knowing the
// editor's page that carries them out (so that no panel imports the page).
import type { FeatureRef } from '@/lib/studio/client/features';
import type { ListedFeature } from '@/lib/studio/client/list-additions';
import type { SpecEdit } from '@/lib/studio/client/spec-edits';

/** Everything panels need to read and change the spec. */
export interface EditorActions {
  /** Applies an edit as one undoable step; returns what stopped it, in words, or null. */
  edit(edit: SpecEdit): string | null;
  /** Shows an edit while a slider or drag is held; `finish` makes it one undoable step. */
  preview(edit: SpecEdit): string | null;
  finish(): void;
  select(feature: FeatureRef | null): void;
  lookAt(feature: FeatureRef): void;
  /** Adds a feature from the side list, at the surface point in the middle of the view. */
  addFromList(kind: ListedFeature): void;
}
