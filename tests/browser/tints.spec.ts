// A whole coat on the demo fox, as issue 16's browser check asks: two guide sets with different
// lengths (head and ears, the fox's own OBJ groups), a length map tinted with the brush (one undo
// takes the stroke back, a reload shows it again: autosaved), twin sides with one whorl that
// appears mirrored, and a USD export with each set its own prim — where the guides rooted in the
// tinted part are longer than the rest of their set, read back by three's USDA parser.
import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { readSurface } from '../../lib/field';
import { closeDb } from '../../lib/platform/db';
import { surfaceToObj } from '../../lib/groom/demo/obj';
import { foxHead } from '../../lib/groom/demo/surfaces';
import { decodeMap } from '../../lib/groom/place/maps';
import { buildNearestVertex } from '../../lib/groom/place/nearest-vertex';
import type { GroomSpec } from '../../lib/groom/spec/spec';
import { groomUploadedFox, openPanel, typeNumber, waitForField, waitForSaved } from './studio-helpers';

test.afterAll(closeDb);

const FOX_OBJ = Buffer.from(surfaceToObj(foxHead(), 'Bramble, for the tints test'));

test('a whole coat: two sets, a tinted length map (undo, reload), a mirrored whorl, both sets in the USD with longer guides where tinted', async ({ page }) => {
  test.setTimeout(480_000);
  const groomId = await groomUploadedFox(page, 'tints', FOX_OBJ, 'Tinted coat');

  // Two guide sets: the ears long (3 cm), the head (crown and muzzle) short (1 cm).
  await openPanel(page, 'Guides');
  await page.getByRole('button', { name: 'Add a guide set' }).click();
  const list = page.getByTestId('guide-set-list');
  const name = page.getByLabel('Set name');
  await name.fill('Ears');
  await name.press('Enter');
  await page.getByRole('checkbox', { name: 'ears' }).check();
  await typeNumber(page.getByLabel('Length', { exact: true }), 3);
  await list.getByRole('button', { name: 'Whole coat' }).click();
  await name.fill('Head');
  await name.press('Enter');
  await page.getByRole('checkbox', { name: 'crown' }).check();
  await page.getByRole('checkbox', { name: 'muzzle' }).check();
  await typeNumber(page.getByLabel('Length', { exact: true }), 1);
  await expect(list.getByRole('button')).toHaveText(['Head', 'Ears']);

  // A length map, tinted 3× with the brush across the fox's face (it faces us).
  const tints = page.getByTestId('tints-panel');
  await tints.getByLabel('Map for').selectOption('length');
  await tints.getByRole('button', { name: 'Add map' }).click();
  const lengthRow = tints.getByTestId('tint-list').getByRole('button', { name: /^length/ });
  await expect(lengthRow).toContainText('1× everywhere');
  await expect(page.getByRole('button', { name: 'Tint', exact: true })).toHaveAttribute('aria-pressed', 'true');
  await expect(tints.getByTestId('tint-legend')).toContainText('low: 0.25× or less');
  const brush = page.getByRole('group', { name: 'Brush options' });
  await typeNumber(brush.getByLabel('Factor (1× is no change)'), 3);
  await typeNumber(brush.getByLabel('Strength (0 – 1)'), 1);
  await brush.getByLabel('Edge').selectOption('hard');
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const box = (await stage.boundingBox())!;
  const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
  // Right of the middle: the brush's options card sits over the stage's upper left.
  await page.mouse.move(cx + 20, cy + 30);
  await page.mouse.down();
  for (let i = 1; i <= 16; i++) await page.mouse.move(cx + 20 + i * 5, cy + 30);
  await page.mouse.up();
  const undoButton = page.getByRole('button', { name: 'Undo' });
  await expect(undoButton).toHaveAttribute('title', 'Undo: Tint the length map (Ctrl+Z)');
  await expect(lengthRow).toContainText('1.00× – 3.00×');

  // One undo takes the whole stroke back; redo brings it again.
  await undoButton.click();
  await expect(lengthRow).toContainText('1× everywhere');
  await page.getByRole('button', { name: 'Redo' }).click();
  await expect(lengthRow).toContainText('1.00× – 3.00×');

  // Twin sides, and one whorl placed off the middle that appears on both sides.
  await openPanel(page, 'Features');
  const twin = page.getByRole('group', { name: 'Twin sides' });
  await twin.getByRole('checkbox').click();
  await expect(twin.getByRole('checkbox')).toBeChecked();
  // The switch shows on while the worker looks for the plane; the plane's line says it was found.
  await expect(twin.getByTestId('twin-plane')).toContainText('Mirror plane x = 0', { timeout: 60_000 });
  const whorls = page.getByTestId('feature-row').filter({ hasText: /^Whorl/ });
  const before = await whorls.count();
  await page.getByRole('button', { name: 'Whorl', exact: true }).click();
  await page.mouse.click(cx - 50, cy + 60);
  await expect(whorls).toHaveCount(before + 2);
  await expect(undoButton).toHaveAttribute('title', 'Undo: Add whorl on both sides (Ctrl+Z)');
  // The two whorls add +2 to a surface whose indices must sum to 2: a mirrored pair of saddles
  // (low on the sides of the head) keeps the field solvable, and the export growable.
  const saddles = page.getByTestId('feature-row').filter({ hasText: /^Saddle/ });
  const saddlesBefore = await saddles.count();
  await page.getByRole('button', { name: 'Saddle', exact: true }).click();
  await page.mouse.click(cx - 60, cy + 120);
  await expect(saddles).toHaveCount(saddlesBefore + 2);
  await expect(page.getByTestId('budget-remainder')).toHaveText('0');
  await waitForSaved(page);

  // Autosaved: after a reload the painted map is still there.
  await page.reload();
  await waitForField(page);
  await openPanel(page, 'Guides');
  await expect(page.getByTestId('tints-panel').getByTestId('tint-list').getByRole('button', { name: /^length/ })).toContainText('1.00× – 3.00×');

  // The saved map, decoded on the surface as the server reads it (the same reader, the same welded mesh).
  const saved = await page.evaluate(async (id) => (await (await fetch(`/api/studio/grooms/${id}`)).json()) as { data: { groom: { spec: GroomSpec } } }, groomId);
  const spec = saved.data.groom.spec;
  expect(spec.guideSets!.map((s) => s.name)).toEqual(['Head', 'Ears']);
  const mesh = readSurface(new Uint8Array(FOX_OBJ), 'bramble.obj').mesh;
  const factors = decodeMap(spec.maps!.find((m) => m.attribute === 'length')!, mesh);
  expect(factors.filter((f) => f === 3).length).toBeGreaterThan(5);

  await openPanel(page, 'Export');
  const download = page.waitForEvent('download', { timeout: 180_000 });
  await page.getByRole('button', { name: 'Export USD curves (.usda, BasisCurves, linear)' }).click();
  const text = readFileSync((await (await download).path())!).toString('utf8');
  // three/examples/jsm/loaders/usd/USDAParser.js: each set its own BasisCurves prim under /Groom/Guides.
  const { specsByPath } = new USDAParser().parseData(text);
  const at = (path: string, field: string) => specsByPath[`${path}.${field}`]?.fields.default;
  for (const set of ['Head', 'Ears']) {
    expect(specsByPath[`/Groom/Guides/${set}`].fields.typeName).toBe('BasisCurves');
    expect(at(`/Groom/Guides/${set}`, 'whorlwind:guideSet')).toBe(set);
  }
  // The head's guides rooted where the map is 3× against those where it is 1× (the guide's own
  // measured length, primvars:whorlwind:length; its root is its first point).
  const counts = at('/Groom/Guides/Head', 'curveVertexCounts') as number[];
  const points = at('/Groom/Guides/Head', 'points') as number[];
  const lengths = at('/Groom/Guides/Head', 'primvars:whorlwind:length') as number[];
  const nearest = buildNearestVertex(mesh.positions);
  const tinted: number[] = [], plain: number[] = [];
  let first = 0;
  counts.forEach((n, g) => {
    const factor = factors[nearest.find(points[3 * first], points[3 * first + 1], points[3 * first + 2]).vertex];
    if (factor === 3) tinted.push(lengths[g]);
    else if (factor === 1) plain.push(lengths[g]);
    first += n;
  });
  const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
  expect(tinted.length).toBeGreaterThan(0);
  expect(plain.length).toBeGreaterThan(10);
  // 3 cm against 1 cm (curl, lift and jitter move each guide a little; the ratio stays far from 1).
  expect(mean(tinted) / mean(plain)).toBeGreaterThan(1.8);
  const ears = at('/Groom/Guides/Ears', 'primvars:whorlwind:length') as number[];
  expect(mean(ears) / mean(plain)).toBeGreaterThan(2);
});
