'use client';
// A number typed by keyboard and applied when the field is left or Enter is pressed (Escape puts
// the applied value back). Whatever stops the value — not a number, out of range, or a message the
// spec check returns — appears under the field, tied to it for screen readers.
import { useEffect, useId, useState, type KeyboardEvent } from 'react';

export type Commit = (value: number) => string | null | void;

export function formatNumber(value: number | undefined, digits = 6): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return String(Number(value.toPrecision(digits)));
}

export function NumberField({
  label,
  value,
  onCommit,
  min,
  max,
  step = 'any',
  integer = false,
  unit,
  error: outsideError,
  compact = false,
  hideLabel = false,
  disabled = false,
}: {
  label: string;
  value: number | undefined;
  onCommit: Commit;
  min?: number;
  max?: number;
  step?: number | 'any';
  integer?: boolean;
  unit?: string;
  error?: string | null;
  compact?: boolean;
  hideLabel?: boolean;
  disabled?: boolean;
}) {
  const id = useId();
  const [text, setText] = useState(formatNumber(value));
  const [editing, setEditing] = useState(false);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    if (!editing) setText(formatNumber(value));
  }, [editing, value]);

  function commit() {
    setEditing(false);
    const trimmed = text.trim();
    if (trimmed === formatNumber(value)) {
      setError(null);
      return;
    }
    const parsed = Number(trimmed.replace('−', '-'));
    if (trimmed === '' || !Number.isFinite(parsed)) return setError('Enter a number.');
    if (integer && !Number.isInteger(parsed)) return setError('Enter a whole number.');
    if (min !== undefined && parsed < min) return setError(`Use ${formatNumber(min)} or more.`);
    if (max !== undefined && parsed > max) return setError(`Use ${formatNumber(max)} or less.`);
    const refused = onCommit(parsed);
    setError(refused || null);
  }

  function onKeyDown(event: KeyboardEvent<HTMLInputElement>) {
    if (event.key === 'Enter') {
      event.preventDefault();
      commit();
    } else if (event.key === 'Escape') {
      setText(formatNumber(value));
      setEditing(false);
      setError(null);
      event.currentTarget.blur();
    }
  }

  const message = error ?? outsideError ?? null;
  return (
    <div className={`flex min-w-0 flex-col ${compact ? 'gap-0.5' : 'gap-1'}`}>
      <label htmlFor={id} className={hideLabel ? 'sr-only' : `text-xs font-semibold text-loam-soft`}>
        {label}
      </label>
      <div className="flex items-center gap-1">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={text}
          disabled={disabled}
          aria-invalid={message ? true : undefined}
          aria-describedby={message ? `${id}-error` : undefined}
          data-step={step}
          onFocus={() => setEditing(true)}
          onChange={(event) => {
            setEditing(true);
            setText(event.target.value);
          }}
          onBlur={commit}
          onKeyDown={onKeyDown}
          className={`w-full min-w-0 rounded-lg border-2 bg-white px-2 py-1 text-sm tabular-nums text-loam disabled:bg-vellum ${
            message ? 'border-hawthorn' : 'border-vellum focus:border-tarn'
          }`}
        />
        {unit && <span className="shrink-0 text-xs text-loam-soft">{unit}</span>}
      </div>
      {message && (
        <p id={`${id}-error`} className="text-xs font-medium text-hawthorn" data-field-error={label}>
          {message}
        </p>
      )}
    </div>
  );
}
