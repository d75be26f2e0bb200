'use client';
// "Publish a new version": the seller of a listing on the market offers its owners a better
// version — a newer saved version of a groom, a new description, other files, what changed — with
// the rights tick again. It waits for the admins while the version on sale stays on sale; once
// approved, every owner gets it free.
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR from 'swr';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { fetchData, postJson, type ApiRequestError } from '@/lib/http/client';
import type { ListingDetail, ListingVersionResponse } from '@/lib/market/types';
import { listingVersionSchema } from '@/lib/market/validation';
import type { PackageFormat } from '@/lib/market/vocabulary';
import type { GroomListResponse } from '@/lib/studio/types';
import { FormatChecks } from './FormatChecks';
import { GroomVersionSelects } from './GroomVersionSelects';
import { RightsFields, rightsFormFields } from './RightsFields';
import { TextAreaField, textAreaField } from './TextAreaField';

const shape = listingVersionSchema.shape;
const versionFormSchema = z.object({
  groomId: shape.groomId,
  versionId: shape.versionId,
  description: shape.description,
  notes: z.string().trim().max(2000, 'Keep the notes under 2000 characters.'),
  formats: z
    .string()
    .transform((value) => value.split(',').filter(Boolean))
    .pipe(shape.formats),
  ...rightsFormFields,
});
type VersionFormValues = z.output<typeof versionFormSchema>;


export function ListingVersionForm({ listing }: { listing: ListingDetail }) {
  const router = useRouter();
  const form = useValidatedForm(versionFormSchema);
  const [groomId, setGroomId] = useState(listing.groom.id);
  const [formats, setFormats] = useState<PackageFormat[]>(listing.formats);
  const grooms = useSWR<GroomListResponse, ApiRequestError>('/api/studio/grooms', fetchData);
  // A groom fitted from a bought preset is never sold again (the route refuses it too).
  const listable = grooms.data?.grooms.filter((groom) => groom.versionCount > 0 && groom.fromPurchaseId === null) ?? [];

  async function publish(input: VersionFormValues) {
    const sent = await postJson<ListingVersionResponse>(`/api/market/listings/${listing.id}/versions`, input);
    if (!sent.ok) return { message: sent.error.message, fields: sent.error.fields };
    router.push(`/sales?updated=${listing.id}#listings`);
    router.refresh();
  }

  if (grooms.error) return <Notice tone="error">{grooms.error.message}</Notice>;
  if (!grooms.data) return <p className="text-loam-soft">Loading your grooms…</p>;
  return (
    <form noValidate className="flex flex-col gap-8" onSubmit={form.onSubmit(publish)} aria-label="Publish a new version">
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="pb-2 text-lg font-bold">What the new version sells</legend>
        <GroomVersionSelects
          grooms={listable}
          groomId={groomId}
          onGroomChange={setGroomId}
          errors={form.errors}
          clearError={form.clearError}
          versionNote={(version) => (version.id === listing.groom.versionId ? ' (on sale now)' : '')}
        />
      </fieldset>

      <fieldset className="flex flex-col gap-4">
        <legend className="pb-2 text-lg font-bold">What buyers and owners read</legend>
        <TextAreaField label="Description" rows={6} defaultValue={listing.description} {...textAreaField(form.field('description'))} />
        <TextAreaField
          label="What changed"
          rows={3}
          hint="Sent to every owner with the new version."
          placeholder="Denser crown, a longer tail."
          {...textAreaField(form.field('notes'))}
        />
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="pb-2 text-lg font-bold">Files in the package</legend>
        <FormatChecks
          formats={formats}
          error={form.errors.formats}
          onChange={(next) => {
            form.clearError('formats');
            setFormats(next);
          }}
        />
      </fieldset>

      <RightsFields defaultShipsSurface={listing.shipsSurface} error={form.errors.rightsConfirmed} />

      <div className="flex flex-col gap-3 border-t-2 border-vellum pt-6">
        <p className="text-sm text-loam-soft">
          The market’s admins review the new version first. Until they approve it, version {listing.currentVersion} stays on sale as it is.
          Once approved, buyers get the new version, and every owner gets it free in their library with a notice and an e-mail.
        </p>
        <div>
          <Button type="submit" disabled={!form.ready || form.busy}>
            {form.busy ? 'Sending…' : 'Send the new version for review'}
          </Button>
        </div>
      </div>
    </form>
  );
}
