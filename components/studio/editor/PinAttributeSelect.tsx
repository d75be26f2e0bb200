// The guide setting a pin scales, chosen from lib/groom's pin attributes.
import { PIN_ATTRIBUTES, type PinAttribute } from '@/lib/groom/spec/spec';

export function PinAttributeSelect({ value, onChange }: { value: PinAttribute; onChange: (attribute: PinAttribute) => void }) {
  return (
    <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
      Attribute
      <select value={value} onChange={(event) => onChange(event.target.value as PinAttribute)} className="rounded-lg border-2 border-vellum bg-white px-2 py-1 text-sm text-loam">
        {PIN_ATTRIBUTES.map((a) => (
          <option key={a} value={a}>
            {a}
          </option>
        ))}
      </select>
    </label>
  );
}
