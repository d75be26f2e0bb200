// The market page's URL for the density and length filters: read, written back, and passed to the
// search as lib/market takes them (guides per cm², typical length in cm).
import { describe, expect, it } from 'vitest';
import { marketHref, readMarketQuery, searchInputOf } from '@/components/market/search-params';
import { searchSchema } from '@/lib/market/validation';

describe('the density and length filters in the market’s URL', () => {
  it('reads decimals written either way, writes them back, and asks the search for them', () => {
    const { query, ignored } = readMarketQuery({ minDensity: '1,5', maxDensity: '4', minLength: '0.5', maxLength: '12.25' });
    expect(ignored).toEqual([]);
    expect(query).toMatchObject({ minDensity: 1.5, maxDensity: 4, minLength: 0.5, maxLength: 12.25 });
    expect(marketHref(query)).toBe('/market?minDensity=1.5&maxDensity=4&minLength=0.5&maxLength=12.25');
    const input = searchSchema.parse(searchInputOf(query));
    expect(input).toMatchObject({ minDensity: 1.5, maxDensity: 4, minLength: 0.5, maxLength: 12.25 });
  });

  it('leaves out what does not parse or is turned round, and no longer knows the guide count', () => {
    expect(readMarketQuery({ minDensity: 'dense', maxLength: '3' })).toMatchObject({ query: { maxLength: 3 }, ignored: ['minDensity'] });
    expect(readMarketQuery({ minLength: '5', maxLength: '2' }).ignored).toEqual(['maxLength']);
    const old = readMarketQuery({ minGuides: '1000', maxGuides: '5000' });
    expect(old.query).toEqual({ page: 1 });
    expect(marketHref(old.query)).toBe('/market');
  });
});
