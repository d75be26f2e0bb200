'use client';
// Field-level messages from the same zod schema the server checks with: a field is checked when
// it loses focus (and as it is edited once it shows an error), every field on submit, and the
// server's field messages appear in the same places. Inputs are uncontrolled and read from the
// form itself, so text typed before the page finished loading is what gets checked and sent.
import { useEffect, useState, type ChangeEvent, type FocusEvent, type FormEvent } from 'react';
import type { z } from 'zod';
import { fieldErrors, type FieldErrors } from '@/lib/http/field-errors';

function readForm(form: HTMLFormElement): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [name, value] of new FormData(form)) values[name] = String(value);
  return values;
}

/** Why a submission failed: a message for the whole form and, optionally, one per field. */
export type FormFailure = { message: string; fields?: FieldErrors };

export function useValidatedForm<Schema extends z.ZodObject>(schema: Schema) {
  type Name = keyof z.input<Schema> & string;
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<FormFailure | null>(null);
  const [busy, setBusy] = useState(false);
  // Until the page is interactive a submit would be a plain browser form post; buttons wait.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  function recheck(name: Name, form: HTMLFormElement | null) {
    if (!form) return;
    const result = schema.safeParse(readForm(form));
    const message = result.success ? undefined : fieldErrors(result.error)[name];
    setErrors((current) => {
      const { [name]: _previous, ...others } = current;
      return message ? { ...others, [name]: message } : others;
    });
  }

  function field(name: Name) {
    return {
      name,
      error: errors[name],
      onChange: (event: ChangeEvent<HTMLInputElement>) => {
        if (errors[name]) recheck(name, event.target.form);
      },
      onBlur: (event: FocusEvent<HTMLInputElement>) => {
        if (event.target.value !== '') recheck(name, event.target.form);
      },
    };
  }

  /** Checks every field of the form; returns the parsed values, or null after showing the messages. */
  function validate(form: HTMLFormElement): z.output<Schema> | null {
    const result = schema.safeParse(readForm(form));
    if (result.success) {
      setErrors({});
      return result.data;
    }
    setErrors(fieldErrors(result.error));
    return null;
  }

  /** Clears one field's message, for inputs that are not text fields (radio buttons). */
  function clearError(name: Name) {
    setErrors(({ [name]: _cleared, ...others }) => others);
  }

  /**
   * The form's submit handler: checks the fields, then runs `action` with the parsed values.
   * A failure the action returns is shown above the form and, per field, under the fields.
   */
  function onSubmit(action: (input: z.output<Schema>) => Promise<FormFailure | void>) {
    return async (event: FormEvent<HTMLFormElement>) => {
      event.preventDefault();
      const input = validate(event.currentTarget);
      if (!input) return;
      setBusy(true);
      setFailure(null);
      const result = await action(input);
      setBusy(false);
      if (!result) return;
      setFailure(result);
      if (result.fields) setErrors(result.fields);
    };
  }

  return { errors, field, clearError, onSubmit, failure, busy, ready };
}
