// The seller's grooms that the listing form cannot offer, named with the reason and the way to
// list them: a preset is made from a kept version, and these have none yet.
import Link from 'next/link';

export function UnversionedGrooms({ grooms }: { grooms: readonly { id: string; name: string }[] }) {
  if (grooms.length === 0) return null;
  return (
    <div className="rounded-2xl bg-vellum/60 p-4 text-sm text-loam-soft" data-testid="unversioned-grooms">
      <p>
        Not in this list: {grooms.length === 1 ? 'this groom has' : 'these grooms have'} no kept version yet. Open {grooms.length === 1 ? 'it' : 'one'} in the
        studio, and under <strong>Versions</strong> choose <strong>Keep version</strong>; then it can be listed.
      </p>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 pt-2">
        {grooms.map((groom) => (
          <li key={groom.id}>
            <Link href={`/studio/grooms/${groom.id}`} className="font-semibold text-tarn">
              {groom.name}
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}
