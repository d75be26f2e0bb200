import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { icosphere } from '@/tests/fixtures/shapes';
import { encodeImage, encodeThumbnails } from '@/lib/groom/render/encode-image';
import { renderThumbnail } from '@/lib/groom/render/render';
import { groomOn, withGroups } from './support';

const BACKGROUND = [246, 244, 240];
const GUIDE = [92, 58, 36];

function backHalfGroom() {
  // Guides only on the far side (z < 0) of a unit sphere: the front view must hide them behind it.
  const mesh = withGroups(icosphere(4, 1), ['face', 'back'], (_x, _y, z) => (z > 0 ? 0 : 1));
  return groomOn(mesh, {
    specVersion: 2,
    units: 'cm',
    field: { singularities: [{ point: [0, 1, 0], index: 1 }, { point: [0, -1, 0], index: 1 }] },
    guides: { density: 40, length: 0.4, lift: 40, regions: ['back'] },
  });
}

describe('thumbnails', () => {
  const groom = backHalfGroom();
  const size = 256;
  const image = renderThumbnail(groom.surface.mesh, groom.guides, { size, view: 'front', upAxis: 'y', colourBy: 'uniform' });
  const pixel = (x: number, y: number) => Array.from(image.data.subarray(4 * (y * size + x), 4 * (y * size + x) + 4));
  // The sphere's radius on screen: how far skin-coloured pixels reach from the centre (the skin's
  // red-to-green ratio is 214 : 196 at any shade).
  const isSkin = (c: number[]) => c[1] > 0 && Math.abs(c[0] / c[1] - 214 / 196) < 0.02 && Math.abs(c[0] / c[2] - 214 / 178) < 0.03;
  let radius = 0;
  while (isSkin(pixel(size / 2 + radius + 1, size / 2))) radius++;

  it('renders an opaque image with the shaded surface in the middle and background around it', () => {
    expect(image.width).toBe(size);
    expect(image.data.length).toBe(4 * size * size);
    for (let i = 3; i < image.data.length; i += 4) expect(image.data[i]).toBe(255);
    expect(pixel(0, 0).slice(0, 3)).toEqual(BACKGROUND);
    const centre = pixel(size / 2, size / 2);
    expect(centre.slice(0, 3)).not.toEqual(BACKGROUND);
    expect(radius).toBeGreaterThan(size / 4);
    // Lit from the viewer's upper left: the middle is brighter than the lower right rim.
    // The rim: the skin pixel on the lower-right diagonal nearest 0.65 of the radius (a guide
    // from the back, curving round the silhouette, may cover the exact pixel).
    const along = [0.65, 0.64, 0.66, 0.63, 0.67, 0.62, 0.68, 0.61, 0.6].map((t) => pixel(Math.round(size / 2 + t * radius), Math.round(size / 2 + t * radius)));
    const rim = along.find(isSkin) ?? along[0];
    expect(isSkin(rim)).toBe(true);
    expect(centre[0]).toBeGreaterThan(rim[0]);
  });

  it('hides guides behind the surface (z-buffer) and shows them around it', () => {
    let inside = 0, outside = 0;
    for (let y = 0; y < size; y++) {
      for (let x = 0; x < size; x++) {
        const [r, g, b] = pixel(x, y);
        const isGuide = Math.abs(r - GUIDE[0]) < 4 && Math.abs(g - GUIDE[1]) < 4 && Math.abs(b - GUIDE[2]) < 4;
        if (!isGuide) continue;
        const d = Math.hypot(x + 0.5 - size / 2, y + 0.5 - size / 2);
        if (d < 0.8 * radius) inside++;
        else outside++;
      }
    }
    expect(inside).toBe(0);
    expect(outside).toBeGreaterThan(50);
  });

  it('anti-aliases guide lines: edge pixels are partial blends of line and background', () => {
    let blends = 0;
    for (let i = 0; i < size * size; i++) {
      const c = [image.data[4 * i], image.data[4 * i + 1], image.data[4 * i + 2]];
      if (c.every((x, k) => x === BACKGROUND[k])) continue;
      // On the segment from background to guide colour, strictly between the two.
      const t = (BACKGROUND[0] - c[0]) / (BACKGROUND[0] - GUIDE[0]);
      if (t <= 0.05 || t >= 0.95) continue;
      if (c.every((x, k) => Math.abs(x - (BACKGROUND[k] + t * (GUIDE[k] - BACKGROUND[k]))) < 3)) blends++;
    }
    expect(blends).toBeGreaterThan(100);
  });

  it('colours guides by length or direction, and differs by view', () => {
    const byLength = renderThumbnail(groom.surface.mesh, groom.guides, { size, view: 'side', upAxis: 'y', colourBy: 'length' });
    const byDirection = renderThumbnail(groom.surface.mesh, groom.guides, { size, view: 'side', upAxis: 'y', colourBy: 'direction' });
    const top = renderThumbnail(groom.surface.mesh, groom.guides, { size, view: 'top', upAxis: 'y', colourBy: 'length' });
    expect(Buffer.from(byLength.data).equals(Buffer.from(byDirection.data))).toBe(false);
    expect(Buffer.from(byLength.data).equals(Buffer.from(top.data))).toBe(false);
    const again = renderThumbnail(groom.surface.mesh, groom.guides, { size, view: 'side', upAxis: 'y', colourBy: 'length' });
    expect(Buffer.from(again.data).equals(Buffer.from(byLength.data))).toBe(true);
  });

  it('encodes PNG losslessly and WebP at the same size, for every view at 256² and 1024²', async () => {
    const png = await encodeImage(image, 'png');
    const decoded = await sharp(png).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
    expect(decoded.info.width).toBe(size);
    expect(Buffer.from(decoded.data).equals(Buffer.from(image.data))).toBe(true);
    const set = await encodeThumbnails(groom.surface.mesh, groom.guides);
    expect(set.length).toBe(12);
    for (const t of set) {
      const meta = await sharp(t.bytes).metadata();
      expect(meta.format).toBe(t.format);
      expect(meta.width).toBe(t.size);
      expect(meta.height).toBe(t.size);
    }
    expect(new Set(set.map((t) => `${t.view}/${t.size}`)).size).toBe(6);
  });
});
