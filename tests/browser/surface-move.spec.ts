// Moving a groom onto a new version of its character in the studio: the new sculpt uploaded from
// the editor, the transfer report shown before anything changes, the move accepted, the editor
// reopened on the new surface, and the groom as it was kept as a version that opens on the old one.
import { expect, test, type Page } from '@playwright/test';
import { closeDb } from '../../lib/platform/db';
import { surfaceToObj } from '../../lib/groom/demo/obj';
import { foxHead } from '../../lib/groom/demo/surfaces';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';
import { waitForField } from './studio-helpers';

test.afterAll(closeDb);

const FOX = foxHead();
const FIRST = Buffer.from(surfaceToObj(FOX, 'Bramble, first sculpt'));
// A second sculpt pass: the same polygons, every vertex moved (wider cheeks, a flatter crown).
const SECOND = Buffer.from(surfaceToObj({ ...FOX, positions: FOX.positions.map((x, i) => x * [1.06, 1, 0.96][i % 3]) }, 'Bramble, second sculpt'));

async function upload(page: Page, fileName: string, buffer: Buffer) {
  await page.getByLabel('Surface file').setInputFiles({ name: fileName, mimeType: 'application/octet-stream', buffer });
  await page.getByRole('button', { name: 'Upload and check' }).click();
}

test('replacing a groom’s surface: the transfer report first, then the move; the old surface stays in the history', async ({ page }) => {
  test.setTimeout(300_000);
  const account = await confirmedAccount('mover', 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  await page.goto('/studio');
  await upload(page, 'bramble.obj', FIRST);
  await expect(page.getByText('bramble is ready')).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a groom on bramble' }).click();
  await page.getByLabel('Name of the new groom on bramble').fill('Travelling coat');
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await waitForField(page);
  await expect(page.getByText(/^On bramble \(/).first()).toBeVisible();

  await page.getByRole('tab', { name: 'Surface' }).click();
  await page.getByText('Upload a new version of the character').click();
  await upload(page, 'sculpt.obj', SECOND);
  await expect(page.getByText('sculpt is ready')).toBeVisible({ timeout: 60_000 });
  await expect(page.getByLabel('Move onto')).toHaveValue(/[0-9a-f-]{36}/);
  await page.getByRole('button', { name: 'Show the transfer report' }).click();

  const report = page.getByTestId('transfer-report');
  await expect(report).toBeVisible({ timeout: 60_000 });
  await expect(report).toContainText('Carried by polygon (the same polygons)');
  await expect(report).toContainText('field.singularities[0]');
  await expect(report).toContainText('The field solves there with exactly the carried singularities.');
  // Nothing has changed yet: cancel leaves the groom where it was.
  await page.getByRole('tabpanel').getByRole('button', { name: 'Cancel', exact: true }).click();
  await expect(report).toHaveCount(0);
  await page.getByRole('button', { name: 'Show the transfer report' }).click();
  await expect(report).toBeVisible({ timeout: 60_000 });

  await page.getByRole('button', { name: 'Move the groom' }).click();
  await expect(page.getByText(/^On sculpt \(/).first()).toBeVisible({ timeout: 60_000 });
  await waitForField(page);

  await page.getByRole('tab', { name: 'Versions' }).click();
  await expect(page.getByText('Before moving to sculpt').first()).toBeVisible();
  await page.getByRole('button', { name: /Bring back version 1/ }).click();
  await page.getByRole('dialog').getByRole('button', { name: /Bring it back|Bring back/ }).click();
  await expect(page.getByText(/^On bramble \(/).first()).toBeVisible({ timeout: 60_000 });

  // Starting another groom from this one on the second sculpt leaves this one where it is.
  const here = page.url();
  await waitForField(page);
  await page.getByRole('tab', { name: 'Surface' }).click();
  await page.getByLabel('Move onto').selectOption({ label: 'sculpt' });
  await page.getByRole('button', { name: 'Show the transfer report' }).click();
  await expect(report).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a new groom there instead' }).click();
  await expect(page).not.toHaveURL(here, { timeout: 60_000 });
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await waitForField(page);
  await expect(page.getByText(/^On sculpt \(/).first()).toBeVisible();
  await page.goto(here);
  await expect(page.getByText(/^On bramble \(/).first()).toBeVisible({ timeout: 60_000 });
});
