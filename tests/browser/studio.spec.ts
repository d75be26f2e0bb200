// The studio as a groomer uses it: upload growth surfaces (one refused, with its reasons and its bad
// faces drawn), start a groom, place features through the side list and see the measured indices
// equal the placed ones, undo and redo, keep and bring back a version, export every format and read
// the files back, and a 3D view that really draws.
import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { validateBytes } from 'gltf-validator';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { closeDb } from '../../lib/platform/db';
import { surfaceToObj } from '../../lib/groom/demo/obj';
import { FOX, foxHead } from '../../lib/groom/demo/surfaces';
import { parseGroomSpecJson } from '../../lib/groom/spec/spec';
import { confirmedAccount, expectSignedInAs, signInThroughForm } from './helpers';
import { STAGE_BACKGROUND, openPanel, pixelStats, typeNumber, typePoint, waitForField, waitForSaved } from './studio-helpers';

test.afterAll(closeDb);

const round = (v: readonly number[]) => v.map((x) => Math.round(x * 1000) / 1000) as [number, number, number];
const FOX_MESH = foxHead();
const FOX_OBJ = Buffer.from(surfaceToObj(FOX_MESH, 'Bramble, for the studio test'));
const NOSE = round(FOX.at(FOX.muzzle));
const NAPE = round(FOX.at([0, -0.3, -1]));
const BROW = round(FOX.at([0, 0.45, 0.9]));
const PARTING = [round(FOX.at([0.75, 0.35, 0.2])), round(FOX.at([0.8, 0, -0.35]))];

async function groomerSignedIn(page: Page, label: string) {
  const account = await confirmedAccount(label, 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expectSignedInAs(page, account.displayName);
  return account;
}

async function uploadSurface(page: Page, fileName: string, buffer: Buffer) {
  await page.getByLabel('Surface file').setInputFiles({ name: fileName, mimeType: 'application/octet-stream', buffer });
  await page.getByRole('button', { name: 'Upload and check' }).click();
}

test('growth surfaces: an upload with progress and the limit shown; a refused file with its reasons and bad faces drawn', async ({ page }) => {
  test.setTimeout(180_000);
  await groomerSignedIn(page, 'surfaces');
  await page.goto('/studio');
  await expect(page.getByRole('heading', { name: 'Studio', level: 1 })).toBeVisible();
  await expect(page.getByTestId('upload-limit')).toContainText('up to 200 MB');

  // A file over nothing: field-level messages before anything is sent.
  await page.getByRole('button', { name: 'Upload and check' }).click();
  await expect(page.locator('[data-field-error="file"]')).toHaveText('Choose the surface file to upload.');
  await page.getByLabel('Surface file').setInputFiles({ name: 'notes.txt', mimeType: 'text/plain', buffer: Buffer.from('hello') });
  await expect(page.locator('[data-field-error="file"]')).toContainText('Upload an OBJ, PLY, STL, glTF or GLB file');

  await page.getByLabel('Surface file').setInputFiles({ name: 'bramble-head.obj', mimeType: 'application/octet-stream', buffer: FOX_OBJ });
  await expect(page.getByLabel('Name', { exact: true })).toHaveValue('bramble head');
  await page.getByRole('button', { name: 'Upload and check' }).click();
  await expect(page.getByRole('main').getByRole('status').filter({ hasText: 'bramble head is ready' })).toBeVisible({ timeout: 60_000 });
  const card = page.getByTestId('surface-card').filter({ hasText: 'bramble head' });
  await expect(card).toContainText(`${(FOX_MESH.triangles.length / 3).toLocaleString('en-GB')} faces`);
  await expect(card).toContainText('genus 0');
  await expect(card).toContainText('χ = 2');

  await uploadSurface(page, 'misoriented-strip.obj', readFileSync('tests/fixtures/surfaces/misoriented-strip.obj'));
  const rejected = page.getByTestId('surface-rejected');
  await expect(rejected).toBeVisible({ timeout: 60_000 });
  await expect(rejected.getByRole('heading')).toHaveText('misoriented-strip.obj cannot be a growth surface yet');
  await expect(rejected.getByTestId('surface-problem').first()).toContainText('Must be fixed');
  await expect(rejected).toContainText(/orient/i);
  await expect(rejected).toContainText('First ones: edges between vertices');
  // …in the file's own numbering: an OBJ counts its vertices from 1.
  await expect(rejected).toContainText('(as the file numbers them, counting from 1)');
  // The file is drawn from the browser's own reading of it, the bad edges marked.
  const view = rejected.getByTestId('problem-view');
  await expect(view.locator('canvas')).toBeVisible({ timeout: 30_000 });
  // The canvas appears before its first frame is drawn: wait until the mesh is on it (no fixed
  // pause, which would be too short on a slow machine and waste time on a fast one).
  await expect
    .poll(async () => (await pixelStats(await view.screenshot(), STAGE_BACKGROUND)).differingShare, { timeout: 30_000, message: 'the refused surface is drawn' })
    .toBeGreaterThan(0.01);
  // The list keeps the refused surface with its reason (checked by a job), and offers no groom on it.
  const refusedCard = page.getByTestId('surface-card').filter({ hasText: 'misoriented' });
  await expect(refusedCard.getByTestId('surface-refused')).toContainText(/^Refused: .*faces that face opposite ways/);
  await expect(refusedCard.getByRole('button', { name: /Start a groom/ })).toHaveCount(0);
});

test('grooms: start one on a surface, rename, duplicate and delete it with a confirmation', async ({ page }) => {
  test.setTimeout(120_000);
  await groomerSignedIn(page, 'grooms');
  await page.goto('/studio');
  await uploadSurface(page, 'ring.obj', FOX_OBJ);
  await expect(page.getByText('ring is ready')).toBeVisible({ timeout: 60_000 });

  await page.getByRole('button', { name: 'Start a groom on ring' }).click();
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page.locator('[data-field-error="name"]')).toHaveText('Give the groom a name.');
  await page.getByLabel('Name of the new groom on ring').fill('Winter coat');
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await expect(page.getByRole('heading', { name: 'Winter coat', level: 1 })).toBeVisible();

  const groomUrl = page.url();

  // Someone else's groom, or no groom at all, is not found.
  const other = await page.context().browser()!.newContext();
  const stranger = await other.newPage();
  await groomerSignedIn(stranger, 'stranger');
  expect((await stranger.goto(groomUrl))?.status()).toBe(404);
  expect((await stranger.goto('/studio/grooms/not-a-groom'))?.status()).toBe(404);
  await other.close();

  await page.goto('/studio');
  const cards = page.getByTestId('groom-card');
  await expect(cards).toHaveCount(1);
  await expect(cards.first()).toContainText('on ring');
  await expect(cards.first()).toContainText(/Edited (just now|\d+ minutes? ago) · revision \d+/);

  await page.getByRole('button', { name: 'Rename Winter coat' }).click();
  await page.getByLabel('New name').fill('Winter coat, long');
  await page.getByRole('button', { name: 'Rename', exact: true }).click();
  await expect(page.getByRole('link', { name: 'Winter coat, long', exact: true })).toBeVisible();

  await page.getByRole('button', { name: 'Duplicate Winter coat, long' }).click();
  await expect(cards).toHaveCount(2);

  await page.getByRole('button', { name: 'Delete Winter coat, long' }).first().click();
  const dialog = page.getByRole('dialog');
  await expect(dialog).toContainText('go with it');
  await dialog.getByRole('button', { name: 'Keep it as it is' }).click();
  await expect(cards).toHaveCount(2);
  await page.getByRole('button', { name: 'Delete Winter coat, long' }).first().click();
  await page.getByRole('dialog').getByRole('button', { name: 'Delete the groom' }).click();
  await expect(cards).toHaveCount(1);

  // A surface grooms grow on cannot go.
  await page.getByRole('button', { name: 'Delete ring' }).click();
  await page.getByRole('dialog').getByRole('button', { name: 'Delete the surface' }).click();
  await expect(page.getByRole('main').getByRole('alert')).toContainText('still used by grooms');
});

test('the editor: features through the side list, measured indices equal the placed ones, undo/redo, versions, every export', async ({ page }) => {
  test.setTimeout(420_000);
  await groomerSignedIn(page, 'editor');
  await page.goto('/studio');
  await uploadSurface(page, 'bramble.obj', FOX_OBJ);
  await expect(page.getByText('bramble is ready')).toBeVisible({ timeout: 60_000 });
  await page.getByRole('button', { name: 'Start a groom on bramble' }).click();
  await page.getByLabel('Name of the new groom on bramble').fill('Autumn coat');
  await page.getByRole('button', { name: 'Start grooming' }).click();
  await expect(page).toHaveURL(/\/studio\/grooms\/[0-9a-f-]+$/);
  await waitForField(page);

  // A screenshot of the stage: the surface and field really drawn (pixels, not colour names).
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const stats = await pixelStats(await stage.screenshot(), STAGE_BACKGROUND);
  expect(stats.differingShare).toBeGreaterThan(0.1);
  expect(stats.colours).toBeGreaterThan(20);

  // Start from nothing, then place two whorls, a saddle and a parting by typing their places.
  const rows = page.getByTestId('feature-row');
  while ((await rows.count()) > 0) await rows.first().getByRole('button', { name: /^Delete / }).click();

  await page.getByRole('button', { name: 'Add whorl' }).click();
  await typePoint(page.getByRole('group', { name: 'Whorl 1', exact: true }), NOSE);
  await page.getByRole('button', { name: 'Add whorl' }).click();
  await typePoint(page.getByRole('group', { name: 'Whorl 2', exact: true }), NAPE);
  await page.getByRole('button', { name: 'Add saddle' }).click();
  await typePoint(page.getByRole('group', { name: 'Saddle 1', exact: true }), BROW);
  await page.getByRole('button', { name: 'Add parting' }).click();
  const parting = page.getByRole('group', { name: 'Parting 1', exact: true });
  await typePoint(parting, PARTING[0], 'Point 1');
  await typePoint(parting, PARTING[1], 'Point 2');

  const budget = page.getByTestId('index-budget');
  await expect(budget.getByTestId('budget-demanded')).toHaveText('+2');
  await expect(budget.getByTestId('budget-placed')).toHaveText('+2');
  await expect(budget.getByTestId('budget-remainder')).toHaveText('0');
  const proof = page.getByTestId('index-proof');
  await expect(proof).toContainText('3 singularities found, each exactly where one was placed; none elsewhere', { timeout: 30_000 });
  await expect(proof.getByTestId('edge-proof')).toContainText(/No seam: [\d,]+ edges checked, the largest turn between neighbouring faces [\d.]+°[.;]/);
  await expect(rows.filter({ hasText: 'Whorl 1' })).toContainText('index +1 · measured +1');
  await expect(rows.filter({ hasText: 'Whorl 2' })).toContainText('index +1 · measured +1');
  await expect(rows.filter({ hasText: 'Saddle 1' })).toContainText('index −1 · measured −1');
  await page.getByRole('group', { name: 'Saddle 1', exact: true }).getByRole('button', { name: 'Saddle 1', exact: false }).first().click();
  await expect(page.getByTestId('singularity-check')).toContainText(/Asked −1 at vertex \d+ · measured −1 ✓/);

  // Undo and redo: an extra whorl unbalances the budget; undo takes it back, redo brings it again.
  await page.getByRole('button', { name: 'Add whorl' }).click();
  await expect(budget.getByTestId('budget-remainder')).toHaveText('−1');
  await expect(page.getByTestId('field-error')).toContainText('indices placed on the surface sum to 3');
  await expect(page.getByTestId('stale-field')).toContainText('the last ones that could be solved');
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(budget.getByTestId('budget-remainder')).toHaveText('0');
  await expect(rows.filter({ hasText: 'Whorl 3' })).toHaveCount(0);
  await page.getByRole('button', { name: 'Redo' }).click();
  await expect(rows.filter({ hasText: 'Whorl 3' })).toHaveCount(1);
  await page.locator('body').press('Control+z');
  await expect(rows.filter({ hasText: 'Whorl 3' })).toHaveCount(0);
  await expect(proof).toContainText('3 singularities found', { timeout: 30_000 });
  await waitForSaved(page);

  // A named version, a change, and the version brought back.
  await openPanel(page, 'Versions');
  await page.getByRole('button', { name: 'Keep version' }).click();
  await expect(page.locator('[data-field-error="name"]')).toContainText('Give the version a name');
  await page.getByLabel('Keep the groom as it is now, under a name').fill('three placed, one parting');
  await page.getByRole('button', { name: 'Keep version' }).click();
  await expect(page.getByRole('main').getByRole('status').filter({ hasText: /Kept as version \d+/ })).toBeVisible();
  const versionRow = page.getByTestId('version-row').filter({ hasText: 'three placed, one parting' });
  await expect(versionRow).toBeVisible();

  await openPanel(page, 'Features');
  await page.getByRole('button', { name: 'Delete Parting 1' }).click();
  await expect(budget.getByTestId('budget-placed')).toHaveText('+1');
  await waitForSaved(page);
  await openPanel(page, 'Versions');
  await versionRow.getByRole('button', { name: /Bring back version/ }).click();
  await page.getByRole('dialog').getByRole('button', { name: 'Bring it back' }).click();
  await expect(page.getByRole('main').getByRole('status').filter({ hasText: /is the groom again/ })).toBeVisible();
  await expect(budget.getByTestId('budget-placed')).toHaveText('+2');
  await expect(proof).toContainText('3 singularities found, each exactly where one was placed', { timeout: 30_000 });
  await openPanel(page, 'Features');
  await expect(rows.filter({ hasText: 'Parting 1' })).toHaveCount(1);
  await waitForSaved(page);

  // Every export: made on the server, followed to the end, downloaded and read back.
  await openPanel(page, 'Export');
  const files: Record<string, Buffer> = {};
  for (const [format, label] of [
    ['usda', 'USD curves (.usda, BasisCurves, linear)'],
    ['usda-bspline', 'USD curves, smooth (.usda, BasisCurves, B-spline)'],
    ['gltf', 'glTF lines (.gltf, one file)'],
    ['glb', 'glTF lines, binary (.glb)'],
    ['obj', 'OBJ polylines (.obj)'],
    ['json', 'Groom spec (.json, every decision of the groom)'],
    ['ply', 'Field (.ply, the direction per face and vertex)'],
  ] as const) {
    const download = page.waitForEvent('download', { timeout: 120_000 });
    await page.getByRole('button', { name: `Export ${label}` }).click();
    const file = await download;
    files[format] = readFileSync((await file.path())!);
    // The newest export is brought into view of the panel, download link and all.
    await expect(page.getByTestId('export-job').first().getByTestId('export-download')).toBeInViewport();
  }
  // With the box ticked, the guides come with the growth surface they are bound to.
  await page.getByTestId('export-with-surface').check();
  const bound = page.waitForEvent('download', { timeout: 120_000 });
  await page.getByRole('button', { name: 'Export USD curves (.usda, BasisCurves, linear)' }).click();
  const boundText = readFileSync((await (await bound).path())!).toString('utf8');
  await expect(page.getByTestId('export-job').first()).toContainText('with the surface');
  const boundSpecs = new USDAParser().parseData(boundText).specsByPath;
  expect(boundSpecs['/Groom/Surface'].fields.typeName).toBe('Mesh');
  expect((boundSpecs['/Groom/Guides.primvars:whorlwind:rootFace'].fields.default as number[]).length).toBeGreaterThan(100);

  const spec = parseGroomSpecJson(files.json.toString('utf8'));
  expect(spec.field.singularities.map((s) => s.index)).toEqual([1, 1, -1]);
  expect(spec.field.partings).toHaveLength(1);
  // Each place says where it sits in the surface file's own numbering.
  expect(spec.field.singularities.every((s) => s.surface && s.surface.polygon >= 0)).toBe(true);
  for (const format of ['usda', 'usda-bspline'] as const) {
    const text = files[format].toString('utf8');
    expect(text.startsWith('#usda 1.0')).toBe(true);
    const { specsByPath } = new USDAParser().parseData(text);
    expect(specsByPath['/Groom/Guides'].fields.typeName).toBe('BasisCurves');
    const counts = specsByPath['/Groom/Guides.curveVertexCounts'].fields.default as number[];
    const points = specsByPath['/Groom/Guides.points'].fields.default as number[];
    expect(counts.length).toBeGreaterThan(100);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(points.length / 3);
    expect(specsByPath['/Groom/Guides.basis']?.fields.default ?? 'linear').toBe(format === 'usda' ? 'linear' : 'bspline');
  }
  for (const format of ['gltf', 'glb'] as const) {
    const report = await validateBytes(new Uint8Array(files[format]));
    expect(report.issues.numErrors, format).toBe(0);
  }
  const obj = new OBJLoader().parse(files.obj.toString('utf8'));
  expect(obj.children.length).toBeGreaterThan(0);
  const ply = new PLYLoader().parse(files.ply.buffer.slice(files.ply.byteOffset, files.ply.byteOffset + files.ply.byteLength) as ArrayBuffer);
  expect(ply.getAttribute('position').count).toBe(FOX_MESH.positions.length / 3);
});

test('placing with the pointer: a click with the whorl tool, a drag that moves it, one undo for the drag', async ({ page }) => {
  test.setTimeout(180_000);
  await page.goto('/studio/practice/bramble-fox-head');
  if (new URL(page.url()).pathname === '/signin') {
    await groomerSignedIn(page, 'pointer');
    await page.goto('/studio/practice/bramble-fox-head');
  }
  await waitForField(page);
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const box = (await stage.boundingBox())!;
  const rows = page.getByTestId('feature-row');
  const before = await rows.filter({ hasText: /^Whorl/ }).count();
  await page.getByRole('button', { name: 'Whorl', exact: true }).click();
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await expect(rows.filter({ hasText: /^Whorl/ })).toHaveCount(before + 1);
  await expect(page.getByTestId('budget-remainder')).toHaveText('−1');

  // Drag the new whorl (selected, at the middle of the view) somewhat to the side.
  await page.getByRole('button', { name: 'Turn & pick' }).click();
  const label = `Whorl ${before + 1}`;
  await page.getByRole('group', { name: label, exact: true }).getByRole('button', { name: 'Look at' }).click();
  const group = page.getByRole('group', { name: label, exact: true });
  const x0 = await group.getByLabel('x', { exact: true }).inputValue();
  const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
  await page.mouse.move(cx, cy - 4);
  await page.mouse.down();
  for (let i = 1; i <= 10; i++) await page.mouse.move(cx + i * 6, cy - 4 + i * 2);
  await page.mouse.up();
  await expect(group.getByLabel('x', { exact: true })).not.toHaveValue(x0);
  await expect(page.getByRole('button', { name: 'Undo' })).toHaveAttribute('title', `Undo: Move ${label.toLowerCase()} (Ctrl+Z)`);
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(group.getByLabel('x', { exact: true })).toHaveValue(x0);

  // Twist and turn, changed on the card beside the marker, show in the side list too.
  const card = page.getByRole('group', { name: `${label} on the surface` });
  await card.getByLabel('Twist chosen by the solve').uncheck();
  await card.getByRole('button', { name: 'clockwise', exact: true }).click();
  await expect(group.getByLabel('Twist', { exact: true })).toHaveValue('0');
  await expect(group.getByLabel('Turn (seen from outside)')).toHaveValue('clockwise');
  await expect(page.getByTestId('save-status')).toHaveText('Practice groom — nothing is saved');
});

test('drawing with the pointer: a parting from clicked points, a flow stroke by dragging, a pin by a click', async ({ page }) => {
  test.setTimeout(180_000);
  await page.goto('/studio/practice/bramble-fox-head');
  if (new URL(page.url()).pathname === '/signin') {
    await groomerSignedIn(page, 'drawing');
    await page.goto('/studio/practice/bramble-fox-head');
  }
  await waitForField(page);
  const stage = page.getByRole('img', { name: /The growth surface with the field/ });
  const box = (await stage.boundingBox())!;
  const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
  const rows = page.getByTestId('feature-row');
  const count = (kind: RegExp) => rows.filter({ hasText: kind }).count();

  // A parting: three clicked points, joined along the mesh, finished with Enter. (The view looks
  // at the back of the head: the clicks also check that markers behind the surface stay unpicked.)
  const partings = await count(/^Parting/);
  await page.getByRole('button', { name: 'Parting', exact: true }).click();
  const options = page.getByRole('group', { name: 'Tool options' });
  for (const [dx, dy] of [[-50, 60], [0, 70], [50, 60]]) await page.mouse.click(cx + dx, cy + dy);
  await expect(options).toContainText('3 points so far.');
  await page.locator('body').press('Enter');
  await expect(rows.filter({ hasText: /^Parting/ })).toHaveCount(partings + 1);
  const parting = page.getByRole('group', { name: `Parting ${partings + 1}`, exact: true });
  // The side list holds the clicked points, editable as numbers.
  await expect(parting.getByLabel('Point 3 x', { exact: true })).toBeVisible();
  // An open parting flips the field across it, so its two ends count +½ each: the budget shows −1
  // left over, and one action puts it where the groomer clicks (low on the side of the head).
  await expect(page.getByTestId('budget-remainder')).toHaveText('−1');
  await page.getByRole('button', { name: 'Put −1 where I click' }).click();
  await page.mouse.click(cx - 60, cy + 120);
  await expect(page.getByTestId('budget-remainder')).toHaveText('0');

  // A flow stroke: one drag across the surface.
  const strokes = await count(/^Flow stroke/);
  await page.getByRole('button', { name: 'Flow stroke', exact: true }).click();
  await page.mouse.move(cx - 70, cy - 50);
  await page.mouse.down();
  for (let i = 1; i <= 14; i++) await page.mouse.move(cx - 70 + i * 10, cy - 50);
  await page.mouse.up();
  await expect(rows.filter({ hasText: /^Flow stroke/ })).toHaveCount(strokes + 1);

  // A pin: a click with the pin tool pins the chosen attribute at the chosen factor.
  const pins = await count(/^Length pin/);
  await page.getByRole('button', { name: 'Pin', exact: true }).click();
  await typeNumber(options.getByLabel('Factor on the global value'), 2.5);
  await page.mouse.click(cx + 20, cy - 20);
  await expect(rows.filter({ hasText: /^Length pin/ })).toHaveCount(pins + 1);
  await expect(page.getByRole('group', { name: `Length pin ${pins + 1}`, exact: true }).getByLabel('Factor', { exact: false }).first()).toHaveValue('2.5');

  // The proof holds with the new curve, stroke and pin: singularities where placed, none elsewhere.
  await expect(page.getByTestId('index-proof')).toContainText('each exactly where one was placed; none elsewhere', { timeout: 30_000 });
  await expect(page.getByTestId('edge-proof')).toContainText(/turns round partings and crests as drawn/);
  await expect(page.getByTestId('field-error')).toHaveCount(0);
});
