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

// The same fox, turned a quarter about its up axis, twice the size, and with each triangle's
// corners listed from another corner: the polygons differ, so the groom moves by alignment.
const TURNED = (() => {
  const positions = FOX.positions.slice();
  for (let i = 0; i < positions.length; i += 3) {
    const [x, y, z] = [FOX.positions[i], FOX.positions[i + 1], FOX.positions[i + 2]];
    [positions[i], positions[i + 1], positions[i + 2]] = [2 * z, 2 * y, -2 * x];
  }
  const triangles = FOX.triangles.slice();
  for (let f = 0; f < triangles.length; f += 3) [triangles[f], triangles[f + 1], triangles[f + 2]] = [FOX.triangles[f + 1], FOX.triangles[f + 2], FOX.triangles[f]];
  return Buffer.from(surfaceToObj({ ...FOX, positions, triangles }, 'Bramble, turned'));
})();

test('landmarks for a move by alignment are clicked on the two surfaces side by side', async ({ page }) => {
  test.setTimeout(300_000);
  const account = await confirmedAccount('matcher', 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  await page.goto('/studio');
  await upload(page, 'bramble.obj', FIRST);
  await expect(page.getByText('bramble is ready')).toBeVisible({ timeout: 60_000 });
  await upload(page, 'turned.obj', TURNED);
  await expect(page.getByText('turned is ready')).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a groom on bramble' }).click();
  await page.getByLabel('Name of the new groom on bramble').fill('Matched coat');
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await waitForField(page);

  await page.getByRole('tab', { name: 'Surface' }).click();
  await page.getByLabel('Move onto').selectOption({ label: 'turned' });
  await page.getByText('Match places by hand on the two surfaces').click();
  const from = page.getByTestId('landmarks-from'), to = page.getByTestId('landmarks-to');
  await expect(to).toBeVisible({ timeout: 60_000 });
  const status = page.getByTestId('landmark-status');
  const spots = [[0.5, 0.5], [0.42, 0.4], [0.6, 0.42], [0.5, 0.62]];
  for (const [k, [x, y]] of spots.entries()) {
    const box = (await from.boundingBox())!;
    await from.click({ position: { x: x * box.width, y: y * box.height } });
    await expect(status).toHaveText('Now click the same place on turned.');
    // A drag turns the view and places nothing.
    const target = (await to.boundingBox())!;
    await page.mouse.move(target.x + 0.5 * target.width, target.y + 0.5 * target.height);
    await page.mouse.down();
    await page.mouse.move(target.x + 0.5 * target.width + 40, target.y + 0.5 * target.height + 20, { steps: 4 });
    await page.mouse.up();
    await expect(status).toHaveText('Now click the same place on turned.');
    // Turned back, so the same spot of the view is clicked as on the other side.
    await page.mouse.move(target.x + 0.5 * target.width + 40, target.y + 0.5 * target.height + 20);
    await page.mouse.down();
    await page.mouse.move(target.x + 0.5 * target.width, target.y + 0.5 * target.height, { steps: 4 });
    await page.mouse.up();
    await to.click({ position: { x: x * target.width, y: y * target.height } });
    await expect(status).toHaveText(new RegExp(`^${k + 1} pairs? matched`));
  }
  const lines = (await page.getByLabel(/^Landmarks/).inputValue()).trim().split('\n');
  expect(lines).toHaveLength(4);
  for (const line of lines) expect(line).toMatch(/^(-?[\d.e-]+ ){3}= (-?[\d.e-]+ ?){3}$/);

  await page.getByRole('button', { name: 'Show the transfer report' }).click();
  const report = page.getByTestId('transfer-report');
  await expect(report).toBeVisible({ timeout: 60_000 });
  await expect(report).toContainText('Carried by alignment along the normal');
});
