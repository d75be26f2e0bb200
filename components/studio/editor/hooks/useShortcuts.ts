'use client';
// The editor's keyboard: Ctrl/⌘+Z undoes, Ctrl/⌘+Shift+Z and Ctrl/⌘+Y redo, and every other
// plain key (no Ctrl, ⌘ or Alt) goes to `onKey` — never while the groomer types in a field.
import { useEffect } from 'react';
import { useLatest } from './useLiveState';

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName);
}

export function useShortcuts(handlers: { undo: () => void; redo: () => void; onKey: (key: string) => void }): void {
  const latest = useLatest(handlers);
  useEffect(() => {
    const onKeyDown = (event: KeyboardEvent) => {
      const { undo, redo, onKey } = latest.current;
      const typing = isTyping(event.target);
      const mod = event.ctrlKey || event.metaKey;
      const letter = event.key.toLowerCase();
      if (mod && !typing && (letter === 'z' || letter === 'y')) {
        event.preventDefault();
        if (letter === 'z' && !event.shiftKey) undo();
        else redo();
        return;
      }
      if (typing || mod || event.altKey) return;
      onKey(event.key);
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [latest]);
}
