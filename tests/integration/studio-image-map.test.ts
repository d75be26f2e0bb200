// A painted map read from an image through a surface's UVs, by the studio's route handler against
// the real PostgreSQL and the S3 stand-in: the surface is uploaded and checked as any other, the
// image is made by sharp here, and the answered map is decoded on the same surface read locally.
import { callRoute, createSurface, expectJson, studioCast, withinRequest, type TestAccount } from './studio-helpers';
import { NextRequest } from 'next/server';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readSurface } from '@/lib/field';
import { decodeMap } from '@/lib/groom/place/maps';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import { closeDb } from '@/lib/platform/db';
import type { ImageMapResponse } from '@/lib/studio/types';
import { MAP_IMAGE_BODY_LIMIT } from '@/lib/studio/validation';
import { JSON_BODY_LIMIT } from '@/lib/http/server';
import * as imageMapRoute from '@/app/api/studio/surfaces/[surfaceId]/image-map/route';

afterAll(closeDb);

/** Pixels (and grid vertices) per side. */
const N = 9;
/** The 8-bit grey value of pixel column x, row y (row 0 at the top): every pixel its own. */
const PIXEL = (x: number, y: number) => 3 * (N * y + x) + 5;

/**
 * A flat 10 cm square of N × N vertices as OBJ, vertex (i, j) at (10i/(N−1), 10j/(N−1), 0) with UV
 * ((i + ½)/N, (j + ½)/N): the centre of pixel column i, row N − 1 − j (OBJ's v rises upward, an
 * image's rows run downward: the Wavefront convention lib/field's reader keeps).
 */
function gridObj(): string {
  const lines = ['# image map test grid'];
  for (let j = 0; j < N; j++) for (let i = 0; i < N; i++) lines.push(`v ${(10 * i) / (N - 1)} ${(10 * j) / (N - 1)} 0`);
  for (let j = 0; j < N; j++) for (let i = 0; i < N; i++) lines.push(`vt ${(i + 0.5) / N} ${(j + 0.5) / N}`);
  const at = (i: number, j: number) => `${j * N + i + 1}/${j * N + i + 1}`;
  for (let j = 0; j < N - 1; j++) for (let i = 0; i < N - 1; i++) lines.push(`f ${at(i, j)} ${at(i + 1, j)} ${at(i + 1, j + 1)} ${at(i, j + 1)}`);
  return `${lines.join('\n')}\n`;
}

const gridBytes = new TextEncoder().encode(gridObj());
let owner: TestAccount;
let rival: TestAccount;
let gridId: string;
let ringId: string;

beforeAll(async () => {
  ({ owner, rival } = await studioCast('image-map'));
  gridId = (await createSurface(owner, 'uv-grid.obj', gridBytes, 'UV grid')).id;
  const ring = DEMO_GROOMS.find((g) => g.id === 'loop-plush-ring')!;
  ringId = (await createSurface(owner, 'ring.obj', new TextEncoder().encode(surfaceToObj(ring.surface(), 'ring')), 'Ring without UVs')).id;
});

const post = (account: TestAccount, surfaceId: string, body: unknown) =>
  callRoute(imageMapRoute, 'POST', `/api/studio/surfaces/${surfaceId}/image-map`, { cookie: account.cookie, params: { surfaceId }, body });

describe('a map from an image', () => {
  it('reads an 8-bit PNG made by sharp through the UVs: at each vertex the pixel under its UV, scaled to [low, high], within half a 16-bit code', async () => {
    const raw = Uint8Array.from({ length: N * N }, (_x, k) => PIXEL(k % N, Math.floor(k / N)));
    const png = await sharp(raw, { raw: { width: N, height: N, channels: 1 } }).png().toBuffer();
    const { map } = (await expectJson<{ data: ImageMapResponse }>(await post(owner, gridId, { attribute: 'length', low: 0.5, high: 2.5, image: png.toString('base64') }), 200)).data;
    expect(map).toMatchObject({ attribute: 'length', bits: 16, low: 0.5, high: 2.5 });
    // The same file read here, as the editor and the grower read it.
    const { mesh } = readSurface(gridBytes, 'uv-grid.obj');
    const values = decodeMap(map, mesh);
    const step = 2 / 65535;
    for (let j = 0; j < N; j++) {
      for (let i = 0; i < N; i++) {
        const v = mesh.fileVertexToVertex![j * N + i];
        // Black is 0.5×, white 2.5× (the request's low and high); the pixel is column i, row N − 1 − j.
        expect(Math.abs(values[v] - (0.5 + (2 * PIXEL(i, N - 1 - j)) / 255))).toBeLessThanOrEqual(step / 2 + 1e-12);
      }
    }
    // It fits a spec on that surface as it is: the schema takes it, and it names the surface's counts.
    expect(map.vertices).toBe(N * N);
    expect(() => parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, maps: [map] })).not.toThrow();
  });

  it('reads a 16-bit PNG: a pixel of 65535 is the white factor exactly, 0 the black', async () => {
    const raw = Uint16Array.from({ length: N * N }, (_x, k) => (k % 2 === 0 ? 65535 : 0));
    const png = await sharp(raw, { raw: { width: N, height: N, channels: 1 } }).toColourspace('grey16').png().toBuffer();
    expect((await sharp(png).metadata()).depth).toBe('ushort');
    const { map } = (await expectJson<{ data: ImageMapResponse }>(await post(owner, gridId, { attribute: 'density', low: 1, high: 3, image: png.toString('base64') }), 200)).data;
    const { mesh } = readSurface(gridBytes, 'uv-grid.obj');
    const values = decodeMap(map, mesh);
    for (let j = 0; j < N; j++) {
      for (let i = 0; i < N; i++) {
        const k = (N - 1 - j) * N + i;
        expect(values[mesh.fileVertexToVertex![j * N + i]]).toBe(k % 2 === 0 ? 3 : 1);
      }
    }
  });

  it('refuses in words: a surface without UVs, bytes that are no image, a range upside down, another groomer’s surface', async () => {
    const png = (await sharp({ create: { width: 2, height: 2, channels: 3, background: { r: 90, g: 90, b: 90 } } }).png().toBuffer()).toString('base64');
    const noUvs = await expectJson(await post(owner, ringId, { attribute: 'length', image: png }), 422);
    expect(noUvs.error).toMatchObject({ code: 'map-refused' });
    expect(noUvs.error.message).toMatch(/has no UVs/);
    const notImage = await expectJson(await post(owner, gridId, { attribute: 'length', image: Buffer.from('not an image at all').toString('base64') }), 422);
    expect(notImage.error.message).toMatch(/cannot be read \(PNG or TIFF expected\)/);
    const upsideDown = await expectJson(await post(owner, gridId, { attribute: 'length', low: 2, high: 1, image: png }), 400);
    expect(upsideDown.error.fields).toMatchObject({ high: 'The white factor must not be below the black one.' });
    const unknown = await expectJson(await post(owner, gridId, { attribute: 'shine', image: png }), 400);
    expect(unknown.error.fields.attribute).toMatch(/^Choose what the map drives/);
    await expectJson(await post(rival, gridId, { attribute: 'length', image: png }), 404);
  });

  it('takes an image well past the 1 MB of other JSON bodies, and refuses a body past its own limit (413) without reading it', async () => {
    // A 1024² 8-bit PNG of noise hardly compresses: about 1 MB of image, 1.4 MB of base64.
    let state = 0x9e3779b9;
    const noise = Uint8Array.from({ length: 1024 * 1024 }, () => {
      // xorshift32 (Marsaglia 2003), a fixed seed: the same image every run
      state ^= state << 13;
      state ^= state >>> 17;
      state ^= state << 5;
      return state & 255;
    });
    const png = await sharp(noise, { raw: { width: 1024, height: 1024, channels: 1 } }).png().toBuffer();
    const image = png.toString('base64');
    expect(image.length).toBeGreaterThan(JSON_BODY_LIMIT);
    const { map } = (await expectJson<{ data: ImageMapResponse }>(await post(owner, gridId, { attribute: 'jitter', image }), 200)).data;
    expect(map.attribute).toBe('jitter');
    let pulled = 0;
    const chunk = new Uint8Array(64 * 1024).fill(0x20);
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const request = new NextRequest(new URL(`/api/studio/surfaces/${gridId}/image-map`, process.env.NEXTAUTH_URL), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'content-length': String(MAP_IMAGE_BODY_LIMIT + 1), cookie: owner.cookie },
      body: stream,
      duplex: 'half',
    } as ConstructorParameters<typeof NextRequest>[1]);
    const refused = await expectJson(await withinRequest(request, () => imageMapRoute.POST(request, { params: Promise.resolve({ surfaceId: gridId }) })), 413);
    expect(refused.error.code).toBe('too-large');
    expect(pulled).toBeLessThanOrEqual(2 * chunk.byteLength);
  });
});
