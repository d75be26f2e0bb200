// Turns a zod error into one message per form field, the shape the forms display.
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export function fieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : 'form';
    fields[key] ??= issue.message;
  }
  return fields;
}
