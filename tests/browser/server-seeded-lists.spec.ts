// A list that the page's server brings is never shown older than that copy, also after a
// client-side navigation away and back (SWR's cache from the first visit used to win over the
// fresh server copy until a refetch, which SWR's de-duplication can hold back). Shown on the
// admins' purchases (components/admin/PurchaseList.tsx, components/ui/use-server-seeded-swr.ts).
import { randomUUID } from 'node:crypto';
import { expect, test, type Route } from '@playwright/test';
import { closeDb, db } from '../../lib/platform/db';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { expectSignedInAs, signInThroughForm, uniqueEmail } from './helpers';

test.afterAll(closeDb);

/** A paid purchase of a draft listing, written as the webhook would (nobody else sees either). */
async function recordPurchase(): Promise<string> {
  const [seller, buyer] = await db()('users')
    .insert(['seeded-seller', 'seeded-buyer'].map((label) => ({ email: uniqueEmail(label), display_name: label, password_hash: 'not-used', email_verified_at: db().fn.now() })))
    .returning(['id', 'email']);
  const licence = await db()('licences').first('id');
  const [listing] = await db()('listings')
    .insert({
      seller_id: seller.id,
      groom_id: randomUUID(),
      groom_version_id: randomUUID(),
      groom_name: 'Seeded',
      spec: JSON.stringify({}),
      surface_key: 'tests/none.obj',
      surface_file_name: 'none.obj',
      title: `Seeded list coat ${randomUUID().slice(0, 8)}`,
      description: 'A listing of the server-seeded list test.',
      animal: 'toy',
      coat_length: 'short',
      style: 'plush',
      body_region: 'full-body',
      price_cents: 700,
      currency: 'eur',
      licence_id: licence.id,
      formats: ['json'],
      state: 'draft',
    })
    .returning('id');
  await db()('purchases').insert({
    listing_id: listing.id,
    buyer_id: buyer.id,
    seller_id: seller.id,
    checkout_session_id: `cs_seeded_${randomUUID()}`,
    amount_cents: 700,
    currency: 'eur',
    platform_fee_cents: 105,
  });
  return buyer.email;
}

test('the admin coming back to the admin page sees a purchase made meanwhile', async ({ page }) => {
  const admin = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  await signInThroughForm(page, admin.email, admin.password);
  await expectSignedInAs(page, admin.displayName);
  await page.goto('/admin');
  await expect(page.getByRole('heading', { name: 'Purchases' })).toBeVisible();

  // From now on the purchases API does not answer (a slow server): what the list shows after
  // coming back can only be SWR's cache from this visit or the server copy of the new render.
  // Without the seeding, SWR's cache won (and its refetch, de-duplicated for 2 s, often never ran).
  const held: Route[] = [];
  await page.route('**/api/admin/purchases*', (route) => void held.push(route));

  // Away by a link (client-side), a purchase happens, and back by the header's link.
  await page.getByRole('link', { name: /Outgoing mail/ }).click();
  await expect(page.getByRole('heading', { name: 'Outgoing mail', level: 1 })).toBeVisible();
  const buyerEmail = await recordPurchase();
  await page.getByRole('navigation', { name: 'Areas' }).getByRole('link', { name: 'Admin' }).click();
  await expect(page.getByRole('heading', { name: 'Admin', level: 1 })).toBeVisible();
  await expect(page.getByRole('table', { name: 'Recent purchases' }).getByRole('row').filter({ hasText: buyerEmail })).toBeVisible();
  // Release the held requests while the route still holds them: removing the last route first
  // ends interception, which lets them through, and aborting one then fails ("already handled").
  await Promise.all(held.map((route) => route.abort()));
  await page.unroute('**/api/admin/purchases*');
});
