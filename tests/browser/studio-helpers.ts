// Steps the studio's browser tests (and the studio benchmark) share.
import { expect, type Locator, type Page } from '@playwright/test';
import sharp from 'sharp';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';

/** Types a number into a field of the side list and applies it (Enter), as a groomer would. */
export async function typeNumber(field: Locator, value: number) {
  await field.fill(String(value));
  await field.press('Enter');
}

export async function typePoint(group: Locator, point: readonly number[], prefix = '') {
  const label = (axis: string) => (prefix ? `${prefix} ${axis}` : axis);
  for (const [k, axis] of ['x', 'y', 'z'].entries()) await typeNumber(group.getByLabel(label(axis), { exact: true }), point[k]);
}

export async function openPanel(page: Page, name: 'Features' | 'Guides' | 'Field & view' | 'Versions' | 'Export') {
  await page.getByRole('tab', { name }).click();
  await expect(page.getByRole('tab', { name })).toHaveAttribute('aria-selected', 'true');
}

/**
 * Opens the practice fox in the editor (signing in as a new groomer, named by `label`, when the
 * page asks for it) and waits for its first field.
 */
export async function openPracticeFox(page: Page, label: string) {
  await page.goto('/studio/practice/bramble-fox-head');
  if (new URL(page.url()).pathname === '/signin') {
    const account = await confirmedAccount(label, 'groomer', 'a-proper-coat-42');
    await signInThroughForm(page, account.email, account.password);
    await expectSignedInAs(page, account.displayName);
    await page.goto('/studio/practice/bramble-fox-head');
  }
  await waitForField(page);
}

/**
 * Signs in a new groomer (named by `label`), uploads `obj` as bramble.obj, starts a groom named
 * `groomName` on it, waits for its first field and gives back the groom's id.
 */
export async function groomUploadedFox(page: Page, label: string, obj: Buffer, groomName: string): Promise<string> {
  const account = await confirmedAccount(label, 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  await page.goto('/studio');
  await page.getByLabel('Surface file').setInputFiles({ name: 'bramble.obj', mimeType: 'application/octet-stream', buffer: obj });
  await page.getByRole('button', { name: 'Upload and check' }).click();
  await expect(page.getByText('bramble is ready')).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a groom on bramble' }).click();
  await page.getByLabel('Name of the new groom on bramble').fill(groomName);
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await waitForField(page);
  return new URL(page.url()).pathname.split('/').pop()!;
}

/** Waits until the editor has opened its surface and drawn a field. */
export async function waitForField(page: Page, timeout = 90_000) {
  await expect(page.getByTestId('opening-progress')).toHaveCount(0, { timeout });
  await page.waitForFunction(() => performance.getEntriesByName('whorlwind:first-field').length > 0, undefined, { timeout });
}

export async function waitForSaved(page: Page) {
  await expect(page.getByTestId('save-status')).toHaveAttribute('data-state', 'saved', { timeout: 30_000 });
}

/**
 * What a screenshot of an element holds: the share of pixels that differ clearly from `background`,
 * and how many different colours (rounded to 4 bits per channel) appear.
 */
export async function pixelStats(png: Buffer, background: [number, number, number]) {
  const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
  let differing = 0;
  const colours = new Set<number>();
  const pixels = info.width * info.height;
  for (let i = 0; i < pixels; i++) {
    const r = data[3 * i], g = data[3 * i + 1], b = data[3 * i + 2];
    if (Math.abs(r - background[0]) + Math.abs(g - background[1]) + Math.abs(b - background[2]) > 40) differing++;
    colours.add(((r >> 4) << 8) | ((g >> 4) << 4) | (b >> 4));
  }
  return { differingShare: differing / pixels, colours: colours.size };
}

/** The stage's background (#173236), from components/studio/scene/Stage.tsx. */
export const STAGE_BACKGROUND: [number, number, number] = [0x17, 0x32, 0x36];
