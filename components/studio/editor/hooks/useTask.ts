'use client';
// A long task in the field worker as the page shows it: its latest progress and when its current
// stage began (for the progress bar's estimate).
import { useCallback, useRef, useState } from 'react';
import type { ProgressReport } from '@/lib/studio/client/protocol';

export interface Task {
  readonly progress: ProgressReport;
  readonly startedAt: number;
}

/** The task shown, a progress listener to give the worker, and a way to clear it when it ends. */
export function useTask(): [Task | null, (progress: ProgressReport) => void, () => void] {
  const [task, setTask] = useState<Task | null>(null);
  const stage = useRef<{ name: string; at: number } | null>(null);
  const report = useCallback((progress: ProgressReport) => {
    if (stage.current?.name !== progress.stage) stage.current = { name: progress.stage, at: performance.now() };
    setTask({ progress, startedAt: stage.current.at });
  }, []);
  const clear = useCallback(() => setTask(null), []);
  return [task, report, clear];
}
