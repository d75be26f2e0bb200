// What a buyer tripped over, in the browser: the market's filters behave one way (a price typed
// before a drop-down changes is still there, and both apply together), and a refund is asked from
// the library, with its reason, and shows up in the admins' refund queue.
import { randomBytes } from 'node:crypto';
import { expect, test, type Browser } from '@playwright/test';
import { closeDb, db } from '../../lib/platform/db';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { DEMO_GROOMS, surfaceToObj } from '../../lib/groom/demo';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';

test.afterAll(closeDb);

async function signedIn(browser: Browser, email: string, password: string, displayName: string) {
  const page = await (await browser.newContext()).newPage();
  await signInThroughForm(page, email, password);
  await expectSignedInAs(page, displayName);
  return page;
}

test('the filters wait for Apply together: a typed price survives a drop-down change', async ({ page }) => {
  await page.goto('/market');
  await page.getByText('Filters', { exact: true }).click();
  const lowest = page.getByLabel('Lowest price');
  await lowest.fill('5');
  await page.getByLabel('Animal').selectOption('cat');
  // The drop-down did not reload the page under the typed price.
  await expect(page.getByTestId('filters-unapplied')).toHaveText('Changed: not applied yet.');
  await expect(lowest).toHaveValue('5');
  await expect(page).toHaveURL(/\/market$/);
  await page.getByRole('button', { name: 'Apply filters' }).click();
  await expect(page).toHaveURL(/animal=cat/);
  await expect(page).toHaveURL(/minPrice=5(&|$)/);
  await expect(page.getByLabel('Lowest price')).toHaveValue('5');
  await expect(page.getByLabel('Animal')).toHaveValue('cat');
  await expect(page.getByTestId('filters-unapplied')).toHaveCount(0);
});

test('a buyer asks for a refund from the library and it lands in the admins’ refund queue', async ({ browser }) => {
  const password = 'refund-reasons-count';
  const buyerAccount = await confirmedAccount('refund-asker', 'buyer', password);
  // A paid purchase of a published demo listing, as the payment webhook records one.
  const listing = await db()('listings').where({ state: 'published' }).orderBy('published_at').first('id', 'seller_id', 'title', 'price_cents', 'currency');
  const buyer = await db()('users').where({ email: buyerAccount.email }).first('id');
  const session = `cs_browser_${randomBytes(6).toString('hex')}`;
  await db()('purchases').insert({
    listing_id: listing.id,
    buyer_id: buyer.id,
    seller_id: listing.seller_id,
    checkout_session_id: session,
    payment_intent_id: `pi_browser_${randomBytes(6).toString('hex')}`,
    amount_cents: listing.price_cents,
    currency: listing.currency,
    platform_fee_cents: 0,
    status: 'paid',
  });

  const page = await signedIn(browser, buyerAccount.email, password, buyerAccount.displayName);
  await page.goto('/library');
  const item = page.getByTestId('library-item').filter({ hasText: listing.title });
  await item.getByRole('button', { name: 'Ask for a refund…' }).click();
  const form = item.getByRole('form', { name: `Ask for a refund of ${listing.title}` });
  await expect(form).toContainText('depends on the law where you live');
  await expect(form.getByTestId('checkout-agreement')).toContainText('did not agree');
  // A reason is needed before anything is sent.
  await form.getByRole('button', { name: 'Send the request' }).click();
  await expect(form.locator('[data-field-error="reason"]')).toBeVisible();
  const reason = `The parting runs the wrong way on my character ${randomBytes(3).toString('hex')}.`;
  await form.getByLabel('Why you ask for a refund').fill(reason);
  await form.getByRole('button', { name: 'Send the request' }).click();
  await expect(item.getByTestId('refund-request-state')).toContainText('You asked for a refund on');
  await expect(item.getByTestId('refund-request-state')).toContainText(reason);

  const adminAccount = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  const admin = await signedIn(browser, adminAccount.email, adminAccount.password, adminAccount.displayName);
  await admin.goto('/admin');
  const queued = admin.getByRole('list', { name: 'Refund requests' }).getByTestId('refund-request').filter({ hasText: reason });
  await expect(queued).toHaveCount(1);
  await expect(queued).toContainText(buyerAccount.email);
  await expect(queued).toContainText('Did not agree at checkout');
});

test('a seller sees why a groom is not offered for listing, the payout words and dates as the page shows them; the admin sees mail links', async ({ browser }) => {
  test.setTimeout(120_000);
  const password = 'versions-kept-here';
  const sellerAccount = await confirmedAccount('unversioned', 'groomer', password);
  const page = await signedIn(browser, sellerAccount.email, password, sellerAccount.displayName);
  // A groom on a checked surface, with no kept version.
  const ring = DEMO_GROOMS.find((groom) => groom.id === 'loop-plush-ring')!;
  const obj = new TextEncoder().encode(surfaceToObj(ring.surface(), 'Loop'));
  const ticket = (await (await page.request.post('/api/studio/uploads', { data: { fileName: 'loop.obj', byteSize: obj.byteLength } })).json()).data;
  expect((await page.request.put(ticket.url, { data: Buffer.from(obj) })).ok()).toBe(true);
  const surface = (await (await page.request.post('/api/studio/surfaces', { data: { uploadId: ticket.uploadId, name: 'Loop ring', units: 'cm' } })).json()).data.surface;
  await expect
    .poll(async () => (await (await page.request.get(`/api/studio/surfaces/${surface.id}`)).json()).data.surface.state, { timeout: 60_000 })
    .toBe('ready');
  const name = `Unkept ${randomBytes(3).toString('hex')}`;
  expect((await page.request.post('/api/studio/grooms', { data: { surfaceId: surface.id, name } })).status()).toBe(201);

  await page.goto('/sales/new');
  const missing = page.getByTestId('unversioned-grooms');
  await expect(missing).toContainText('no kept version yet');
  await expect(missing).toContainText('Keep version');
  await expect(missing.getByRole('link', { name })).toHaveAttribute('href', /\/studio\/grooms\//);

  await page.goto('/sales');
  // The period's days read as the rest of the page's dates ("5 Dec 2026"), not the browser's date field.
  await expect(page.getByLabel('From', { exact: true })).toHaveValue(/^\d{1,2} [A-Z][a-z]{2} \d{4}$/);
  await expect(page.getByTestId('refund-after-payout')).toContainText('kept back from your later sales');

  // The admins' outgoing mail shows the confirmation link of this seller's sign-up as a link.
  const adminAccount = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  const admin = await signedIn(browser, adminAccount.email, adminAccount.password, adminAccount.displayName);
  await admin.goto('/admin/mail');
  const mail = admin.getByTestId('caught-mail').filter({ hasText: sellerAccount.email }).first();
  await expect(mail.getByRole('link', { name: /\/verify-email\?token=/ })).toHaveAttribute('href', /^https?:\/\/[^\s]+\/verify-email\?token=/);
});
