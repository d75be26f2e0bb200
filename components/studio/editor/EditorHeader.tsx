'use client';
// The editor's header: the groom's name, where it grows, whether it is saved, and undo and redo
// with what each would do in their titles.
import { canRedo, canUndo, redoLabel, undoLabel, type EditorState } from '@/lib/studio/client/editor-state';
import { SaveStatusLine } from './SaveStatusLine';
import type { Autosave } from './hooks/useAutosave';

const HISTORY_BUTTON = 'rounded-full border-2 border-tarn/30 px-4 py-1.5 text-sm font-semibold text-tarn hover:border-tarn disabled:opacity-40';

export function EditorHeader({ title, subtitle, editor, autosave, practice, onUndo, onRedo }: {
  title: string;
  subtitle: string;
  editor: EditorState;
  autosave: Autosave;
  practice: boolean;
  onUndo: () => void;
  onRedo: () => void;
}) {
  const undoing = undoLabel(editor);
  const redoing = redoLabel(editor);
  return (
    <header className="flex flex-wrap items-center gap-x-6 gap-y-2 rounded-2xl bg-vellum px-4 py-3">
      <div className="min-w-0 flex-1">
        <h1 className="truncate text-2xl font-extrabold tracking-tight">{title}</h1>
        <p className="truncate text-sm text-loam-soft">{subtitle}</p>
      </div>
      <SaveStatusLine status={autosave.status} practice={practice} onRetry={autosave.retry} onKeepMine={autosave.keepMine} />
      <div className="flex gap-2" role="group" aria-label="History">
        <button type="button" onClick={onUndo} disabled={!canUndo(editor)} title={undoing ? `Undo: ${undoing} (Ctrl+Z)` : 'Nothing to undo'} className={HISTORY_BUTTON}>
          Undo
        </button>
        <button type="button" onClick={onRedo} disabled={!canRedo(editor)} title={redoing ? `Redo: ${redoing} (Ctrl+Shift+Z)` : 'Nothing to redo'} className={HISTORY_BUTTON}>
          Redo
        </button>
      </div>
      <p className="sr-only" aria-live="polite">
        {undoing ? `Last change: ${undoing}` : ''}
      </p>
    </header>
  );
}
