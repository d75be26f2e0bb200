// Read the grain: the editor's suggested layout (the smoothest field with free singularities)
// shown as grain marks, taken all at once, and the field then solved and measured with exactly
// those singularities; dismissing and undoing put things back.
import { expect, test } from '@playwright/test';
import { closeDb } from '../../lib/platform/db';
import { openPanel, openPracticeFox } from './studio-helpers';

test.afterAll(closeDb);


test('reading the grain on the fox: marks shown, taken all at once, the field proved with exactly those singularities', async ({ page }) => {
  test.setTimeout(180_000);
  await openPracticeFox(page, 'grain');
  const rows = page.getByTestId('feature-row');
  const singularRows = rows.filter({ hasText: /^(Whorl|Saddle)/ });
  const placedBefore = await singularRows.count();

  await openPanel(page, 'Field & view');
  const panel = page.getByRole('group', { name: 'Read the grain' });
  await panel.getByRole('button', { name: 'Read the grain' }).click();
  const reading = page.getByTestId('grain-reading');
  await expect(reading).toContainText(/\d+ grain marks?:/, { timeout: 60_000 });
  const marks = Number((await reading.textContent())!.match(/(\d+) grain marks?:/)![1]);
  // The fox head is closed and sphere-like (χ = 2): its smoothest hair field has singularities.
  expect(marks).toBeGreaterThanOrEqual(2);
  await expect(reading).toContainText(`${marks} still to take.`);

  // Dismissed, the marks go; read again, they come back the same.
  await panel.getByRole('button', { name: 'Dismiss' }).click();
  await expect(reading).toHaveCount(0);
  await panel.getByRole('button', { name: 'Read the grain' }).click();
  await expect(reading).toContainText(`${marks} grain mark`, { timeout: 60_000 });

  // One mark taken from the list, one by a click on its ghost (the view turned to face it first).
  await panel.getByRole('list', { name: 'Marks still to take' }).getByRole('button', { name: /^Take / }).first().click();
  await expect(reading).toContainText(`${marks - 1} still to take.`);
  await panel.getByRole('list', { name: 'Marks still to take' }).getByRole('button', { name: /^Look at / }).first().click();
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const box = (await stage.boundingBox())!;
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await expect(reading).toContainText(`${marks - 2} still to take.`);
  await openPanel(page, 'Features');
  await expect(singularRows).toHaveCount(placedBefore + 2);
  await openPanel(page, 'Field & view');

  await panel.getByRole('button', { name: 'Take all' }).click();
  await expect(reading).toContainText('All taken.');
  await openPanel(page, 'Features');
  await expect(singularRows).toHaveCount(marks);
  const proof = page.getByTestId('index-proof');
  await expect(proof).toContainText(`${marks} singularities found, each exactly where one was placed; none elsewhere`, { timeout: 30_000 });
  await expect(page.getByTestId('field-error')).toHaveCount(0);

  // One undo takes the whole layout back (to the two marks taken one by one).
  await expect(page.getByRole('button', { name: 'Undo' })).toHaveAttribute('title', `Undo: Take the grain's ${marks} singularities (Ctrl+Z)`);
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(singularRows).toHaveCount(placedBefore + 2);
});
