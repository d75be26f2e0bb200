// The market end to end, as its people use it: a groomer lists a saved groom version, an admin
// approves it, a buyer finds it by search, pays on the payments fake's hosted page with the test
// card, downloads the package and reviews it; the seller sees the sale in the chart and the CSV;
// an admin refunds it and the buyer's download is refused.
import { randomBytes } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { expect, test } from '@playwright/test';
import { unzipSync, strFromU8 } from 'fflate';
import { closeDb, db } from '../../lib/platform/db';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { confirmedAccount } from './helpers';
import { groomWithSavedVersion, personPage } from './market-helpers';

test.afterAll(closeDb);

test('a preset is listed, approved, found, bought, downloaded, reviewed, counted, paid out and refunded', async ({ browser }) => {
  test.setTimeout(300_000);
  const token = `zq${randomBytes(4).toString('hex')}`;
  const title = `Badger ruff ${token}`;
  const password = 'sett-and-stripe-42';

  // The seller lists a saved groom version and sends it for review.
  const sellerAccount = await confirmedAccount('seller', 'groomer', password);
  const seller = await personPage(browser, sellerAccount.email, password, sellerAccount.displayName);
  const groomName = `Ruff ${token}`;
  await groomWithSavedVersion(seller, groomName);

  await seller.goto('/sales');
  await seller.getByRole('link', { name: 'List a preset' }).click();
  await expect(seller.getByRole('heading', { name: 'List a preset', level: 1 })).toBeVisible();
  // Field messages come before anything is sent.
  await seller.getByRole('button', { name: 'Save and submit for review' }).click();
  await expect(seller.locator('[data-field-error="title"]')).toBeVisible();
  await expect(seller.locator('[data-field-error="groomId"]')).toBeVisible();

  await seller.getByLabel('Groom', { exact: true }).selectOption({ label: `${groomName} (Loop ring)` });
  await expect(seller.getByLabel('Saved version')).toHaveValue(/.+/);
  await seller.getByLabel('Title').fill(title);
  await seller
    .getByLabel('Description')
    .fill('A badger ruff for a stocky creature: a crown whorl, a parting down the back and short, dense guides all round.');
  await seller.getByLabel('Animal').selectOption('creature');
  await seller.getByLabel('Coat length').selectOption('short');
  await seller.getByLabel('Style').selectOption('wild');
  await seller.getByLabel('Body region').selectOption('full-body');
  await seller.getByLabel('Price', { exact: true }).fill('19.50');
  await seller.getByLabel('Currency').selectOption('eur');
  await seller.getByLabel('Studio licence').check();
  await expect(seller.getByTestId('licence-text')).toContainText('Studio licence');
  await seller.getByLabel(/OpenUSD BasisCurves, linear/).check();
  await seller.getByLabel(/glTF 2\.0 binary/).check();
  await seller.getByLabel(/Whorlwind groom spec/).check();
  // Without the rights tick the listing is refused, with words.
  await seller.getByRole('button', { name: 'Save and submit for review' }).click();
  await expect(seller.locator('[data-field-error="rightsConfirmed"]')).toContainText('own or may publish');
  await seller.getByLabel(/I own this groom/).check();
  await seller.getByRole('button', { name: 'Save and submit for review' }).click();

  await expect(seller).toHaveURL(/\/sales\?listed=/);
  const myListing = seller.getByTestId('seller-listing').filter({ hasText: title });
  await expect(myListing.getByTestId('listing-state')).toHaveAttribute('data-state', 'submitted');

  // An admin approves it once its pictures and package are made.
  const adminAccount = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  const admin = await personPage(browser, adminAccount.email, adminAccount.password, adminAccount.displayName);
  await admin.goto('/admin');
  const queued = admin.getByTestId('queue-item').filter({ hasText: title });
  await expect(async () => {
    await admin.reload();
    await expect(queued.getByRole('button', { name: 'Approve' })).toBeEnabled({ timeout: 2_000 });
  }).toPass({ timeout: 120_000, intervals: [2_000] });
  await queued.getByRole('button', { name: 'Approve' }).click();
  await expect(admin.getByText(`“${title}” is on the market`)).toBeVisible();
  await expect(queued).toHaveCount(0);

  // A buyer finds it by search and reads the listing before paying.
  const buyerAccount = await confirmedAccount('buyer', 'buyer', password);
  const buyer = await personPage(browser, buyerAccount.email, password, buyerAccount.displayName);
  await buyer.goto('/market');
  await buyer.getByLabel('Search presets').fill(token);
  await buyer.getByRole('button', { name: 'Search' }).click();
  await expect(buyer).toHaveURL(new RegExp(`/market\\?q=${token}`));
  await expect(buyer.getByTestId('listing-tile')).toHaveCount(1);
  await expect(buyer.getByTestId('listing-tile')).toContainText('19.50 EUR');
  await expect(buyer.getByTestId('listing-tile')).toContainText(/guides per cm² · [\d.]+(–[\d.]+)? cm/);
  await buyer.getByRole('link', { name: title }).click();

  await expect(buyer.getByRole('heading', { name: title, level: 1 })).toBeVisible();
  await expect(buyer.getByTestId('licence-text')).toContainText('Studio licence');
  await expect(buyer.getByRole('complementary', { name: 'Before you buy' })).toContainText('not legal advice');
  await expect(buyer.getByTestId('package-formats')).toContainText('OpenUSD BasisCurves, linear');
  await expect(buyer.getByTestId('gallery').getByRole('img').first()).toBeVisible();
  const preview = buyer.getByTestId('guide-preview');
  await expect(preview).toHaveAttribute('data-preview-state', 'ready', { timeout: 30_000 });
  await expect(preview.locator('canvas')).toBeVisible();
  await expect(preview).toContainText(/\d+ guides shown/);
  // What the listing says it is: the surface was registered in centimetres, and the ring is closed, of genus 1.
  const facts = buyer.getByTestId('listing-facts');
  await expect(facts).toContainText('centimetres (cm)');
  await expect(facts).toContainText(/[\d.]+ guides per cm², [\d,]+ hairs per guide/);
  await expect(facts).toContainText('genus 1 · closed, no openings');
  await expect(facts).toContainText('by alignment of the two surfaces');
  // The preview the browser's GLTFLoader drew holds as many guides as the listing states.
  const shown = (await preview.textContent())!.match(/([\d,]+) guides shown/)![1];
  await expect(facts).toContainText(`${shown} guides, 4 points each`);

  // Pays with the test card on the payment provider's hosted page, and comes back to the library.
  await buyer.getByRole('button', { name: 'Buy for 19.50 EUR' }).click();
  await expect(buyer.getByLabel('Card number')).toBeVisible();
  await buyer.getByLabel('Card number').fill('4242 4242 4242 4242');
  await buyer.getByRole('button', { name: /^Pay/ }).click();
  await expect(buyer).toHaveURL(/\/library\?checkout=success/);
  await expect(buyer.getByTestId('purchase-arrived')).toContainText(title, { timeout: 30_000 });

  // Downloads the package: the zip opens and holds the promised files.
  const owned = buyer.getByTestId('library-item').filter({ hasText: title });
  const downloading = buyer.waitForEvent('download');
  await owned.getByRole('button', { name: /Download/ }).click();
  const download = await downloading;
  const files = unzipSync(new Uint8Array(await readFile((await download.path())!)));
  const names = Object.keys(files).map((path) => path.split('/').pop());
  expect(names.sort()).toEqual(['LICENCE.txt', 'README.txt', 'groom-spec.json', 'guides.glb', 'guides.usda']);
  const usda = Object.entries(files).find(([path]) => path.endsWith('guides.usda'))![1];
  expect(strFromU8(usda)).toContain('BasisCurves');
  const glb = Object.entries(files).find(([path]) => path.endsWith('guides.glb'))![1];
  expect(strFromU8(glb.slice(0, 4))).toBe('glTF');
  const spec = JSON.parse(strFromU8(Object.entries(files).find(([path]) => path.endsWith('groom-spec.json'))![1]));
  expect(spec.specVersion).toBeGreaterThanOrEqual(1);
  expect(strFromU8(Object.entries(files).find(([path]) => path.endsWith('LICENCE.txt'))![1])).toContain('Studio licence');
  await expect(owned).toContainText('downloaded 1 time');

  // Leaves a review, which the listing shows.
  await owned.getByRole('button', { name: 'Rate and review' }).click();
  await owned.getByRole('button', { name: 'Publish my review' }).click();
  await expect(owned.locator('[data-field-error="rating"]')).toBeVisible();
  await owned.getByLabel(/5 out of 5/).check();
  await owned.getByLabel('What you thought').fill('The crown whorl sat exactly where our badger needed it.');
  await owned.getByRole('button', { name: 'Publish my review' }).click();
  await expect(owned.getByText('Your review is saved')).toBeVisible();
  await buyer.getByRole('link', { name: title }).click();
  await expect(buyer.getByTestId('review')).toContainText('The crown whorl sat exactly where');

  // The seller sees the sale in the chart, the table and the CSV.
  await seller.goto('/sales');
  await expect(seller.getByTestId('total-units')).toHaveText('1');
  await seller.getByRole('group', { name: 'Figure shown' }).getByRole('button', { name: 'Units sold' }).click();
  await expect(seller.getByTestId('sales-chart')).toHaveAttribute('data-total', '1');
  await expect(seller.getByTestId('chart-bar').and(seller.locator('[data-value="1"]'))).toHaveCount(1);
  const row = seller.getByTestId('sales-row').filter({ hasText: title });
  await expect(row).toContainText('19.50 EUR');
  const csvHref = await seller.getByTestId('sales-csv').getAttribute('href');
  const csv = await seller.request.get(csvHref!);
  expect(csv.status()).toBe(200);
  expect(csv.headers()['content-type']).toContain('text/csv');
  const csvLine = (await csv.text()).split(/\r?\n/).find((line) => line.includes(title));
  expect(csvLine).toBeDefined();
  expect(csvLine).toContain('EUR,1,19.50');

  // The seller's share (19.50 − 15 % = 19.50 − 2.93 = 16.57 EUR) is held for 14 days after the sale.
  const card = seller.getByTestId('balance-card');
  await expect(card.getByTestId('balance')).toHaveText('16.57 EUR');
  await expect(card).toContainText('paid out 14 days after the sale');
  await expect(card.getByRole('button', { name: /Pay out/ })).toHaveCount(0);
  // Fifteen days later (time moved through the purchase's row): "Pay out" asks before it pays.
  await db()('purchases')
    .whereIn('listing_id', db()('listings').where({ title }).select('id'))
    .update({ created_at: db().raw(`now() - interval '15 days'`) });
  await seller.reload();
  await card.getByRole('button', { name: 'Pay out EUR…' }).click();
  const confirm = card.getByRole('group', { name: /Confirm the payout of 16\.57 EUR/ });
  await expect(confirm).toContainText('Transfer 16.57 EUR to your payout account now?');
  await confirm.getByRole('button', { name: 'Yes, pay out 16.57 EUR' }).click();
  await expect(seller.getByText('16.57 EUR is on its way to your account.')).toBeVisible();
  await expect(seller.getByTestId('payout-history')).toContainText('16.57 EUR');
  await expect(card.getByTestId('balance')).toHaveText('0.00 EUR');

  // An admin refunds it, told first that it was paid out; the buyer's download is refused.
  await admin.goto('/admin');
  // The admin looks the buyer up (older purchases, moved past the hold, are not on the first page).
  const byBuyer = admin.getByRole('search', { name: 'Purchases by buyer' });
  const purchase = admin.getByTestId('admin-purchase').filter({ hasText: buyerAccount.email });
  await expect(async () => {
    await byBuyer.getByLabel('Buyer’s e-mail').fill(buyerAccount.email);
    await byBuyer.getByRole('button', { name: 'Find' }).click();
    await expect(purchase).toBeVisible({ timeout: 5_000 });
  }).toPass({ timeout: 30_000 });
  await purchase.getByRole('button', { name: 'Refund…' }).click();
  await expect(purchase.getByTestId('paid-out-warning')).toContainText('the refund leaves the seller owing 16.57 EUR');
  await purchase.getByLabel(/Reason/).fill('Bought by mistake');
  await purchase.getByRole('button', { name: 'Refund 19.50 EUR' }).click();
  await expect(purchase).toHaveAttribute('data-status', 'refunded', { timeout: 30_000 });

  await buyer.goto('/library');
  const refunded = buyer.getByTestId('library-item').filter({ hasText: title });
  await expect(refunded.getByTestId('refunded-mark')).toBeVisible();
  await expect(refunded.getByRole('button', { name: /Download/ })).toHaveCount(0);
  const purchaseId = (await refunded.getAttribute('id'))!.replace('purchase-', '');
  const refused = await buyer.request.post(`/api/library/${purchaseId}/download`);
  expect(refused.status()).toBe(403);
  expect((await refused.json()).error.code).toBe('refunded');

  // The seller's balance is shown as it is: owed, to be kept back from later sales.
  await seller.reload();
  await expect(card.getByTestId('balance')).toHaveText('−16.57 EUR');
  await expect(card).toContainText('You owe the market 16.57 EUR: it is settled from your later sales.');
});
