// The versions of a seller's listing, newest first: which is on sale, which waits for review,
// which was sent back and why, and the rights confirmation each carries.
import type { ListingVersionSummary } from '@/lib/market/types';
import { formatDate } from './format';

const REVIEW_WORDS: Record<ListingVersionSummary['review'], string> = {
  listing: 'reviewed with the listing',
  submitted: 'waiting for review',
  approved: 'approved',
  rejected: 'sent back',
};

export function ListingVersionHistory({ versions }: { versions: ListingVersionSummary[] }) {
  if (versions.length === 0) return null;
  return (
    <section className="flex flex-col gap-3" aria-label="Versions of this listing">
      <h2 className="text-xl font-bold">Versions</h2>
      <ul className="flex flex-col gap-2">
        {versions.map((version) => (
          <li key={version.id} data-testid="listing-version" data-review={version.review} className="rounded-2xl bg-white p-4 text-sm ring-2 ring-vellum">
            <p className="font-semibold">
              Version {version.number}: {version.groom.name}, saved version {version.groom.versionNumber ?? '—'} · {REVIEW_WORDS[version.review]}
              {version.onSale ? ' · on sale' : ''}
            </p>
            {version.review === 'rejected' && version.rejectionReason && <p className="text-hawthorn">Sent back: {version.rejectionReason}</p>}
            {version.notes && <p className="text-loam-soft">What changed: {version.notes}</p>}
            <p className="text-loam-soft">
              {version.shipsSurface ? 'Ships the growth surface' : 'Without the growth surface'} ·{' '}
              {version.rights ? `rights confirmed ${formatDate(version.rights.confirmedAt)}` : 'listed before the rights confirmation'}
            </p>
          </li>
        ))}
      </ul>
    </section>
  );
}
