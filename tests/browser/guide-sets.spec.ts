// Guide sets in the studio: two sets with different lengths on the demo fox (crown and ears, the
// fox's own OBJ groups), each listed and drawn in its own colours, the ears gathered into tufts
// and given a tip width in the settings form, saved, and exported as USD with each set its own
// curve prim and per-guide tuft numbers and widths, read back by three's USDA parser.
import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { closeDb } from '../../lib/platform/db';
import { surfaceToObj } from '../../lib/groom/demo/obj';
import { foxHead } from '../../lib/groom/demo/surfaces';
import { groomUploadedFox, openPanel, typeNumber, waitForSaved } from './studio-helpers';

test.afterAll(closeDb);

const FOX_OBJ = Buffer.from(surfaceToObj(foxHead(), 'Bramble, for the guide sets test'));

test('guide sets: two sets with different lengths on the fox (crown and ears), each its own prim in the USD', async ({ page }) => {
  test.setTimeout(360_000);
  await groomUploadedFox(page, 'guide-sets', FOX_OBJ, 'Two coats');

  await openPanel(page, 'Guides');
  const show = page.getByLabel('Show the guides on the surface');
  if (!(await show.isChecked())) await show.check();
  await page.getByRole('button', { name: 'Add a guide set' }).click();
  const list = page.getByTestId('guide-set-list');
  await expect(list.getByRole('button')).toHaveText(['Whole coat', 'Set 2']);
  await expect(list.getByRole('button', { name: 'Set 2' })).toHaveAttribute('aria-pressed', 'true');

  // The new set: the ears, long.
  const name = page.getByLabel('Set name');
  await name.fill('Ears');
  await name.press('Enter');
  await page.getByRole('checkbox', { name: 'ears' }).check();
  await typeNumber(page.getByLabel('Length', { exact: true }), 3);
  await expect(page.getByRole('button', { name: 'Undo' })).toHaveAttribute('title', /guide set “Ears”/);
  // The ears' coat shaped in the form: gathered into tufts, and a tip width of its own.
  await page.locator('summary', { hasText: 'Tufts' }).click();
  await page.getByLabel('Gather the guides into tufts').check();
  await typeNumber(page.getByLabel('Tufts per cm²', { exact: true }), 0.5);
  await page.locator('summary', { hasText: 'Width' }).click();
  await typeNumber(page.getByLabel('Tip width', { exact: true }), 0.004);
  await expect(page.getByRole('button', { name: 'Undo' })).toHaveAttribute('title', /guide set “Ears”/);

  // The first set: the crown, short.
  await list.getByRole('button', { name: 'Whole coat' }).click();
  await name.fill('Crown');
  await name.press('Enter');
  await page.getByRole('checkbox', { name: 'crown' }).check();
  await typeNumber(page.getByLabel('Length', { exact: true }), 0.5);
  await expect(list.getByRole('button')).toHaveText(['Crown', 'Ears']);
  await expect(page.getByTestId('guide-status')).toContainText(/Crown: \d[\d,]*, Ears: \d[\d,]*\)$/, { timeout: 120_000 });
  await waitForSaved(page);

  await openPanel(page, 'Export');
  const download = page.waitForEvent('download', { timeout: 180_000 });
  await page.getByRole('button', { name: 'Export USD curves (.usda, BasisCurves, linear)' }).click();
  const text = readFileSync((await (await download).path())!).toString('utf8');
  // three/examples/jsm/loaders/usd/USDAParser.js: each set a BasisCurves prim under /Groom/Guides.
  const { specsByPath } = new USDAParser().parseData(text);
  expect(specsByPath['/Groom/Guides'].fields.typeName).toBe('Scope');
  const meanLength = (set: string) => {
    expect(specsByPath[`/Groom/Guides/${set}`].fields.typeName).toBe('BasisCurves');
    expect(specsByPath[`/Groom/Guides/${set}.whorlwind:guideSet`].fields.default).toBe(set);
    const lengths = specsByPath[`/Groom/Guides/${set}.primvars:whorlwind:length`].fields.default as number[];
    expect(lengths.length).toBeGreaterThan(10);
    return lengths.reduce((s, x) => s + x, 0) / lengths.length;
  };
  const crown = meanLength('Crown'), ears = meanLength('Ears');
  // Lengths 0.5 and 3 (jitter and curl move each guide a little; the ratio stays far from 1).
  expect(ears / crown).toBeGreaterThan(2.5);
  // The tufts set in the form: every ear guide drawn into a tuft (no loners), no crown guide in one;
  // the ears' tip width as typed (no width pins or maps on this groom), the crown's the default taper.
  const perGuide = (set: string, name: string) => specsByPath[`/Groom/Guides/${set}.primvars:whorlwind:${name}`].fields.default as number[];
  expect(perGuide('Ears', 'tuft').every((t) => t >= 0)).toBe(true);
  expect(new Set(perGuide('Ears', 'tuft')).size).toBeGreaterThan(1);
  expect(perGuide('Crown', 'tuft').every((t) => t === -1)).toBe(true);
  expect(perGuide('Ears', 'tipWidth').every((w) => Math.abs(w - 0.004) < 1e-5)).toBe(true);
  expect(perGuide('Crown', 'tipWidth').every((w) => Math.abs(w - 0.004) > 1e-4)).toBe(true);
});
