// The seller's sales CSV, downloaded through its route, starts with the UTF-8 byte-order mark
// EF BB BF (Unicode 15, §23.8 "Specials": U+FEFF as a signature; UTF-8 encodes it as EF BB BF), so
// spreadsheet programs read non-ASCII titles as UTF-8 instead of a legacy code page.
// studio-helpers first: Next's environment set-up must run before any Next module loads.
import { callRoute, signedInAccount } from './studio-helpers';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import * as csvRoute from '@/app/api/sales/export.csv/route';
import { buyListing, insertListing, makePerson } from './market-helpers';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

describe('the sales CSV', () => {
  it('starts with EF BB BF and carries a non-ASCII title intact', async () => {
    const seller = await signedInAccount('groomer', 'csv-seller');
    const title = 'Brisquette — velours d’été · Ärmel & Öhrchen';
    const listingId = await insertListing({ userId: seller.userId, roles: ['groomer'], email: seller.email }, { title });
    await buyListing(await makePerson('csv-buyer', ['buyer']), listingId);

    const response = await callRoute(csvRoute, 'GET', '/api/sales/export.csv?bucket=month', { cookie: seller.cookie });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    const bytes = new Uint8Array(await response.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    // Exactly one mark, then the header.
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes);
    expect(text.startsWith('\uFEFFperiod_start,listing_id,listing_title,')).toBe(true);
    expect(text).toContain(`,${listingId},${title},EUR,1,`);
  });
});
