// A labelled input with its own error line, tied together for screen readers.
import type { InputHTMLAttributes } from 'react';

type TextFieldProps = {
  label: string;
  name: string;
  error?: string;
  hint?: string;
} & Omit<InputHTMLAttributes<HTMLInputElement>, 'name'>;

export function TextField({ label, name, error, hint, ...input }: TextFieldProps) {
  const id = `field-${name}`;
  const describedBy = [hint && `${id}-hint`, error && `${id}-error`].filter(Boolean).join(' ') || undefined;
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-loam">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`rounded-xl border-2 bg-white px-3.5 py-2.5 text-base text-loam placeholder:text-loam-soft/60 ${
          error ? 'border-hawthorn' : 'border-vellum focus:border-tarn'
        }`}
        {...input}
      />
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
