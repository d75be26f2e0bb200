// A labelled input with its own error line, tied together for screen readers.
import type { InputHTMLAttributes } from 'react';
import { controlBorder, describedBy, FieldFrame } from './FieldFrame';

type TextFieldProps = {
  label: string;
  name: string;
  error?: string;
  hint?: string;
} & Omit<InputHTMLAttributes<HTMLInputElement>, 'name'>;

export function TextField({ label, name, error, hint, ...input }: TextFieldProps) {
  const id = `field-${name}`;
  return (
    <FieldFrame id={id} name={name} label={label} hint={hint} error={error}>
      <input
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        className={`rounded-xl border-2 bg-white px-3.5 py-2.5 text-base text-loam placeholder:text-loam-soft/60 ${controlBorder(error)}`}
        {...input}
      />
    </FieldFrame>
  );
}
