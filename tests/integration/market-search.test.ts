// The market's search through its route handler: text, filters, sorts, pages and bad input.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import type { ListingCard, SearchResponse } from '@/lib/market/types';
import { GET as searchGet } from '@/app/api/market/search/route';
import { insertListing, makePerson } from './market-helpers';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

// A word only this file's listings carry, so other tests' listings never show up.
const token = `zq${randomUUID().slice(0, 8).replace(/[^a-z0-9]/g, 'x')}`;

async function search(query: Record<string, string | number>): Promise<{ status: number; body: { data?: SearchResponse; error?: { code: string; fields?: Record<string, string> } } }> {
  const params = new URLSearchParams(Object.entries(query).map(([key, value]) => [key, String(value)]));
  const response = await searchGet(new Request(`http://127.0.0.1/api/market/search?${params}`));
  return { status: response.status, body: await response.json() };
}

async function results(query: Record<string, string | number>): Promise<SearchResponse> {
  const { status, body } = await search({ q: token, ...query });
  expect(status, JSON.stringify(body)).toBe(200);
  return body.data!;
}

const titles = (cards: ListingCard[]) => cards.map((card) => card.title);

beforeAll(async () => {
  const seller = await makePerson('search-seller', ['groomer']);
  const day = (n: number) => new Date(Date.UTC(2026, 0, 1 + n));
  const make = (title: string, options: Parameters<typeof insertListing>[1]) => insertListing(seller, { title: `${title} ${token}`, ...options });
  await make('Russet fox crown', { animal: 'fox', coatLength: 'medium', style: 'stylised', bodyRegion: 'head', priceCents: 2400, guideCount: 1500, guidesPerCm2: 3, typicalLengthCm: 2.5, publishedAt: day(1), salesCount: 9, ratingAverage: 4.5, ratingCount: 4, formats: ['usda', 'glb'] });
  await make('Silver fox winter pelt', { animal: 'fox', coatLength: 'long', style: 'natural', bodyRegion: 'full-body', priceCents: 5900, guideCount: 12000, guidesPerCm2: 1.2, typicalLengthCm: 6, publishedAt: day(2), salesCount: 2, ratingAverage: 3, ratingCount: 1, formats: ['usda', 'obj', 'json'] });
  await make('Tabby cat short coat', { animal: 'cat', coatLength: 'short', style: 'natural', bodyRegion: 'full-body', priceCents: 1500, guideCount: 4000, guidesPerCm2: 4.5, typicalLengthCm: 1.2, publishedAt: day(3), salesCount: 30, ratingAverage: 4.9, ratingCount: 12, formats: ['obj'] });
  await make('Plush ring nap', { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body', priceCents: 900, guideCount: 800, guidesPerCm2: 6, typicalLengthCm: 0.8, publishedAt: day(4), salesCount: 0, formats: ['glb', 'json'] });
  await make('Wolf ruff', { animal: 'wolf', coatLength: 'long', style: 'wild', bodyRegion: 'torso', priceCents: 3200, guideCount: 6000, guidesPerCm2: 2, typicalLengthCm: 5, publishedAt: day(5), salesCount: 5, ratingAverage: 4.1, ratingCount: 7 });
  // Not published: never found.
  await make('Draft fox secret', { animal: 'fox', state: 'draft' });
  await make('Submitted fox secret', { animal: 'fox', state: 'submitted' });
  await make('Unlisted fox secret', { animal: 'fox', state: 'unlisted' });
  // Enough for pages.
  for (let i = 0; i < 25; i++) await make(`Bulk badger ${i}`, { animal: 'creature', style: 'groomed', priceCents: 1000 + i, publishedAt: day(10 + i), guideCount: 100 + i });
});

describe('GET /api/market/search', () => {
  it('finds published listings by words of the title, tags and description, best match first', async () => {
    const found = await results({ q: `${token} fox` });
    expect(titles(found.results).sort()).toEqual([`Russet fox crown ${token}`, `Silver fox winter pelt ${token}`]);
    expect(found.total).toBe(2);
    // Stemming: "pelts" finds "pelt".
    expect(titles((await results({ q: `${token} pelts` })).results)).toEqual([`Silver fox winter pelt ${token}`]);
  });

  it('filters by tags, price range, formats, density and length', async () => {
    expect(titles((await results({ animal: 'cat' })).results)).toEqual([`Tabby cat short coat ${token}`]);
    expect(titles((await results({ coatLength: 'long', sort: 'price-asc' })).results)).toEqual([`Wolf ruff ${token}`, `Silver fox winter pelt ${token}`]);
    expect((await results({ style: 'plush' })).total).toBe(1);
    expect((await results({ bodyRegion: 'head' })).total).toBe(1);
    expect(titles((await results({ minPrice: 1500, maxPrice: 3200, animal: 'fox,cat,wolf', sort: 'price-asc' })).results)).toEqual([
      `Tabby cat short coat ${token}`,
      `Russet fox crown ${token}`,
      `Wolf ruff ${token}`,
    ]);
    expect(titles((await results({ format: 'glb,json' })).results)).toEqual([`Plush ring nap ${token}`]);
    // Guides per cm² and the typical length in cm replace the guide count, which follows the size of
    // the seller's mesh; bounds count as inside, and listings not measured yet (the badgers) match neither.
    expect(titles((await results({ minDensity: 2, maxDensity: 4.5, sort: 'price-desc' })).results)).toEqual([
      `Wolf ruff ${token}`,
      `Russet fox crown ${token}`,
      `Tabby cat short coat ${token}`,
    ]);
    expect(titles((await results({ minLength: 4, sort: 'price-asc' })).results)).toEqual([`Wolf ruff ${token}`, `Silver fox winter pelt ${token}`]);
    expect(titles((await results({ maxLength: 1.2, sort: 'price-asc' })).results)).toEqual([`Plush ring nap ${token}`, `Tabby cat short coat ${token}`]);
    expect(titles((await results({ minDensity: 2.5, maxLength: 3, sort: 'price-asc' })).results)).toEqual([
      `Plush ring nap ${token}`,
      `Tabby cat short coat ${token}`,
      `Russet fox crown ${token}`,
    ]);
    expect((await results({ minDensity: 0.1, animal: 'creature' })).total).toBe(0);
    // The raw guide count is no filter any more: the old parameter is left out, not applied.
    expect((await results({ minGuides: 100000 })).total).toBe(30);
  });

  it('answers 400 with a message per field for a density or length range turned round, or not a number', async () => {
    const turned = await search({ minDensity: 5, maxDensity: 2, minLength: 3, maxLength: 1 });
    expect(turned.status).toBe(400);
    expect(turned.body.error!.fields).toEqual({
      maxDensity: 'The highest density must not be below the lowest.',
      maxLength: 'The longest length must not be below the shortest.',
    });
    const words = await search({ minDensity: 'dense', maxLength: -1 });
    expect(words.status).toBe(400);
    expect(Object.keys(words.body.error!.fields!).sort()).toEqual(['maxLength', 'minDensity']);
  });

  it('sorts by newest, best-selling, rating and price', async () => {
    const named = { animal: 'fox,cat,toy,wolf' };
    expect(titles((await results({ ...named, sort: 'newest' })).results)[0]).toBe(`Wolf ruff ${token}`);
    expect(titles((await results({ ...named, sort: 'best-selling' })).results).slice(0, 3)).toEqual([
      `Tabby cat short coat ${token}`,
      `Russet fox crown ${token}`,
      `Wolf ruff ${token}`,
    ]);
    const byRating = (await results({ ...named, sort: 'rating' })).results;
    expect(titles(byRating).slice(0, 2)).toEqual([`Tabby cat short coat ${token}`, `Russet fox crown ${token}`]);
    expect(byRating.at(-1)!.rating).toEqual({ average: null, count: 0 }); // unrated last
    expect((await results({ ...named, sort: 'price-asc' })).results.map((card) => card.priceCents)).toEqual([900, 1500, 2400, 3200, 5900]);
  });

  it('pages on the server with a total', async () => {
    const first = await results({ animal: 'creature', sort: 'price-asc', pageSize: 10, page: 1 });
    const third = await results({ animal: 'creature', sort: 'price-asc', pageSize: 10, page: 3 });
    expect(first.total).toBe(25);
    expect(first.results.map((card) => card.priceCents)).toEqual(Array.from({ length: 10 }, (_, i) => 1000 + i));
    expect(third.results.map((card) => card.priceCents)).toEqual(Array.from({ length: 5 }, (_, i) => 1020 + i));
    expect((await results({ animal: 'creature', pageSize: 10, page: 4 })).results).toEqual([]);
  });

  it('answers cards with price and currency, tags, seller, licence and a picture route', async () => {
    const [card] = (await results({ animal: 'cat' })).results;
    expect(card).toMatchObject({
      priceCents: 1500,
      currency: 'eur',
      tags: { animal: 'cat', coatLength: 'short', style: 'natural', bodyRegion: 'full-body' },
      formats: ['obj'],
      guideCount: 4000,
      salesCount: 30,
      rating: { average: 4.9, count: 12 },
      licence: { slug: 'personal', title: 'Personal licence' },
      pictureUrl: `/api/market/listings/${card.id}/pictures/front-256`,
    });
    expect(card.seller.displayName).toMatch(/search-seller/);
  });

  it('shows every committed change at once, though answers are kept between searches', async () => {
    const seller = await makePerson('search-changes', ['groomer']);
    const word = `${token}changes`;
    const id = await insertListing(seller, { title: `Brindle hound coat ${word}`, animal: 'dog', priceCents: 2000 });
    const find = async () => (await search({ q: word })).body.data!;
    expect((await find()).results.map((card) => card.priceCents)).toEqual([2000]);
    expect(await find()).toEqual(await find());

    await db()('listings').where({ id }).update({ price_cents: 2600, sales_count: 4 });
    expect((await find()).results).toMatchObject([{ priceCents: 2600, salesCount: 4 }]);
    await db()('users').where({ id: seller.userId }).update({ display_name: 'Hound Hall' });
    expect((await find()).results[0].seller.displayName).toBe('Hound Hall');
    // A change rolled back changes nothing.
    await db()
      .transaction(async (trx) => {
        await trx('listings').where({ id }).update({ state: 'unlisted' });
        throw new Error('rolled back');
      })
      .catch(() => undefined);
    expect((await find()).total).toBe(1);
    await db()('listings').where({ id }).update({ state: 'unlisted' });
    expect(await find()).toMatchObject({ total: 0, results: [] });
  });

  it('answers 400 with a message per field for bad filters', async () => {
    const bad = await search({ animal: 'dragon', minPrice: 500, maxPrice: 100, sort: 'cheapest', pageSize: 1000 });
    expect(bad.status).toBe(400);
    expect(bad.body.error!.code).toBe('invalid-input');
    expect(Object.keys(bad.body.error!.fields!).sort()).toEqual(['animal', 'pageSize', 'sort']);
    const range = await search({ minPrice: 500, maxPrice: 100 });
    expect(range.body.error!.fields).toEqual({ maxPrice: 'The highest price must not be below the lowest.' });
  });
});
