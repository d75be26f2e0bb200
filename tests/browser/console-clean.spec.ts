// The 3D views leave three.js nothing to complain about: every demo character opened in the
// editor with its field and guides drawn, and a refused surface drawn with its problems, log no
// error or warning from three (a NaN bounding sphere, a bad attribute) on the browser's console.
import { expect, test, type Page } from '@playwright/test';
import { closeDb } from '../../lib/platform/db';
import { DEMO_GROOMS } from '../../lib/groom/demo/grooms';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';
import { openPanel, waitForField } from './studio-helpers';

test.afterAll(closeDb);

function watchConsole(page: Page): string[] {
  const said: string[] = [];
  page.on('console', (message) => {
    // three's own errors (a NaN bounding sphere, a bad attribute), and any NaN warning. Left
    // out: the GPU driver's performance notes and @react-three/fiber's use of three's deprecated
    // Clock, which are not ours to mend.
    const text = message.text();
    if ((message.type() === 'error' && /THREE\.|NaN/.test(text)) || (message.type() === 'warning' && /NaN/.test(text))) said.push(text);
  });
  page.on('pageerror', (error) => said.push(error.message));
  return said;
}

test('the demo characters and a refused surface are drawn without a complaint from three.js', async ({ page }) => {
  test.setTimeout(300_000);
  const said = watchConsole(page);
  const account = await confirmedAccount('console', 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  for (const demo of DEMO_GROOMS) {
    await page.goto(`/studio/practice/${demo.id}`);
    await waitForField(page);
    await openPanel(page, 'Guides');
    await expect(page.getByTestId('guide-status')).toContainText(/guides over/, { timeout: 90_000 });
    expect(said, demo.id).toEqual([]);
  }
  // A surface with a coordinate that is not a number: refused, and drawn with its bad vertex marked.
  await page.goto('/studio');
  const obj = 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv nan 1 0\nv 1 1 0\nf 1 2 3\nf 2 5 3\nf 3 5 4\n';
  await page.getByLabel('Surface file').setInputFiles({ name: 'holey.obj', mimeType: 'application/octet-stream', buffer: Buffer.from(obj) });
  await page.getByRole('button', { name: 'Upload and check' }).click();
  const rejected = page.getByTestId('surface-rejected');
  await expect(rejected).toBeVisible({ timeout: 60_000 });
  await expect(rejected).toContainText('not a number');
  await expect(rejected.getByTestId('problem-view').locator('canvas')).toBeVisible({ timeout: 30_000 });
  await expect(rejected.getByTestId('problem-view').locator('canvas')).toHaveJSProperty('isConnected', true);
  expect(said).toEqual([]);
});
