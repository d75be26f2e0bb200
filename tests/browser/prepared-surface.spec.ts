// The editor opens a checked surface in its prepared form (read and welded once by the check, no
// parsing in the browser), and the field and guides it shows are those of the artist's file: the
// same groom opened again with the prepared form unreachable falls back to the file and shows the
// same proof (measured indices, edges checked, largest turn) and the same guides.
import { expect, test, type Page } from '@playwright/test';
import { closeDb } from '../../lib/platform/db';
import { surfaceToObj } from '../../lib/groom/demo/obj';
import { foxHead } from '../../lib/groom/demo/surfaces';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';
import { openPanel, waitForField } from './studio-helpers';

test.afterAll(closeDb);

async function whatTheEditorShows(page: Page) {
  await waitForField(page);
  const proof = page.getByTestId('index-proof');
  await expect(proof).toContainText('each exactly where one was placed; none elsewhere', { timeout: 60_000 });
  await openPanel(page, 'Guides');
  await expect(page.getByTestId('guide-status')).toContainText(/guides over/, { timeout: 90_000 });
  const guides = (await page.getByTestId('guide-status').innerText()).replace(/, grown in .*$/, '');
  return { proof: await proof.innerText(), guides };
}

test('the prepared surface and the file give the same field and guides', async ({ page }) => {
  test.setTimeout(240_000);
  const account = await confirmedAccount('prepared', 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  await page.goto('/studio');
  await page.getByLabel('Surface file').setInputFiles({ name: 'bramble.obj', mimeType: 'application/octet-stream', buffer: Buffer.from(surfaceToObj(foxHead(), 'Bramble')) });
  await page.getByRole('button', { name: 'Upload and check' }).click();
  await expect(page.getByText('bramble is ready')).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a groom on bramble' }).click();
  await page.getByLabel('Name of the new groom on bramble').fill('Prepared coat');
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);

  // Opened from the prepared form: the page asked for it, and not for the file.
  const asked: string[] = [];
  page.on('request', (request) => asked.push(new URL(request.url()).pathname));
  await page.reload();
  const prepared = await whatTheEditorShows(page);
  expect(asked.some((path) => /^\/api\/studio\/surfaces\/[0-9a-f-]+\/prepared$/.test(path))).toBe(true);
  expect(asked.some((path) => path.endsWith('.obj'))).toBe(false);

  // The prepared form out of reach: the editor reads the file instead, and shows the same.
  await page.route('**/api/studio/surfaces/*/prepared', (route) => route.abort());
  asked.length = 0;
  await page.reload();
  const fromFile = await whatTheEditorShows(page);
  expect(asked.some((path) => path.endsWith('.obj'))).toBe(true);
  expect(fromFile).toEqual(prepared);
});
