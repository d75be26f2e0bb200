// Updates to owners, as the people use them: a seller improves a preset that has been sold by
// publishing a new version from the sales page (the rights tick required, the growth surface
// shipped this time), an admin approves it from the review queue, and the owner finds it in their
// library with a notice, downloads both the new version and the one they bought, and has the e-mail.
import { randomBytes } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { expect, test, type Page } from '@playwright/test';
import { unzipSync } from 'fflate';
import { closeDb } from '../../lib/platform/db';
import { listCaughtMail } from '../../lib/platform/mail-sink';
import { listLicences } from '../../lib/market/licences';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { confirmedAccount } from './helpers';
import { apiJson, groomWithSavedVersion, personPage } from './market-helpers';

test.afterAll(closeDb);

/** The file names inside a downloaded package zip. */
async function downloadedFiles(page: Page, button: ReturnType<Page['getByRole']>): Promise<string[]> {
  const downloading = page.waitForEvent('download');
  await button.click();
  const download = await downloading;
  const files = unzipSync(new Uint8Array(await readFile((await download.path())!)));
  return Object.keys(files).map((path) => path.slice(path.indexOf('/') + 1)).sort();
}

test('a seller publishes a new version of a sold preset, an admin approves it, and the owner gets it free in the library', async ({ browser }) => {
  test.setTimeout(300_000);
  const token = `zv${randomBytes(4).toString('hex')}`;
  const title = `Otter slick ${token}`;
  const password = 'holt-and-river-42';

  // A published, bought listing of version 1 (without the surface), made through the routes.
  const sellerAccount = await confirmedAccount('updater', 'groomer', password);
  const seller = await personPage(browser, sellerAccount.email, password, sellerAccount.displayName);
  const groomId = await groomWithSavedVersion(seller, `Slick ${token}`);
  const versions = await apiJson<{ versions: { id: string; number: number }[] }>(await seller.request.get(`/api/studio/grooms/${groomId}/versions`), 200);
  const { listing } = await apiJson<{ listing: { id: string } }>(
    await seller.request.post('/api/market/listings', {
      data: {
        groomId,
        versionId: versions.versions[0].id,
        title,
        description: 'A wet otter slick: flow strokes down the back, short dense guides, a tail that follows.',
        tags: { animal: 'creature', coatLength: 'short', style: 'natural', bodyRegion: 'full-body' },
        priceCents: 1200,
        currency: 'eur',
        licenceSlug: (await listLicences())[0].slug,
        formats: ['usda', 'json'],
        rightsConfirmed: true,
      },
    }),
    201,
  );
  await apiJson(await seller.request.post(`/api/market/listings/${listing.id}/submit`), 200);
  const adminAccount = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  const admin = await personPage(browser, adminAccount.email, adminAccount.password, adminAccount.displayName);
  await expect
    .poll(async () => (await admin.request.post(`/api/admin/listings/${listing.id}/decision`, { data: { approve: true } })).status(), {
      timeout: 120_000,
      intervals: [2_000],
      message: 'the listing is approved once its files are made',
    })
    .toBe(200);

  const ownerAccount = await confirmedAccount('owner', 'buyer', password);
  const owner = await personPage(browser, ownerAccount.email, password, ownerAccount.displayName);
  const checkout = await apiJson<{ url: string }>(await owner.request.post(`/api/market/listings/${listing.id}/checkout`), 200);
  await owner.goto(checkout.url);
  await owner.getByLabel('Card number').fill('4242 4242 4242 4242');
  await owner.getByRole('button', { name: /^Pay/ }).click();
  await expect(owner).toHaveURL(/\/library\?checkout=success/);
  const owned = owner.getByTestId('library-item').filter({ hasText: title });
  await expect(owned.getByRole('button', { name: 'Download the package' })).toBeVisible({ timeout: 30_000 });

  // The seller saves a second version in the studio and publishes it from the sales page.
  await apiJson(await seller.request.post(`/api/studio/grooms/${groomId}/versions`, { data: { name: 'sleeker' } }), 201);
  await seller.goto('/sales');
  await seller.getByTestId('seller-listing').filter({ hasText: title }).getByRole('link', { name: 'New version' }).click();
  await expect(seller.getByRole('heading', { name: `A new version of “${title}”`, level: 1 })).toBeVisible();
  await expect(seller.getByLabel('Saved version')).toHaveValue(/.+/);
  await seller.getByLabel('Saved version').selectOption({ label: 'Version 2: sleeker' });
  await seller.getByLabel('Description').fill('A wet otter slick, sleeker: flow strokes down the back, the growth surface in the package.');
  await seller.getByLabel('What changed').fill('Sleeker back; the package now holds the growth surface.');
  await seller.getByLabel(/Ship my growth surface/).check();
  // Without the rights tick it is refused, with words.
  await seller.getByRole('button', { name: 'Send the new version for review' }).click();
  await expect(seller.locator('[data-field-error="rightsConfirmed"]')).toContainText('own or may publish');
  await seller.getByLabel(/I own this groom/).check();
  await seller.getByRole('button', { name: 'Send the new version for review' }).click();
  await expect(seller).toHaveURL(/\/sales\?updated=/);

  // Waiting for review, the version on sale stays: the public page still says version 1's words.
  await owner.goto(`/market/${listing.id}`);
  await expect(owner.getByText('A wet otter slick: flow strokes').first()).toBeVisible();
  await expect(owner.getByTestId('ships-surface')).toHaveCount(0);

  // The admin approves it from the queue of new versions once its files are made.
  await admin.goto('/admin');
  const queued = admin.getByTestId('version-queue-item').filter({ hasText: title });
  await expect(queued).toContainText('Sleeker back');
  await expect(queued).toContainText('The package ships the growth surface.');
  await expect(async () => {
    await admin.reload();
    await expect(queued.getByRole('button', { name: 'Approve version 2' })).toBeEnabled({ timeout: 2_000 });
  }).toPass({ timeout: 120_000, intervals: [2_000] });
  await queued.getByRole('button', { name: 'Approve version 2' }).click();
  await expect(admin.getByText(`version 2 of “${title}” is on the market`)).toBeVisible();

  // The owner: a notice, both versions in the library, and the e-mail.
  await owner.goto('/library');
  await expect(owner.getByTestId('update-notice')).toContainText(title);
  await expect(owner.getByTestId('update-notice')).toContainText('version 2');
  const newest = owned.getByRole('button', { name: /Download version 2 \(newest\)/ });
  const bought = owned.getByRole('button', { name: /Download version 1 \(the one you bought\)/ });
  expect(await downloadedFiles(owner, bought)).toEqual(['LICENCE.txt', 'README.txt', 'groom-spec.json', 'guides.usda']);
  expect(await downloadedFiles(owner, newest)).toEqual(['LICENCE.txt', 'README.txt', 'groom-spec.json', 'guides.usda', 'surface/loop.obj']);
  await expect(owner.getByTestId('update-notice')).toHaveCount(0);
  const mail = (await listCaughtMail({ to: ownerAccount.email })).find((message) => message.subject.includes('new version'));
  expect(mail?.text).toContain('Sleeker back');

  // The public page shows the new version.
  await owner.goto(`/market/${listing.id}`);
  await expect(owner.getByTestId('listing-version')).toContainText('Version 2');
  await expect(owner.getByTestId('ships-surface')).toBeVisible();
});
