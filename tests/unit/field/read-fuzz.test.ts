import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Document, WebIO } from '@gltf-transform/core';
import { FieldError } from '@/lib/field/mesh/errors';
import { readSurface } from '@/lib/field/mesh/read';
import { torus } from '@/tests/fixtures/shapes';

// Property-based robustness: whatever the bytes, a reader returns a well-formed mesh or throws a
// FieldError, quickly (fast-check, Dubien, https://fast-check.dev).

const EXTENSIONS = ['obj', 'ply', 'stl', 'gltf', 'glb'];
/** Generous bound for one small file on a shared, slow machine; a hang would take far longer. */
const TIME_LIMIT_MS = 2000;

function expectResultOrFieldError(bytes: Uint8Array, fileName: string): void {
  const started = performance.now();
  try {
    const result = readSurface(bytes, fileName, { maxFaces: 100_000 });
    const { positions, triangles, fileVertexToVertex } = result.mesh;
    const nV = positions.length / 3;
    expect(Number.isInteger(nV)).toBe(true);
    expect(triangles.length % 3).toBe(0);
    expect(fileVertexToVertex!.length).toBe(result.sourceVertexCount);
    for (const v of fileVertexToVertex!) expect(v).toBeLessThan(nV);
    for (let f = 0; f < triangles.length / 3; f++) {
      const [a, b, c] = triangles.subarray(3 * f, 3 * f + 3);
      expect(a < nV && b < nV && c < nV && a !== b && b !== c && a !== c).toBe(true);
    }
    if (result.mesh.groups) expect(result.mesh.groups.groupOfFace.length).toBe(triangles.length / 3);
  } catch (error) {
    if (!(error instanceof FieldError)) throw error;
    expect(error.message.length).toBeGreaterThan(0);
  }
  expect(performance.now() - started).toBeLessThan(TIME_LIMIT_MS);
}

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/surfaces/${name}`, import.meta.url)));

async function validFiles(): Promise<[string, Uint8Array][]> {
  const doc = new Document();
  const ring = torus(2, 0.5, 8, 5);
  const buffer = doc.createBuffer();
  const primitive = doc
    .createPrimitive()
    .setAttribute('POSITION', doc.createAccessor().setType('VEC3').setArray(Float32Array.from(ring.positions)).setBuffer(buffer))
    .setIndices(doc.createAccessor().setType('SCALAR').setArray(Uint16Array.from(ring.triangles)).setBuffer(buffer));
  doc.createScene().addChild(doc.createNode().setMesh(doc.createMesh().addPrimitive(primitive)).setTranslation([1, 2, 3]));
  const glb = await new WebIO().writeBinary(doc);
  return [
    ['cube.obj', fixture('uv-split-cube.obj')],
    ['ngons.obj', fixture('ngons-and-groups.obj')],
    ['pyramid.ply', fixture('extra-properties.ply')],
    ['cube.ply', fixture('cube-big-endian.ply')],
    ['tetra.stl', fixture('tetra-solid-header.stl')],
    ['pieces.gltf', fixture('strip-fan-nodes.gltf')],
    ['torus.glb', glb],
    ['tetra.stl', new TextEncoder().encode('solid t\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex 1 0 0\nvertex 0 1 0\nendloop\nendfacet\nendsolid t\n')],
  ];
}

describe('readers on hostile input', () => {
  it('survive random bytes under every extension', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 3000 }), fc.constantFrom(...EXTENSIONS), (bytes, extension) => {
        expectResultOrFieldError(bytes, `random.${extension}`);
      }),
      { numRuns: 1000 },
    );
  });

  it('survive random bytes behind each format’s signature', () => {
    const signatures: [string, string][] = [
      ['ply', 'ply\nformat binary_little_endian 1.0\nelement vertex 3\nproperty float x\nproperty float y\nproperty float z\nelement face 1\nproperty list uchar int vertex_indices\nend_header\n'],
      ['ply', 'ply\nformat ascii 1.0\nelement vertex 3\nproperty float x\nproperty float y\nproperty float z\nelement face 1\nproperty list uchar int vertex_indices\nend_header\n'],
      ['stl', 'solid x\n'],
      ['glb', 'glTF\u0002\u0000\u0000\u0000'],
      ['gltf', '{"asset":{"version":"2.0"},'],
    ];
    fc.assert(
      fc.property(fc.constantFrom(...signatures), fc.uint8Array({ maxLength: 2000 }), ([extension, signature], tail) => {
        const head = new TextEncoder().encode(signature);
        const bytes = new Uint8Array(head.length + tail.length);
        bytes.set(head);
        bytes.set(tail, head.length);
        expectResultOrFieldError(bytes, `signed.${extension}`);
      }),
      { numRuns: 500 },
    );
  });

  it('survive every truncation of valid files', async () => {
    for (const [name, bytes] of await validFiles()) {
      for (let length = 0; length <= bytes.length; length += Math.max(1, Math.floor(bytes.length / 300))) {
        expectResultOrFieldError(bytes.subarray(0, length), name);
      }
    }
  });

  it('survive random corruption of valid files', async () => {
    const files = await validFiles();
    fc.assert(
      fc.property(
        fc.constantFrom(...files),
        fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }),
        ([name, original], changes) => {
          const bytes = original.slice();
          for (const [at, value] of changes) bytes[at % bytes.length] = value;
          expectResultOrFieldError(bytes, name);
        },
      ),
      { numRuns: 1500 },
    );
  });

  it('survive OBJ statements with hostile numbers and indices', () => {
    const number = fc.oneof(fc.double().map(String), fc.constantFrom('nan', '-inf', '1e400', '', '0x1f', '1.2.3'));
    const index = fc.oneof(fc.integer({ min: -12, max: 12 }), fc.constantFrom(0, 2 ** 40, -(2 ** 40))).map(String);
    const statement = fc.oneof(
      fc.tuple(number, number, number).map((xyz) => `v ${xyz.join(' ')}`),
      fc.array(fc.tuple(index, fc.constantFrom('', '/1', '//2', '/1/1')).map(([i, s]) => i + s), { maxLength: 9 }).map((c) => `f ${c.join(' ')}`),
      fc.string({ maxLength: 8 }).map((name) => `g ${name}`),
      fc.constantFrom('l 1 2', 'o', 'vt 0 0', '#', 'f', 'v', 'usemtl x', '\\'),
    );
    fc.assert(
      fc.property(fc.array(statement, { maxLength: 40 }), fc.constantFrom('\n', '\r\n'), (lines, eol) => {
        expectResultOrFieldError(new TextEncoder().encode(lines.join(eol)), 'fuzz.obj');
      }),
      { numRuns: 1000 },
    );
  });

  it('survive PLY headers with hostile counts and types, in every encoding', () => {
    const type = fc.constantFrom('char', 'uchar', 'short', 'ushort', 'int', 'uint', 'float', 'double', 'int8', 'float64', 'bogus');
    const property = fc.oneof(
      fc.tuple(type, fc.constantFrom('x', 'y', 'z', 'nx', 'vertex_indices')).map(([t, n]) => `property ${t} ${n}`),
      fc.tuple(type, type, fc.constantFrom('vertex_indices', 'vertex_index', 'x', 'uv')).map(([c, t, n]) => `property list ${c} ${t} ${n}`),
    );
    const count = fc.oneof(fc.integer({ min: 0, max: 6 }), fc.constantFrom(2 ** 31, 2 ** 32 - 1, 2 ** 53, -1));
    const element = fc.tuple(fc.constantFrom('vertex', 'face', 'edge'), count, fc.array(property, { maxLength: 5 }));
    fc.assert(
      fc.property(
        fc.constantFrom('ascii', 'binary_little_endian', 'binary_big_endian'),
        fc.array(element, { maxLength: 4 }),
        fc.uint8Array({ maxLength: 400 }),
        fc.array(fc.integer({ min: -3, max: 9 }), { maxLength: 60 }),
        (format, elements, binaryBody, numbers) => {
          const header = ['ply', `format ${format} 1.0`, ...elements.flatMap(([name, n, ps]) => [`element ${name} ${n}`, ...ps]), 'end_header', ''].join('\n');
          const head = new TextEncoder().encode(header);
          const body = format === 'ascii' ? new TextEncoder().encode(numbers.join(' ')) : binaryBody;
          const bytes = new Uint8Array(head.length + body.length);
          bytes.set(head);
          bytes.set(body, head.length);
          expectResultOrFieldError(bytes, 'fuzz.ply');
        },
      ),
      { numRuns: 1000 },
    );
  });

  it('survive glTF JSON with hostile structure', () => {
    // Mostly plausible values, so that the reader gets past its first checks, with hostile ones mixed in.
    const small = fc.oneof({ arbitrary: fc.integer({ min: 0, max: 2 }), weight: 6 }, fc.integer({ min: -1, max: 4 }), fc.constantFrom(2 ** 31, 1.5, '0', null));
    const accessor = fc.record(
      {
        bufferView: small,
        byteOffset: small,
        componentType: fc.constantFrom(5120, 5121, 5122, 5123, 5125, 5126, 1),
        count: fc.oneof({ arbitrary: fc.integer({ min: 0, max: 12 }), weight: 6 }, small, fc.constantFrom(2 ** 30)),
        type: fc.oneof({ arbitrary: fc.constantFrom('SCALAR', 'VEC3'), weight: 6 }, fc.constantFrom('MAT4', 'x')),
        normalized: fc.boolean(),
        sparse: fc.record({ count: small, indices: fc.record({ bufferView: small, componentType: fc.constantFrom(5121, 5125, 5126) }), values: fc.record({ bufferView: small }) }),
      },
      { requiredKeys: ['componentType', 'count', 'type', 'bufferView'] },
    );
    const node = fc.record(
      { mesh: small, children: fc.array(small, { maxLength: 3 }), matrix: fc.array(fc.double(), { minLength: 16, maxLength: 16 }), scale: fc.array(fc.double(), { minLength: 3, maxLength: 3 }) },
      { requiredKeys: ['mesh'] },
    );
    const primitive = fc.record({ attributes: fc.record({ POSITION: small }), indices: small, mode: fc.constantFrom(0, 4, 5, 6, 7, -1) }, { requiredKeys: ['attributes'] });
    const gltf = fc.record(
      {
        asset: fc.oneof({ arbitrary: fc.constant({ version: '2.0' }), weight: 8 }, fc.constantFrom({ version: '1.0' }, null)),
        scene: small,
        scenes: fc.array(fc.record({ nodes: fc.array(small, { maxLength: 3 }) }), { maxLength: 2 }),
        nodes: fc.array(node, { minLength: 1, maxLength: 4 }),
        meshes: fc.array(fc.record({ primitives: fc.array(primitive, { minLength: 1, maxLength: 3 }) }), { minLength: 1, maxLength: 3 }),
        accessors: fc.array(accessor, { minLength: 1, maxLength: 4 }),
        bufferViews: fc.array(fc.record({ buffer: small, byteOffset: small, byteLength: fc.integer({ min: 0, max: 64 }), byteStride: fc.constantFrom(undefined, 0, 4, 12, 255) }), { minLength: 1, maxLength: 3 }),
        buffers: fc.array(
          fc.record({
            byteLength: fc.integer({ min: 0, max: 64 }),
            uri: fc.oneof({ arbitrary: fc.constant(`data:application/octet-stream;base64,${btoa('\u0001'.repeat(64))}`), weight: 6 }, fc.constantFrom('data:,abc', 'x.bin')),
          }),
          { minLength: 1, maxLength: 2 },
        ),
      },
      { requiredKeys: ['asset', 'nodes', 'meshes', 'accessors', 'bufferViews', 'buffers'] },
    );
    fc.assert(
      fc.property(gltf, (json) => expectResultOrFieldError(new TextEncoder().encode(JSON.stringify(json)), 'fuzz.gltf')),
      { numRuns: 1500 },
    );
  });

  it('refuses, without allocating, headers that promise far more than the file holds', () => {
    const ply = 'ply\nformat binary_little_endian 1.0\nelement vertex 4000000000\nproperty float x\nproperty float y\nproperty float z\nend_header\n\u0001\u0002';
    expect(() => readSurface(new TextEncoder().encode(ply), 'huge.ply')).toThrow(/promises 4000000000 “vertex” records/);
    const empty = 'ply\nformat ascii 1.0\nelement vertex 0\nproperty float x\nproperty float y\nproperty float z\nelement nothing 9007199254740991\nend_header\n';
    expect(readSurface(new TextEncoder().encode(empty), 'empty-records.ply').mesh.triangles.length).toBe(0);
    const stl = new Uint8Array(84 + 50);
    new DataView(stl.buffer).setUint32(80, 0xffffffff, true);
    expect(() => readSurface(stl, 'huge.stl')).toThrow(/promises 4294967295 triangles/);
  });
});
