'use client';
// "List it": a saved groom version becomes a preset — title, description, tags, price with its
// currency, one of the market's licences (shown in full), the files the package holds — saved as
// a draft or sent straight to the admins for review. The same form edits a draft, or a listing
// that was sent back or taken off the market.
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR from 'swr';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { fetchData, postJson, request, type ApiRequestError } from '@/lib/http/client';
import type { FieldErrors } from '@/lib/http/field-errors';
import type { CreateListingResponse, Licence, ListingDetail, UpdateListingResponse } from '@/lib/market/types';
import { listingDraftSchema, tagsSchema } from '@/lib/market/validation';
import { CURRENCIES, MAX_PRICE_CENTS, MIN_PRICE_CENTS, TAX_NOTE, type PackageFormat } from '@/lib/market/vocabulary';
import { UnversionedGrooms } from './UnversionedGrooms';
import type { GroomListResponse } from '@/lib/studio/types';
import { centsToText, TAG_KEYS, TAG_LABELS, TAG_VALUES, tagLabel } from './search-params';
import { TextAreaField, textAreaField } from './TextAreaField';
import { RightsFields, rightsFormFields } from './RightsFields';
import { FormatChecks } from './FormatChecks';
import { GroomVersionSelects, SelectField } from './GroomVersionSelects';

const draft = listingDraftSchema.shape;

// The form's fields are flat text; the rules are the route's own (lib/market/validation.ts).
const listingFormSchema = z.object({
  groomId: draft.groomId,
  versionId: draft.versionId,
  title: draft.title,
  description: draft.description,
  animal: tagsSchema.shape.animal,
  coatLength: tagsSchema.shape.coatLength,
  style: tagsSchema.shape.style,
  bodyRegion: tagsSchema.shape.bodyRegion,
  price: z
    .string()
    .trim()
    .regex(/^\d{1,6}([.,]\d{1,2})?$/, 'Enter the price such as 24 or 24.50.')
    .transform((value) => Math.round(Number(value.replace(',', '.')) * 100))
    .pipe(draft.priceCents),
  currency: draft.currency,
  licenceSlug: draft.licenceSlug,
  formats: z
    .string()
    .transform((value) => value.split(',').filter(Boolean))
    .pipe(draft.formats),
  ...rightsFormFields,
});
type ListingFormValues = z.output<typeof listingFormSchema>;

/** The server names nested and renamed fields differently from the form. */
function formFields(fields: FieldErrors | undefined): FieldErrors | undefined {
  if (!fields) return undefined;
  const { tags, priceCents, ...rest } = fields;
  return { ...rest, ...(tags && { animal: tags }), ...(priceCents && { price: priceCents }) };
}

export type ListingFormProps = {
  licences: Licence[];
  /** Editing: the listing as it is. Creating: null. */
  listing: ListingDetail | null;
  /** A groom and version to start from (from a link in the studio). */
  preselect?: { groomId?: string; versionId?: string };
  /** The market's fee on each sale, in per cent (lib/market/fees.ts), shown beside the price. */
  feePercent?: number;
};

export function ListingForm({ licences, listing, preselect, feePercent }: ListingFormProps) {
  const router = useRouter();
  const form = useValidatedForm(listingFormSchema);
  const [groomId, setGroomId] = useState(listing?.groom.id ?? preselect?.groomId ?? '');
  const [formats, setFormats] = useState<PackageFormat[]>(listing?.formats ?? ['usda', 'glb', 'json']);
  const [licenceSlug, setLicenceSlug] = useState(listing?.licence.slug ?? licences[0]?.slug ?? '');
  const [submitAfterSave, setSubmitAfterSave] = useState(true);
  const editing = listing !== null;

  const grooms = useSWR<GroomListResponse, ApiRequestError>(editing ? null : '/api/studio/grooms', fetchData);
  // A groom fitted from a bought preset is used under the seller's licence and is never sold again.
  const fitted = grooms.data?.grooms.filter((groom) => groom.fromPurchaseId !== null) ?? [];
  const listable = grooms.data?.grooms.filter((groom) => groom.versionCount > 0 && groom.fromPurchaseId === null) ?? [];
  // Grooms with no kept version cannot be listed; they are named, with the way to list them.
  const unversioned = grooms.data?.grooms.filter((groom) => groom.versionCount === 0 && groom.fromPurchaseId === null) ?? [];
  const chosenLicence = licences.find((licence) => licence.slug === licenceSlug);

  async function save(input: ListingFormValues) {
    const fields = {
      title: input.title,
      description: input.description,
      tags: { animal: input.animal, coatLength: input.coatLength, style: input.style, bodyRegion: input.bodyRegion },
      priceCents: input.price,
      currency: input.currency,
      licenceSlug: input.licenceSlug,
      formats: input.formats,
      rightsConfirmed: input.rightsConfirmed,
      shipsSurface: input.shipsSurface,
    };
    const saved = editing
      ? await request<UpdateListingResponse>('PATCH', `/api/market/listings/${listing.id}`, fields)
      : await postJson<CreateListingResponse>('/api/market/listings', { groomId: input.groomId, versionId: input.versionId, ...fields });
    if (!saved.ok) return { message: saved.error.message, fields: formFields(saved.error.fields) };
    if (submitAfterSave) {
      const submitted = await postJson<CreateListingResponse>(`/api/market/listings/${saved.data.listing.id}/submit`, {});
      if (!submitted.ok) return { message: `The listing is saved as a draft, but could not be sent for review: ${submitted.error.message}` };
    }
    router.push(`/sales?listed=${saved.data.listing.id}#listings`);
    router.refresh();
  }

  if (!editing && grooms.error) return <Notice tone="error">{grooms.error.message}</Notice>;
  if (!editing && !grooms.data) return <p className="text-loam-soft">Loading your grooms…</p>;
  if (!editing && listable.length === 0) {
    return (
      <div className="flex flex-col gap-3">
        <Notice tone="info">
          A preset is made from a kept version of a groom. Keep a version in the{' '}
          <Link href="/studio" className="font-semibold">
            studio
          </Link>{' '}
          first, then come back to list it.
        </Notice>
        <UnversionedGrooms grooms={unversioned} />
      </div>
    );
  }

  return (
    <form noValidate className="flex flex-col gap-8" onSubmit={form.onSubmit(save)} aria-label={editing ? 'Edit the listing' : 'List a preset'}>
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      {!editing && fitted.length > 0 && (
        <p className="text-sm text-loam-soft">
          Not in the list: {fitted.map((groom) => groom.name).join(', ')} — fitted from presets you bought, which their licences let you use but not sell.
        </p>
      )}

      <fieldset className="flex flex-col gap-4">
        <legend className="pb-2 text-lg font-bold">What you are selling</legend>
        {editing ? (
          <>
            <input type="hidden" name="groomId" value={listing.groom.id} />
            <input type="hidden" name="versionId" value={listing.groom.versionId} />
            <p className="text-loam-soft">
              {listing.groom.name}, version {listing.groom.versionNumber ?? '—'}
              {listing.groom.versionName ? ` “${listing.groom.versionName}”` : ''} — the version stays as it was listed.
            </p>
          </>
        ) : (
          <div className="grid gap-4 sm:grid-cols-2">
            <GroomVersionSelects
              grooms={listable}
              groomId={groomId}
              onGroomChange={setGroomId}
              errors={form.errors}
              clearError={form.clearError}
              defaultVersionId={preselect?.groomId === groomId ? preselect?.versionId : undefined}
            />
            <div className="sm:col-span-2">
              <UnversionedGrooms grooms={unversioned} />
            </div>
          </div>
        )}
      </fieldset>

      <fieldset className="flex flex-col gap-4">
        <legend className="pb-2 text-lg font-bold">How buyers find it</legend>
        <TextField label="Title" defaultValue={listing?.title ?? ''} placeholder="Autumn fox head, crown whorl" {...form.field('title')} />
        <TextAreaField
          label="Description"
          rows={6}
          hint="The coat, the flow features it has, what characters it suits, what is in the files."
          defaultValue={listing?.description ?? ''}
          {...textAreaField(form.field('description'))}
        />
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {TAG_KEYS.map((key) => (
            <SelectField
              key={key}
              name={key}
              label={TAG_LABELS[key]}
              error={form.errors[key]}
              defaultValue={listing?.tags[key] ?? ''}
              onChange={() => form.clearError(key)}
            >
              <option value="">Choose…</option>
              {TAG_VALUES[key].map((value) => (
                <option key={value} value={value}>
                  {tagLabel(value)}
                </option>
              ))}
            </SelectField>
          ))}
        </div>
      </fieldset>

      <fieldset className="flex flex-col gap-4">
        <legend className="pb-2 text-lg font-bold">Price</legend>
        <div className="grid max-w-md grid-cols-[1fr_auto] items-start gap-3">
          <TextField
            label="Price"
            inputMode="decimal"
            hint={`From ${centsToText(MIN_PRICE_CENTS)} to ${(MAX_PRICE_CENTS / 100).toLocaleString('en-GB')}.`}
            defaultValue={listing ? centsToText(listing.priceCents) : ''}
            {...form.field('price')}
          />
          <SelectField name="currency" label="Currency" error={form.errors.currency} defaultValue={listing?.currency ?? 'eur'}>
            {CURRENCIES.map((currency) => (
              <option key={currency} value={currency}>
                {currency.toUpperCase()}
              </option>
            ))}
          </SelectField>
        </div>
        <p className="max-w-2xl text-sm text-loam-soft" data-testid="market-fee">
          Buyers pay this amount in this currency.{' '}
          {feePercent === undefined ? 'The market keeps a fee on each sale.' : `The market keeps ${feePercent} % of each sale as its fee; the rest is yours.`}{' '}
          {TAX_NOTE}
        </p>
      </fieldset>

      <fieldset className="flex flex-col gap-3" aria-describedby={form.errors.licenceSlug ? 'licence-error' : undefined}>
        <legend className="pb-2 text-lg font-bold">Licence</legend>
        <div className="grid gap-2 sm:grid-cols-3">
          {licences.map((licence) => (
            <label
              key={licence.slug}
              className="flex cursor-pointer flex-col gap-1 rounded-2xl border-2 border-vellum bg-white p-3 has-[:checked]:border-bracken"
            >
              <span className="flex items-center gap-2 font-semibold">
                <input
                  type="radio"
                  name="licenceSlug"
                  value={licence.slug}
                  checked={licenceSlug === licence.slug}
                  onChange={() => {
                    setLicenceSlug(licence.slug);
                    form.clearError('licenceSlug');
                  }}
                  className="accent-bracken"
                />
                {licence.title}
              </span>
              <span className="text-sm text-loam-soft">{licence.summary}</span>
            </label>
          ))}
        </div>
        {form.errors.licenceSlug && (
          <p id="licence-error" className="text-sm font-medium text-hawthorn" data-field-error="licenceSlug">
            {form.errors.licenceSlug}
          </p>
        )}
        {chosenLicence && (
          <div
            className="max-h-80 overflow-y-auto rounded-2xl bg-white p-5 text-sm leading-relaxed whitespace-pre-wrap ring-2 ring-vellum"
            data-testid="licence-text"
            aria-label={`${chosenLicence.title} in full`}
            tabIndex={0}
          >
            {chosenLicence.body}
          </div>
        )}
      </fieldset>

      <fieldset className="flex flex-col gap-3" aria-describedby={form.errors.formats ? 'formats-error' : undefined}>
        <legend className="pb-2 text-lg font-bold">Files in the package</legend>
        <FormatChecks
          formats={formats}
          error={form.errors.formats}
          onChange={(next) => {
            form.clearError('formats');
            setFormats(next);
          }}
        />
        <p className="text-sm text-loam-soft">Every package also holds the licence text and a README.</p>
      </fieldset>

      <RightsFields defaultShipsSurface={listing?.shipsSurface ?? false} error={form.errors.rightsConfirmed} />

      <div className="flex flex-col gap-3 border-t-2 border-vellum pt-6">
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={submitAfterSave} onChange={(event) => setSubmitAfterSave(event.target.checked)} className="accent-bracken" />
          Send it to the market’s admins for review now (they check every preset before it goes on sale)
        </label>
        <div>
          <Button type="submit" disabled={!form.ready || form.busy}>
            {form.busy ? 'Saving…' : submitAfterSave ? 'Save and submit for review' : 'Save as draft'}
          </Button>
        </div>
      </div>
    </form>
  );
}
