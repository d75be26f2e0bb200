// A listing's state in words, the same everywhere (seller's list, admin's queue, listing page).
import type { ListingState } from '@/lib/market/vocabulary';

const STATES: Record<ListingState, { label: string; className: string }> = {
  draft: { label: 'Draft', className: 'bg-vellum text-loam' },
  submitted: { label: 'Waiting for review', className: 'bg-pollen/60 text-tarn-deep' },
  published: { label: 'On the market', className: 'bg-lichen text-tarn-deep' },
  rejected: { label: 'Sent back', className: 'bg-hawthorn-pale text-hawthorn' },
  unlisted: { label: 'Taken off the market', className: 'bg-vellum text-loam-soft' },
};

export function StateBadge({ state }: { state: ListingState }) {
  const { label, className } = STATES[state];
  return (
    <span data-testid="listing-state" data-state={state} className={`inline-block rounded-full px-2.5 py-0.5 text-xs font-bold ${className}`}>
      {label}
    </span>
  );
}
