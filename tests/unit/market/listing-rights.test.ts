// The seller's rights tick and the surface tick as the market's routes check them (the zod schemas
// of lib/market/validation.ts, which the route handlers and the forms share): a listing and a new
// version are refused without the rights tick, in words naming it, and the field file — which
// holds the whole growth surface — goes only with the surface tick.
import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { FIELD_NEEDS_SURFACE, RIGHTS_REFUSED } from '@/lib/market/rights';
import { listingDraftSchema, listingPatchSchema, listingVersionSchema } from '@/lib/market/validation';

const listing = {
  groomId: randomUUID(),
  versionId: randomUUID(),
  title: 'Loop plush nap',
  description: 'Short plush pile for a ring-shaped toy, one whorl and one saddle.',
  tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
  priceCents: 1500,
  currency: 'eur',
  licenceSlug: 'any-licence',
  formats: ['usda', 'json'],
};
const version = { groomId: randomUUID(), versionId: randomUUID(), description: listing.description, formats: ['usda'] };
const messages = (result: { error?: { issues: { message: string }[] } }) => result.error?.issues.map((issue) => issue.message) ?? [];

describe('the rights tick', () => {
  it('refuses a listing without it, or with anything but true, naming what is missing', () => {
    const refused = listingDraftSchema.safeParse(listing);
    expect(refused.error!.issues).toEqual([expect.objectContaining({ path: ['rightsConfirmed'], message: RIGHTS_REFUSED })]);
    expect(messages(listingDraftSchema.safeParse({ ...listing, rightsConfirmed: false }))).toEqual([RIGHTS_REFUSED]);
    expect(messages(listingDraftSchema.safeParse({ ...listing, rightsConfirmed: 'yes' }))).toEqual([RIGHTS_REFUSED]);
    expect(listingDraftSchema.parse({ ...listing, rightsConfirmed: true })).toMatchObject({ rightsConfirmed: true, shipsSurface: false });
  });

  it('refuses a new version without it too', () => {
    expect(messages(listingVersionSchema.safeParse(version))).toEqual([RIGHTS_REFUSED]);
    expect(listingVersionSchema.parse({ ...version, rightsConfirmed: true })).toMatchObject({ notes: '', shipsSurface: false });
  });

  it('asks for it again when a draft changes whether the package ships the surface', () => {
    expect(listingPatchSchema.safeParse({ title: 'Loop plush nap, retitled' }).success).toBe(true);
    expect(messages(listingPatchSchema.safeParse({ shipsSurface: true }))).toEqual([RIGHTS_REFUSED]);
    expect(listingPatchSchema.safeParse({ shipsSurface: true, rightsConfirmed: true }).success).toBe(true);
  });
});

describe('the surface tick', () => {
  it('lets the field file in only with the surface, since it holds the whole surface', () => {
    for (const schema of [listingDraftSchema, listingVersionSchema]) {
      const base = schema === listingDraftSchema ? listing : version;
      const field = schema.safeParse({ ...base, formats: ['usda', 'ply'], rightsConfirmed: true });
      expect(field.error!.issues).toEqual([expect.objectContaining({ path: ['formats'], message: FIELD_NEEDS_SURFACE })]);
      expect(schema.safeParse({ ...base, formats: ['usda', 'ply'], rightsConfirmed: true, shipsSurface: true }).success).toBe(true);
    }
  });
});
