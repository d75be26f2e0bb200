'use client';
// The files a package holds, as check boxes (in the export table's order), for the listing form
// and the new-version form alike; the choice travels in a hidden `formats` field the forms' schemas read.
import { FORMAT_LABELS, PACKAGE_FORMATS, type PackageFormat } from '@/lib/market/vocabulary';

export function FormatChecks({ formats, onChange, error }: { formats: PackageFormat[]; onChange: (next: PackageFormat[]) => void; error?: string }) {
  return (
    <>
      <input type="hidden" name="formats" value={formats.join(',')} />
      <div className="grid gap-2 sm:grid-cols-2">
        {PACKAGE_FORMATS.map((format) => (
          <label key={format} className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              checked={formats.includes(format)}
              onChange={(event) =>
                onChange(event.target.checked ? PACKAGE_FORMATS.filter((f) => f === format || formats.includes(f)) : formats.filter((f) => f !== format))
              }
              className="accent-bracken"
            />
            {FORMAT_LABELS[format]}
          </label>
        ))}
      </div>
      {error && (
        <p id="formats-error" className="text-sm font-medium text-hawthorn" data-field-error="formats">
          {error}
        </p>
      )}
    </>
  );
}
