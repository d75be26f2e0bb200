'use client';
// A progress bar for long steps. With a known fraction it shows it; for a step that reports no
// progress of its own but whose length can be estimated, it moves toward the end over the
// expected time (stopping short of it) and says it is an estimate.
import { useEffect, useState } from 'react';

export function ProgressBar({
  label,
  fraction,
  expectedMilliseconds,
  startedAt,
  tone = 'light',
}: {
  label: string;
  fraction: number | null;
  expectedMilliseconds?: number;
  startedAt?: number;
  tone?: 'light' | 'dark';
}) {
  const [now, setNow] = useState(() => performance.now());
  const estimating = fraction === null && expectedMilliseconds !== undefined && startedAt !== undefined;
  useEffect(() => {
    if (!estimating) return;
    const timer = setInterval(() => setNow(performance.now()), 100);
    return () => clearInterval(timer);
  }, [estimating]);
  const shown = fraction ?? (estimating ? Math.min(0.95, (now - startedAt!) / Math.max(1, expectedMilliseconds!)) : null);
  const seconds = estimating ? Math.max(1, Math.round(expectedMilliseconds! / 1000)) : null;
  const text = tone === 'dark' ? 'text-chalk' : 'text-loam';
  return (
    <div className="flex flex-col gap-1.5">
      <div className={`flex justify-between gap-3 text-sm ${text}`}>
        <span>{label}</span>
        <span className="tabular-nums">
          {fraction !== null ? `${Math.round(fraction * 100)} %` : seconds !== null ? `about ${seconds} s` : ''}
        </span>
      </div>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={shown === null ? undefined : Math.round(shown * 100)}
        className={`h-2 overflow-hidden rounded-full ${tone === 'dark' ? 'bg-chalk/20' : 'bg-vellum'}`}
      >
        <div
          className={`h-full rounded-full bg-pollen ${shown === null ? 'w-1/3 animate-pulse' : 'transition-[width] duration-100'}`}
          style={shown === null ? undefined : { width: `${Math.max(2, shown * 100)}%` }}
        />
      </div>
    </div>
  );
}
