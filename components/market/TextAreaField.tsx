// A labelled text area with its own error line, like TextField (components/ui) for longer text.
import type React from 'react';
import type { TextareaHTMLAttributes } from 'react';
import { controlBorder, describedBy, FieldFrame } from '@/components/ui/FieldFrame';

type TextAreaFieldProps = {
  label: string;
  name: string;
  error?: string;
  hint?: string;
} & Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'name'>;

export function TextAreaField({ label, name, error, hint, id: givenId, ...input }: TextAreaFieldProps) {
  const id = givenId ?? `field-${name}`;
  return (
    <FieldFrame id={id} name={name} label={label} hint={hint} error={error}>
      <textarea
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        className={`min-h-28 rounded-xl border-2 bg-white px-3.5 py-2.5 text-base text-loam placeholder:text-loam-soft/60 ${controlBorder(error)}`}
        {...input}
      />
    </FieldFrame>
  );
}

type InputHandlers = {
  name: string;
  error?: string;
  onChange: (event: React.ChangeEvent<HTMLInputElement>) => void;
  onBlur: (event: React.FocusEvent<HTMLInputElement>) => void;
};

/**
 * useValidatedForm's field() for a text area: its handlers read only `target.form` and
 * `target.value`, which a text area has too.
 */
export function textAreaField(field: InputHandlers) {
  return {
    name: field.name,
    error: field.error,
    onChange: (event: React.ChangeEvent<HTMLTextAreaElement>) => field.onChange(event as unknown as React.ChangeEvent<HTMLInputElement>),
    onBlur: (event: React.FocusEvent<HTMLTextAreaElement>) => field.onBlur(event as unknown as React.FocusEvent<HTMLInputElement>),
  };
}
