'use client';
// A one-field form for naming something (a new groom, a renamed one), with the studio's own
// schema giving the field-level message, and the server's message in the same place.
import { useState, type FormEvent } from 'react';
import type { z } from 'zod';

export function NameForm({
  label,
  initial = '',
  submitLabel,
  schema,
  onSubmit,
  onCancel,
  id,
}: {
  label: string;
  initial?: string;
  submitLabel: string;
  schema: z.ZodType<{ name: string }>;
  onSubmit: (name: string) => Promise<string | null>;
  onCancel: () => void;
  id: string;
}) {
  const [name, setName] = useState(initial);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = schema.safeParse({ name });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? 'Check the name.');
    setBusy(true);
    const refused = await onSubmit(parsed.data.name);
    setBusy(false);
    setError(refused);
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-loam">
        {label}
      </label>
      <div className="flex flex-wrap gap-2">
        <input
          id={id}
          name="name"
          value={name}
          autoFocus
          maxLength={220}
          onChange={(event) => setName(event.target.value)}
          onKeyDown={(event) => event.key === 'Escape' && onCancel()}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
          className={`min-w-0 flex-1 rounded-xl border-2 bg-white px-3 py-1.5 text-sm text-loam ${error ? 'border-hawthorn' : 'border-vellum focus:border-tarn'}`}
        />
        <button type="submit" disabled={busy} className="rounded-full bg-bracken px-4 py-1.5 text-sm font-semibold text-chalk hover:bg-bracken-deep disabled:opacity-50">
          {busy ? 'Working…' : submitLabel}
        </button>
        <button type="button" onClick={onCancel} className="rounded-full px-3 py-1.5 text-sm font-semibold text-tarn hover:underline">
          Cancel
        </button>
      </div>
      {error && (
        <p id={`${id}-error`} className="text-sm font-medium text-hawthorn" data-field-error="name">
          {error}
        </p>
      )}
    </form>
  );
}
