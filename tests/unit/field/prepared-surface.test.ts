// The prepared form of a checked surface (lib/field/mesh/read/prepared.ts): read back, it is the
// same reading as the artist's file gives — every array, the file numbering, polygons, UVs, groups —
// and the field solved on it is the same to the last bit; any other bytes are refused in words.
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FieldError, readPreparedSurface, readSurface, readSurfaceOrPrepared, writePreparedSurface, type SurfaceReadResult } from '@/lib/field';
import { parseGroomSpec, prepareGroomSurface, solveGroomField } from '@/lib/groom';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { transferSphere } from '@/tests/fixtures/transfer-sphere';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/surfaces/${name}`, import.meta.url)));

/** A reading as plain data: typed arrays as arrays, so that equality is element by element. */
function plain(read: SurfaceReadResult): unknown {
  return JSON.parse(JSON.stringify(read, (_key, value) => (ArrayBuffer.isView(value) ? { [value.constructor.name]: Array.from(value as unknown as ArrayLike<number>) } : value)));
}

const files: [string, Uint8Array][] = [
  ['ngons-and-groups.obj', fixture('ngons-and-groups.obj')],
  ['uv-split-cube.obj', fixture('uv-split-cube.obj')],
  ['cube-big-endian.ply', fixture('cube-big-endian.ply')],
  ['strip-fan-nodes.gltf', fixture('strip-fan-nodes.gltf')],
  ['uv-sphere.obj', new TextEncoder().encode(transferSphere(8, 12).obj)],
];

describe('a prepared surface', () => {
  it.each(files)('%s reads back as the same reading: mesh, file numbering, polygons, UVs, groups and facts', (name, bytes) => {
    const read = readSurface(bytes, name);
    const prepared = writePreparedSurface(read);
    expect(plain(readPreparedSurface(prepared))).toEqual(plain(read));
    expect(plain(readSurfaceOrPrepared(prepared, 'surface.wwsurf'))).toEqual(plain(read));
  });

  it('gives the fox the same field to the last bit as its OBJ file', () => {
    const demo = DEMO_GROOMS[0];
    const obj = new TextEncoder().encode(surfaceToObj(demo.surface(), 'fox'));
    const fromFile = readSurface(obj, 'fox.obj');
    const fromPrepared = readPreparedSurface(writePreparedSurface(fromFile));
    const spec = parseGroomSpec(demo.spec);
    const a = solveGroomField(spec, prepareGroomSurface(fromFile.mesh));
    const b = solveGroomField(spec, prepareGroomSurface(fromPrepared.mesh));
    expect(Buffer.from(b.field.faceDirection.buffer).equals(Buffer.from(a.field.faceDirection.buffer))).toBe(true);
  });

  it('refuses any other bytes with malformed-file, whatever they are (fast-check, seed 14)', () => {
    const good = writePreparedSurface(readSurface(fixture('ngons-and-groups.obj'), 'n.obj'));
    const refused = (bytes: Uint8Array) => {
      try {
        readPreparedSurface(bytes);
        return false;
      } catch (error) {
        return error instanceof FieldError && error.code === 'malformed-file';
      }
    };
    expect(refused(new TextEncoder().encode('v 0 0 0\n'))).toBe(true);
    expect(refused(good.slice(0, good.length - 8))).toBe(true);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: good.length - 1 }), fc.integer({ min: 0, max: 255 }), (at, value) => {
        const bytes = good.slice(0, at + 1);
        bytes[Math.min(at, 20)] = value;
        // A cut anywhere but the end, or a changed header byte: refused or (when the change happens to keep it valid) read.
        try {
          readPreparedSurface(bytes);
          return true;
        } catch (error) {
          return error instanceof FieldError && error.code === 'malformed-file';
        }
      }),
      { seed: 14, numRuns: 300 },
    );
  });
});
