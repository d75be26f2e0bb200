'use client';
// A buyer's rating (1–5) and words on a preset they own: written once, edited afterwards.
// The current review is read from the listing (its reviews mark the caller's own).
import { useId, useState } from 'react';
import useSWR from 'swr';
import { z } from 'zod';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { fetchData, request, type ApiRequestError } from '@/lib/http/client';
import { reviewSchema } from '@/lib/market/validation';
import { TextAreaField, textAreaField } from './TextAreaField';
import type { ListingResponse, ReviewResponse } from '@/lib/market/types';

// The form's values are text; the rules are the route's own.
const reviewFormSchema = z.object({
  rating: z.preprocess((value) => (value === undefined || value === '' ? undefined : Number(value)), reviewSchema.shape.rating),
  body: reviewSchema.shape.body,
});

const RATING_WORDS = ['', 'Poor', 'Fair', 'Good', 'Very good', 'Excellent'];

export function ReviewForm({ listingId, title }: { listingId: string; title: string }) {
  const { data, error, isLoading, mutate } = useSWR<ListingResponse, ApiRequestError>(`/api/market/listings/${listingId}`, fetchData);
  const form = useValidatedForm(reviewFormSchema);
  const [saved, setSaved] = useState(false);
  const id = useId();

  if (error) return <Notice tone="error">{error.message}</Notice>;
  if (isLoading || !data) return <p className="text-sm text-loam-soft">Loading your review…</p>;
  const mine = data.listing.reviews.find((review) => review.mine) ?? null;

  return (
    <form
      noValidate
      aria-label={`Your review of ${title}`}
      className="flex flex-col gap-3"
      onSubmit={form.onSubmit(async (input) => {
        setSaved(false);
        const outcome = await request<ReviewResponse>('PUT', `/api/market/listings/${listingId}/review`, input);
        if (!outcome.ok) return outcome.error;
        setSaved(true);
        await mutate();
      })}
    >
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      {saved && <Notice tone="success">Your review is saved and shown on the preset’s page.</Notice>}
      <fieldset className="flex flex-col gap-1.5" aria-describedby={form.errors.rating ? `${id}-rating-error` : undefined}>
        <legend className="pb-1 text-sm font-semibold text-loam">Your rating</legend>
        <div className="flex flex-wrap gap-1.5">
          {[1, 2, 3, 4, 5].map((rating) => (
            <label
              key={rating}
              className="flex cursor-pointer items-center gap-1.5 rounded-full border-2 border-vellum bg-white px-3 py-1 text-sm has-[:checked]:border-bracken has-[:checked]:bg-pollen/30"
            >
              <input
                type="radio"
                name="rating"
                value={rating}
                defaultChecked={mine?.rating === rating}
                onChange={() => form.clearError('rating')}
                className="accent-bracken"
              />
              <span aria-hidden="true" className="text-bracken">
                {'★'.repeat(rating)}
              </span>
              <span className="sr-only">{rating} out of 5, </span>
              {RATING_WORDS[rating]}
            </label>
          ))}
        </div>
        {form.errors.rating && (
          <p id={`${id}-rating-error`} className="text-sm font-medium text-hawthorn" data-field-error="rating">
            {form.errors.rating}
          </p>
        )}
      </fieldset>
      <TextAreaField
        id={`${id}-body`}
        label="What you thought"
        hint="How the flow worked on your characters, what you changed. Optional."
        defaultValue={mine?.body ?? ''}
        {...textAreaField(form.field('body'))}
      />
      <p className="text-sm text-loam-soft" data-testid="review-public-name">
        Reviews are public: your display name{mine ? ` (“${mine.buyer.displayName}”)` : ''} is shown with your rating and words on the preset’s page,
        for anyone to see.
      </p>
      <div>
        <Button type="submit" disabled={!form.ready || form.busy}>
          {form.busy ? 'Saving…' : mine ? 'Save my changes' : 'Publish my review'}
        </Button>
      </div>
    </form>
  );
}
