'use client';
// Updates of listings on the market, waiting for an admin: the new version's picture, what
// changed and the seller's rights confirmation; approve it (owners get it free, with a notice and
// an e-mail) or send it back with a reason. The version on sale stays on sale meanwhile.
import type { AdminListingVersionsResponse } from '@/lib/market/types';
import { formatDateTime } from '@/components/market/format';
import { DecisionItem, DecisionQueue } from './DecisionParts';

export function VersionQueue({ initial }: { initial: AdminListingVersionsResponse }) {
  return (
    <DecisionQueue
      url="/api/admin/listing-versions"
      initial={initial}
      items={(response) => response.versions}
      empty="No new version is waiting for review."
      item={(version, decided) => {
        const name = `version ${version.number} of “${version.listingTitle}”`;
        return (
          <DecisionItem
            testId="version-queue-item"
            data={{ 'data-version-id': version.id }}
            pictureUrl={version.pictureUrl}
            href={`/market/${version.listingId}`}
            title={`${version.listingTitle}: version ${version.number}`}
            name={name}
            assets={version.assets}
            approveLabel={`Approve version ${version.number}`}
            decisionUrl={`/api/admin/listing-versions/${version.id}/decision`}
            notes={{ approved: `${name} is on the market; its owners and the seller have been told.`, rejected: `${name} went back to its seller with your reason.` }}
            rejectHint="The seller reads this in an e-mail."
            decided={decided}
          >
            <p className="text-sm text-loam-soft">
              {version.seller.displayName} ({version.seller.email}) · {version.groom.name}, saved version {version.groom.versionNumber ?? '—'}
              {version.submittedAt && ` · submitted ${formatDateTime(version.submittedAt)}`}
            </p>
            {version.notes && <p className="text-sm">What changed: {version.notes}</p>}
            <p className="text-sm">
              {version.rights ? `Rights confirmed ${formatDateTime(version.rights.confirmedAt)} (${version.rights.wordingVersion}).` : 'No rights confirmation.'}{' '}
              {version.shipsSurface ? 'The package ships the growth surface.' : 'The package does not ship the growth surface.'}
            </p>
          </DecisionItem>
        );
      }}
    />
  );
}
