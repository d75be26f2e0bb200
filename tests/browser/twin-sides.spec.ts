// Twin sides on the demo fox: the switch finds Bramble's mirror plane (x = 0, the fox is sculpted
// symmetric), and one whorl placed with the pointer off the middle appears on both sides — two
// rows in the feature list at mirrored places — as one edit that one undo takes back.
import { expect, test } from '@playwright/test';
import { closeDb } from '../../lib/platform/db';
import { openPracticeFox } from './studio-helpers';

test.afterAll(closeDb);


test('twin sides on the fox: the plane found, one whorl placed appears mirrored, one undo takes both', async ({ page }) => {
  test.setTimeout(180_000);
  await openPracticeFox(page, 'twin-sides');
  const twin = page.getByRole('group', { name: 'Twin sides' });
  // The switch turns on once the field worker has found the plane: a click, then its state.
  await twin.getByRole('checkbox').click();
  await expect(twin.getByRole('checkbox')).toBeChecked();
  await expect(twin.getByTestId('twin-plane')).toContainText('Mirror plane x = 0');
  await expect(twin.getByTestId('twin-plane')).toContainText('misses its own mirror image by at most');

  const rows = page.getByTestId('feature-row');
  const whorls = rows.filter({ hasText: /^Whorl/ });
  const before = await whorls.count();
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const box = (await stage.boundingBox())!;
  await page.getByRole('button', { name: 'Whorl', exact: true }).click();
  // Off the middle of the view (the fox faces us, its plane through the middle): one cheek, where
  // the studio test's parting clicks land on the surface too.
  await page.mouse.click(box.x + box.width / 2 - 50, box.y + box.height / 2 + 60);
  await expect(whorls).toHaveCount(before + 2);
  await expect(page.getByRole('button', { name: 'Undo' })).toHaveAttribute('title', 'Undo: Add whorl on both sides (Ctrl+Z)');

  const placed = page.getByRole('group', { name: `Whorl ${before + 1}`, exact: true });
  const mirror = page.getByRole('group', { name: `Whorl ${before + 2}`, exact: true });
  const value = async (group: typeof placed, axis: string) => Number(await group.getByLabel(axis, { exact: true }).inputValue());
  // The placed whorl is selected (its row open); the mirror's row opens when it is picked.
  const [x, y, z] = [await value(placed, 'x'), await value(placed, 'y'), await value(placed, 'z')];
  expect(Math.abs(x)).toBeGreaterThan(0.01);
  await mirror.locator('button[aria-expanded]').click();
  await expect(mirror.locator('button[aria-expanded]')).toHaveAttribute('aria-expanded', 'true');
  expect(await value(mirror, 'x')).toBeCloseTo(-x, 6);
  expect(await value(mirror, 'y')).toBeCloseTo(y, 6);
  expect(await value(mirror, 'z')).toBeCloseTo(z, 6);

  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(whorls).toHaveCount(before);
});
