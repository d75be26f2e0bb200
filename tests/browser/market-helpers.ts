// Steps the market's browser tests share: a signed-in person's own browser context, the JSON of
// an API answer, and a growth surface with a groom and a saved version made through the studio's routes.
import { expect, type Browser, type Page } from '@playwright/test';
import { DEMO_GROOMS, surfaceToObj } from '../../lib/groom/demo';
import { expectSignedInAs, signInThroughForm } from './helpers';

export async function personPage(browser: Browser, email: string, password: string, displayName: string): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signInThroughForm(page, email, password);
  await expectSignedInAs(page, displayName);
  return page;
}

export async function apiJson<T>(response: { status(): number; text(): Promise<string> }, status: number): Promise<T> {
  const text = await response.text();
  expect(response.status(), text).toBe(status);
  return (JSON.parse(text) as { data: T }).data;
}

/** A growth surface, a groom on it and a saved version, through the studio's routes. */
export async function groomWithSavedVersion(page: Page, name: string) {
  const ring = DEMO_GROOMS.find((groom) => groom.id === 'loop-plush-ring')!;
  const obj = new TextEncoder().encode(surfaceToObj(ring.surface(), 'Loop, a plush ring'));
  const ticket = await apiJson<{ uploadId: string; url: string }>(
    await page.request.post('/api/studio/uploads', { data: { fileName: 'loop.obj', byteSize: obj.byteLength } }),
    201,
  );
  const put = await page.request.put(ticket.url, { data: Buffer.from(obj) });
  expect(put.ok()).toBe(true);
  // Registering answers at once; a job worker checks the file, and a groom starts on a ready surface.
  const { surface } = await apiJson<{ surface: { id: string } }>(
    await page.request.post('/api/studio/surfaces', { data: { uploadId: ticket.uploadId, name: 'Loop ring', units: 'cm' } }),
    202,
  );
  await expect
    .poll(async () => (await apiJson<{ surface: { state: string } }>(await page.request.get(`/api/studio/surfaces/${surface.id}`), 200)).surface.state, {
      timeout: 60_000,
      message: 'the surface is checked',
    })
    .toBe('ready');
  const { groom } = await apiJson<{ groom: { id: string } }>(
    await page.request.post('/api/studio/grooms', { data: { surfaceId: surface.id, name } }),
    201,
  );
  await apiJson(await page.request.post(`/api/studio/grooms/${groom.id}/versions`, { data: { name: 'first pass' } }), 201);
  return groom.id;
}
