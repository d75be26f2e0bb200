import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { ListingVersionForm } from '@/components/market/ListingVersionForm';
import { ListingVersionHistory } from '@/components/market/ListingVersionHistory';
import { Notice } from '@/components/ui/Notice';
import { actorOf } from '@/lib/accounts/actor';
import { requireArea } from '@/lib/accounts/session';
import { HttpError } from '@/lib/http/errors';
import { getListingDetail, listListingVersions } from '@/lib/market/listings';

export const metadata: Metadata = { title: 'Publish a new version' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function NewListingVersionPage({ params }: { params: Promise<{ id: string }> }) {
  const session = await requireArea('sales');
  const { id } = await params;
  if (!session || !UUID.test(id)) notFound();
  const actor = actorOf(session);
  let listing;
  try {
    listing = await getListingDetail(actor, id.toLowerCase());
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) notFound();
    throw error;
  }
  if (!listing.viewer.isSeller) notFound();
  const versions = await listListingVersions(actor, listing.id);
  const waiting = versions.find((version) => version.review === 'submitted');
  return (
    <div className="flex max-w-4xl flex-col gap-8">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/sales#listings" className="font-semibold text-tarn">
          ← Your listings
        </Link>
      </nav>
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">A new version of “{listing.title}”</h1>
        <p className="text-lg text-loam-soft">
          Version {listing.currentVersion} is on sale. Its owners keep it, and get the new one free once the admins approve it.
        </p>
      </div>
      {listing.state !== 'published' ? (
        <Notice tone="info">Only a listing on the market takes new versions. Edit this one instead, then submit it for review.</Notice>
      ) : waiting ? (
        <Notice tone="info">Version {waiting.number} is waiting for the admins’ review. Once they decide, you can publish another.</Notice>
      ) : (
        <ListingVersionForm listing={listing} />
      )}
      <ListingVersionHistory versions={versions} />
    </div>
  );
}
