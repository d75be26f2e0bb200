// The SDK sends its parameters form-encoded with bracketed keys (a[b][0][c]=v); these read
// them back into nested objects and pick typed values out, refusing bad ones as the API does.
import { invalid } from './errors';

export type FormValue = string | FormObject | FormValue[];
export type FormObject = { [key: string]: FormValue };

/** Decodes the SDK's form encoding into nested objects; numeric keys make arrays. */
export function decodeForm(text: string): FormObject {
  const root: FormObject = {};
  for (const [rawKey, value] of new URLSearchParams(text)) {
    const parts = rawKey.replace(/\]/g, '').split('[');
    let node: FormObject | FormValue[] = root;
    parts.forEach((part, i) => {
      const last = i === parts.length - 1;
      const key = Array.isArray(node) ? Number(part) : part;
      const container = node as Record<string | number, FormValue>;
      if (last) {
        container[key] = value;
        return;
      }
      if (container[key] === undefined) container[key] = /^\d+$/.test(parts[i + 1]) ? [] : {};
      node = container[key] as FormObject | FormValue[];
    });
  }
  return root;
}

/** The value when it is a plain string, else undefined. */
export function text(value: FormValue | undefined): string | undefined {
  return typeof value === 'string' ? value : undefined;
}

/** A whole number of at least `min`; absent gives undefined unless required (then 400). */
export function integer(value: FormValue | undefined, param: string, { min = 0, required = false } = {}): number | undefined {
  if (value === undefined) {
    if (required) throw invalid(`Missing required param: ${param}.`, param, 'parameter_missing');
    return undefined;
  }
  const n = Number(text(value));
  if (!Number.isInteger(n) || n < min) throw invalid(`Invalid integer: ${String(value)}`, param);
  return n;
}

/** The string entries of a `metadata[…]` object; anything else gives {}. */
export function metadataOf(value: FormValue | undefined): Record<string, string> {
  if (!value || typeof value !== 'object' || Array.isArray(value)) return {};
  const out: Record<string, string> = {};
  for (const [key, v] of Object.entries(value)) if (typeof v === 'string') out[key] = v;
  return out;
}
