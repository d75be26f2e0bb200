// The security headers of next.config.ts, and that the app works under its Content-Security-Policy:
// every page visited here records the browser's CSP violation reports (the
// `securitypolicyviolation` event of CSP Level 3) and its console's "Refused to …" lines, and
// none may appear. The studio and market suites exercise the field worker and the guide preview
// under the same headers.
import { expect, test, type Page } from '@playwright/test';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { expectSignedInAs, signInThroughForm } from './helpers';
import { waitForField } from './studio-helpers';

function watchPolicy(page: Page): string[] {
  const refused: string[] = [];
  page.on('console', (message) => {
    if (/Content Security Policy|Refused to/.test(message.text())) refused.push(message.text());
  });
  void page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => {
      console.error(`Refused to load ${event.blockedURI} (Content Security Policy: ${event.violatedDirective})`);
    });
  });
  return refused;
}

test('every answer carries the security headers', async ({ page }) => {
  for (const path of ['/', '/market', '/api/health']) {
    const response = await page.request.get(path);
    const headers = response.headers();
    expect(headers['content-security-policy'], path).toMatch(/frame-ancestors 'none'/);
    expect(headers['content-security-policy'], path).not.toMatch(/unsafe-eval/);
    expect(headers['x-frame-options'], path).toBe('DENY');
    expect(headers['x-content-type-options'], path).toBe('nosniff');
    expect(headers['referrer-policy'], path).toBe('strict-origin-when-cross-origin');
    expect(headers['permissions-policy'], path).toContain('camera=()');
  }
});

test('the market, a listing with its guide preview and the editor with its field worker break no rule of the policy', async ({ page }) => {
  // Room for the job workers to make the demo's pictures and previews, and for the editor's first field.
  test.setTimeout(240_000);
  const refused = watchPolicy(page);
  await page.goto('/');
  // The demo's listing pictures and previews are made by the job workers when the app first serves
  // the market; look again until they are there.
  const pictures = page.getByRole('main').locator('img');
  const broken = () =>
    pictures.evaluateAll((images) => images.filter((image) => (image as HTMLImageElement).complete && (image as HTMLImageElement).naturalWidth === 0).length);
  // Only the demo's own listing: listings other tests made point at pictures they never stored.
  await expect(async () => {
    await page.goto('/market?q=autumn');
    await expect(pictures.first()).toBeVisible({ timeout: 2_000 });
    await expect(pictures.first()).toHaveJSProperty('complete', true, { timeout: 5_000 });
  }).toPass({ timeout: 90_000 });
  // Pictures come from the object store: a picture the policy blocked has no natural width.
  await expect.poll(broken).toBe(0);
  // A listing whose picture is there: the tile's title is its link.
  await page.getByTestId('listing-tile').filter({ has: page.locator('img') }).first().getByRole('heading').getByRole('link').click();
  // The title link navigates on the client: be on the listing's page before reloading it.
  await page.waitForURL(/\/market\/[0-9a-f-]{36}$/);
  const preview = page.getByTestId('guide-preview');
  await expect(async () => {
    await page.reload();
    await expect(preview).toHaveAttribute('data-preview-state', 'ready', { timeout: 10_000 });
  }).toPass({ timeout: 90_000 });
  await expect.poll(broken).toBe(0);

  const groomer = DEMO_ACCOUNTS.find((account) => account.roles.includes('groomer'))!;
  await signInThroughForm(page, groomer.email, groomer.password);
  await expectSignedInAs(page, groomer.displayName);
  await page.goto('/studio/practice/bramble-fox-head');
  await waitForField(page);
  expect(refused).toEqual([]);
});
