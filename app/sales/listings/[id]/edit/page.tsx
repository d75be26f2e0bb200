import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { ListingForm } from '@/components/market/ListingForm';
import { StateBadge } from '@/components/market/StateBadge';
import { Notice } from '@/components/ui/Notice';
import { actorOf } from '@/lib/accounts/actor';
import { requireArea } from '@/lib/accounts/session';
import { HttpError } from '@/lib/http/errors';
import { listLicences } from '@/lib/market/licences';
import { getListingDetail } from '@/lib/market/listings';

export const metadata: Metadata = { title: 'Edit a listing' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function EditListingPage({ params }: { params: Promise<{ id: string }> }) {
  const session = await requireArea('sales');
  const { id } = await params;
  if (!session || !UUID.test(id)) notFound();
  let listing;
  try {
    listing = await getListingDetail(actorOf(session), id.toLowerCase());
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) notFound();
    throw error;
  }
  // Admins may see any listing; only its seller edits it.
  if (!listing.viewer.isSeller) notFound();
  const editable = ['draft', 'rejected', 'unlisted'].includes(listing.state);
  const licences = await listLicences();
  return (
    <div className="flex max-w-4xl flex-col gap-8">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/sales#listings" className="font-semibold text-tarn">
          ← Your listings
        </Link>
      </nav>
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">Edit “{listing.title}”</h1>
        <p className="flex items-center gap-2 text-loam-soft">
          <StateBadge state={listing.state} />
          {listing.state === 'rejected' && listing.rejectionReason && <span>Sent back: {listing.rejectionReason}</span>}
        </p>
      </div>
      {editable ? (
        <ListingForm licences={licences} listing={listing} />
      ) : (
        <Notice tone="info">
          A listing that is waiting for review or on the market cannot be changed. To improve one on the market, publish a{' '}
          <Link href={`/sales/listings/${listing.id}/versions/new`} className="font-semibold text-tarn">
            new version
          </Link>{' '}
          of it: it is reviewed like a listing, and its owners get it free. Once buyers have a listing, its price and licence stay as sold.
        </Notice>
      )}
    </div>
  );
}
