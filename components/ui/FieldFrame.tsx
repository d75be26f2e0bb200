// The label, hint and error line around a form control (input, text area, select), tied together
// for screen readers: the control names the hint or the error line it stands with.
import type { ReactNode } from 'react';

export function describedBy(id: string, hint?: string, error?: string): string | undefined {
  return [hint && !error && `${id}-hint`, error && `${id}-error`].filter(Boolean).join(' ') || undefined;
}

export function FieldFrame({ id, name, label, hint, error, children }: { id: string; name: string; label: string; hint?: string; error?: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-loam">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={`${id}-hint`} className="text-sm text-loam-soft">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} className="text-sm font-medium text-hawthorn" data-field-error={name}>
          {error}
        </p>
      )}
    </div>
  );
}

/** The border of a control: red with an error, else the quiet one that darkens on focus. */
export function controlBorder(error?: string): string {
  return error ? 'border-hawthorn' : 'border-vellum focus:border-tarn';
}
