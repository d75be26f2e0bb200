import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp, { type Sharp } from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { readSurface, type TriangleMesh } from '@/lib/field';
import { gridPlane } from '@/tests/fixtures/shapes';
import { readImageMap } from '@/lib/groom/render/image-map';
import { decodeMap } from '@/lib/groom/place/maps';
import { GroomError } from '@/lib/groom/errors';
import { parseGroomSpecJson } from '@/lib/groom/spec/spec';

/** A 4 × 4-pixel image's value at column x, row y (row 0 at the top), 16-bit. */
const PIXEL16 = (x: number, y: number) => 1000 * (4 * y + x) + 7 * x;

/**
 * The 3 × 3-cell grid (16 vertices) whose vertex (i, j) has UV ((i + ½)/4, (j + ½)/4): the centre
 * of pixel column i, row 3 − j (UV's v rises upward, image rows run downward; the OBJ, USD and
 * glTF-turned convention of lib/field's readers).
 */
function gridWithUvs(): TriangleMesh {
  const mesh = gridPlane(3, 3);
  const uv = new Float32Array(2 * mesh.triangles.length);
  mesh.triangles.forEach((v, c) => {
    uv[2 * c] = ((v % 4) + 0.5) / 4;
    uv[2 * c + 1] = (Math.floor(v / 4) + 0.5) / 4;
  });
  return { ...mesh, cornerUvs: uv };
}

const folders: string[] = [];
afterAll(() => folders.forEach((f) => rmSync(f, { recursive: true, force: true })));

describe('maps read from an image through the UVs', () => {
  // The images are built with sharp from raw pixels and read back through its decoders; the
  // expected values are the pixels written (PNG: ISO/IEC 15948, 8 and 16 bits per sample).
  it('reads 16-bit PNG and TIFF: at each pixel centre exactly that pixel, scaled to [low, high]', async () => {
    const raw = Uint16Array.from({ length: 16 }, (_x, k) => PIXEL16(k % 4, Math.floor(k / 4)));
    const grey16 = () => sharp(raw, { raw: { width: 4, height: 4, channels: 1 } }).toColourspace('grey16');
    for (const bytes of [await grey16().png().toBuffer(), await grey16().tiff({ compression: 'lzw' }).toBuffer()]) {
      expect((await sharp(bytes).metadata()).depth).toBe('ushort');
      const mesh = gridWithUvs();
      const values = await readImageMap(bytes, mesh, { low: 0.5, high: 2.5 });
      for (let v = 0; v < 16; v++) {
        const i = v % 4, j = Math.floor(v / 4);
        expect(values[v]).toBe(0.5 + (2 * PIXEL16(i, 3 - j)) / 65535);
      }
    }
  });

  it('reads 8-bit PNG and TIFF, bilinear between pixel centres, and a UV-split vertex takes the mean of its corners', async () => {
    const raw = Uint8Array.from({ length: 16 }, (_x, k) => 16 * k + 3);
    const mesh = gridWithUvs();
    // Vertex 5's corners in its first triangle are moved halfway to the next pixel to the right:
    // there it reads the mean of two pixels; its other corners read its own pixel.
    const uv = mesh.cornerUvs!;
    const corners = [...mesh.triangles.keys()].filter((c) => mesh.triangles[c] === 5);
    uv[2 * corners[0]] += 0.125;
    // TIFF without loss (sharp's TIFF writer compresses with JPEG unless told otherwise).
    for (const encode of [(s: Sharp) => s.toColourspace('b-w').png(), (s: Sharp) => s.toColourspace('b-w').tiff({ compression: 'lzw' })]) {
      const bytes = await encode(sharp(raw, { raw: { width: 4, height: 4, channels: 1 } })).toBuffer();
      const values = await readImageMap(bytes, mesh);
      const pixel = (i: number, j: number) => raw[4 * (3 - j) + i] / 255;
      expect(values[0]).toBe(pixel(0, 0));
      expect(values[15]).toBe(pixel(3, 3));
      const own = pixel(1, 1), halfway = (raw[4 * 2 + 1] + raw[4 * 2 + 2]) / 2 / 255;
      expect(values[5]).toBeCloseTo((halfway + (corners.length - 1) * own) / corners.length, 12);
    }
  });

  it('refuses a surface without UVs, and bytes that are no image, in words', async () => {
    const png = await sharp(new Uint8Array(4), { raw: { width: 2, height: 2, channels: 1 } }).png().toBuffer();
    await expect(readImageMap(png, gridPlane(2, 2))).rejects.toThrow(/The surface has no UVs/);
    await expect(readImageMap(png, gridPlane(2, 2))).rejects.toBeInstanceOf(GroomError);
    await expect(readImageMap(new TextEncoder().encode('not an image'), gridWithUvs())).rejects.toThrow(/The map image cannot be read/);
  });

  it('the command line paints a map from an image (--map length=…) and refuses a surface without UVs', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'whorlwind-map-'));
    folders.push(folder);
    const mesh = gridPlane(3, 3);
    const obj = [
      ...Array.from({ length: 16 }, (_x, v) => `v ${mesh.positions[3 * v]} ${mesh.positions[3 * v + 1]} 0`),
      ...Array.from({ length: 16 }, (_x, v) => `vt ${((v % 4) + 0.5) / 4} ${(Math.floor(v / 4) + 0.5) / 4}`),
      ...Array.from({ length: mesh.triangles.length / 3 }, (_x, f) => `f ${[0, 1, 2].map((k) => `${mesh.triangles[3 * f + k] + 1}/${mesh.triangles[3 * f + k] + 1}`).join(' ')}`),
    ].join('\n');
    writeFileSync(join(folder, 'sheet.obj'), `${obj}\n`);
    writeFileSync(join(folder, 'bare.obj'), `${obj.split('\n').filter((l) => !l.startsWith('vt')).map((l) => l.replace(/\/\d+/g, '')).join('\n')}\n`);
    writeFileSync(join(folder, 'coat.json'), JSON.stringify({ specVersion: 3, units: 'cm', upAxis: 'z', field: { referenceDirection: [1, 0, 0] }, guides: { count: 20, length: 0.1 } }));
    const raw = Uint16Array.from({ length: 16 }, (_x, k) => PIXEL16(k % 4, Math.floor(k / 4)));
    writeFileSync(join(folder, 'hair-length.png'), await sharp(raw, { raw: { width: 4, height: 4, channels: 1 } }).toColourspace('grey16').png().toBuffer());
    const run = (...args: string[]) => spawnSync(process.execPath, [join(process.cwd(), 'bin', 'whorlwind-groom.mjs'), ...args], { cwd: folder, encoding: 'utf8', timeout: 60_000 });

    const ok = run('--surface', 'sheet.obj', '--spec', 'coat.json', '--map', 'length=hair-length.png@0.5,2.5', '--out', 'painted.json', '--out', 'g.usda');
    expect(ok.stderr).toBe('');
    expect(ok.status).toBe(0);
    const spec = parseGroomSpecJson(readFileSync(join(folder, 'painted.json'), 'utf8'));
    const sheet = readSurface(readFileSync(join(folder, 'sheet.obj')), 'sheet.obj').mesh;
    const values = decodeMap(spec.maps![0], sheet);
    for (let v = 0; v < 16; v++) {
      const file = sheet.positions[3 * v], fy = sheet.positions[3 * v + 1];
      const i = Math.round((file + 0.5) * 3), j = Math.round((fy + 0.5) * 3);
      // 16-bit codes between the map's own low and high: within half a code step of the pixel.
      expect(Math.abs(values[v] - (0.5 + (2 * PIXEL16(i, 3 - j)) / 65535))).toBeLessThanOrEqual((spec.maps![0].high - spec.maps![0].low) / 65535 / 2 + 1e-12);
    }

    const bare = run('--surface', 'bare.obj', '--spec', 'coat.json', '--map', 'length=hair-length.png', '--out', 'x.usda');
    expect(bare.status).toBe(1);
    expect(bare.stderr).toMatch(/^whorlwind-groom: The surface has no UVs/);
    const typo = run('--surface', 'sheet.obj', '--spec', 'coat.json', '--map', 'lenght=hair-length.png');
    expect(typo.status).toBe(2);
    expect(typo.stderr).toMatch(/--map lenght=hair-length.png: write it as attribute=image.png/);
  });
});
