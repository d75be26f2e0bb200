'use client';
// A labelled choice of what a painted map drives, in words (the Tints panel's new map, the image control).
import type { MapAttribute } from '@/lib/groom/spec/spec';
import { MAP_ATTRIBUTE_WORDS } from '@/lib/studio/client/image-maps';

export function MapAttributeSelect({ label, value, options, onChange, className = '' }: { label: string; value: MapAttribute; options: readonly MapAttribute[]; onChange: (attribute: MapAttribute) => void; className?: string }) {
  return (
    <label className={`flex flex-col gap-1 text-xs font-semibold text-loam-soft ${className}`}>
      {label}
      <select value={value} onChange={(event) => onChange(event.target.value as MapAttribute)} className="rounded-lg border-2 border-loam/15 bg-vellum px-2 py-1 text-sm text-loam">
        {options.map((a) => (
          <option key={a} value={a}>
            {MAP_ATTRIBUTE_WORDS[a]}
          </option>
        ))}
      </select>
    </label>
  );
}
