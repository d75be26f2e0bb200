'use client';
// State that event handlers read at once: several pointer events can arrive between two renders,
// and each must start from what the one before it made, not from the last render's value.
import { useCallback, useRef, useState } from 'react';

/** The value (for rendering), a getter of its latest value (for handlers) and its setter. */
export function useLiveState<T>(initial: () => T): [T, () => T, (next: T) => void] {
  const [value, setValue] = useState(initial);
  const live = useRef(value);
  const get = useCallback(() => live.current, []);
  const set = useCallback((next: T) => {
    live.current = next;
    setValue(next);
  }, []);
  return [value, get, set];
}

/** A ref that always holds the latest render's value, for handlers that must stay the same function. */
export function useLatest<T>(value: T): { readonly current: T } {
  const ref = useRef(value);
  ref.current = value;
  return ref;
}
