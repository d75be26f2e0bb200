'use client';
// The two selects a seller picks what a listing (or its new version) sells with: one of their
// grooms that has kept versions, then one of its saved versions, newest first. Both are plain form
// fields named groomId and versionId, so the surrounding form reads them like any other.
import type { SelectHTMLAttributes } from 'react';
import useSWR from 'swr';
import { controlBorder, describedBy, FieldFrame } from '@/components/ui/FieldFrame';
import { fetchData, type ApiRequestError } from '@/lib/http/client';
import type { GroomSummary, Version, VersionListResponse } from '@/lib/studio/types';

/** A labelled select with the form's error under it (the same frame as the text fields). */
export function SelectField({
  name,
  label,
  error,
  children,
  ...select
}: { name: string; label: string; error?: string } & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = `field-${name}`;
  return (
    <FieldFrame id={id} name={name} label={label} error={error}>
      <select
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, undefined, error)}
        className={`rounded-xl border-2 bg-white px-3 py-2.5 text-base text-loam ${controlBorder(error)}`}
        {...select}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

export function GroomVersionSelects({
  grooms,
  groomId,
  onGroomChange,
  errors,
  clearError,
  defaultVersionId = '',
  versionNote,
}: {
  /** The grooms that may be chosen. */
  grooms: GroomSummary[];
  groomId: string;
  onGroomChange: (groomId: string) => void;
  errors: { groomId?: string; versionId?: string };
  /** The form's own: a choice clears the error shown under it (a new groom, the version's too). */
  clearError: (name: 'groomId' | 'versionId') => void;
  /** The version chosen at first, when the groom shown is the one it belongs to. */
  defaultVersionId?: string;
  /** Words after a version's name (e.g. that it is the one on sale now). */
  versionNote?: (version: Version) => string;
}) {
  const versions = useSWR<VersionListResponse, ApiRequestError>(groomId ? `/api/studio/grooms/${groomId}/versions` : null, fetchData);
  return (
    <>
      <SelectField name="groomId" label="Groom" error={errors.groomId} value={groomId} onChange={(event) => {
          onGroomChange(event.target.value);
          clearError('groomId');
          clearError('versionId');
        }}
      >
        <option value="">Choose a groom…</option>
        {grooms.map((groom) => (
          <option key={groom.id} value={groom.id}>
            {groom.name} ({groom.surfaceName})
          </option>
        ))}
      </SelectField>
      <SelectField
        key={`${groomId}:${versions.data ? 'ready' : 'loading'}`}
        name="versionId"
        label="Saved version"
        error={errors.versionId}
        defaultValue={defaultVersionId}
        onChange={() => clearError('versionId')}
        disabled={!groomId || !versions.data}
      >
        {!groomId ? (
          <option value="">Choose a groom first</option>
        ) : !versions.data ? (
          <option value="">{versions.error ? versions.error.message : 'Loading its versions…'}</option>
        ) : (
          [...versions.data.versions]
            .sort((a, b) => b.number - a.number)
            .map((version) => (
              <option key={version.id} value={version.id}>
                Version {version.number}: {version.name}
                {versionNote?.(version)}
              </option>
            ))
        )}
      </SelectField>
    </>
  );
}
