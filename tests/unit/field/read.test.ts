import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { Document, WebIO, type mat4 } from '@gltf-transform/core';
import { BufferAttribute, BufferGeometry, Group, Mesh, MeshBasicMaterial } from 'three';
import { OBJExporter } from 'three/examples/jsm/exporters/OBJExporter.js';
import { PLYExporter } from 'three/examples/jsm/exporters/PLYExporter.js';
import { STLExporter } from 'three/examples/jsm/exporters/STLExporter.js';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { STLLoader } from 'three/examples/jsm/loaders/STLLoader.js';
import { surfaceArea } from '@/lib/field/mesh/geometry';
import { FieldError } from '@/lib/field/mesh/errors';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { readSurface, sniffContent } from '@/lib/field/mesh/read';
import { weldVertices } from '@/lib/field/mesh/read/weld';
import { icosphere, torus } from '@/tests/fixtures/shapes';
import { buildTopology } from '@/lib/field/mesh/topology';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/surfaces/${name}`, import.meta.url)));
const text = (s: string) => new TextEncoder().encode(s);

/**
 * The triangles of a mesh as corner positions, each triangle rotated to start at its smallest
 * corner (which keeps its winding) and the list sorted, so meshes that differ only in vertex
 * numbering and face order compare equal. `round` maps coordinates before comparing.
 */
function canonicalTriangles(positions: ArrayLike<number>, triangles: ArrayLike<number> | null, round = (x: number) => x): string[] {
  const count = triangles ? triangles.length / 3 : positions.length / 9;
  const out: string[] = [];
  for (let f = 0; f < count; f++) {
    const corners = [0, 1, 2].map((k) => {
      const v = triangles ? triangles[3 * f + k] : 3 * f + k;
      return [0, 1, 2].map((a) => round(positions[3 * v + a]) + 0).join(' ');
    });
    const first = corners.indexOf([...corners].sort()[0]);
    out.push([0, 1, 2].map((k) => corners[(first + k) % 3]).join(' | '));
  }
  return out.sort();
}

const meshTriangles = (mesh: TriangleMesh, round?: (x: number) => number) => canonicalTriangles(mesh.positions, mesh.triangles, round);
const fround6 = (x: number) => Number(Math.fround(x).toPrecision(6));
const round6 = (x: number) => Math.round(x * 1e6) / 1e6;

function threeMesh(mesh: TriangleMesh): Mesh {
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(Float32Array.from(mesh.positions), 3));
  geometry.setIndex(new BufferAttribute(Uint32Array.from(mesh.triangles), 1));
  return new Mesh(geometry, new MeshBasicMaterial());
}

function expectFieldError(run: () => unknown, code: string, message?: RegExp): void {
  let caught: unknown;
  try {
    run();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(FieldError);
  expect((caught as FieldError).code).toBe(code);
  if (message) expect((caught as FieldError).message).toMatch(message);
}

// The reference mesh for round trips, in 32-bit floats as every binary format stores it.
const sphere = icosphere(2);
const sphere32: TriangleMesh = { ...sphere, positions: Float64Array.from(Float32Array.from(sphere.positions)) };

describe('round trips through writers outside the project', () => {
  // Source of the files: three.js's exporters (three/examples/jsm/exporters, three 0.187) and
  // glTF-Transform's writer (@gltf-transform/core 4.5.1); the readers are compared with
  // three.js's loaders and glTF-Transform's reader on the same bytes.
  it('reads OBJ from three.js’s OBJExporter like three.js’s OBJLoader does', () => {
    const obj = new OBJExporter().parse(threeMesh(sphere));
    const result = readSurface(text(obj), 'sphere.obj');
    expect(result.format).toBe('obj');
    expect(result.sourceVertexCount).toBe(162);
    expect(result.sourceFaceCount).toBe(320);
    expect(result.weldedVertexCount).toBe(162);
    expect(meshTriangles(result.mesh)).toEqual(meshTriangles(sphere32));
    const loaded = (new OBJLoader().parse(obj).children[0] as Mesh).geometry.getAttribute('position').array;
    expect(meshTriangles(result.mesh)).toEqual(canonicalTriangles(loaded, null));
  });

  for (const [label, options, encoding] of [
    ['ASCII', { binary: false }, 'text'],
    ['binary little-endian', { binary: true, littleEndian: true }, 'binary-little-endian'],
    ['binary big-endian', { binary: true, littleEndian: false }, 'binary-big-endian'],
  ] as const) {
    it(`reads ${label} PLY from three.js’s PLYExporter like three.js’s PLYLoader does`, async () => {
      // PLYExporter hands its result over in an animation frame, which Node lacks.
      vi.stubGlobal('requestAnimationFrame', (callback: () => void) => setTimeout(callback, 0));
      const data = await new Promise<string | ArrayBuffer>((resolve) => new PLYExporter().parse(threeMesh(sphere), resolve, { ...options, excludeAttributes: [] }));
      vi.unstubAllGlobals();
      const bytes = typeof data === 'string' ? text(data) : new Uint8Array(data);
      const result = readSurface(bytes, 'sphere.ply');
      expect(result.encoding).toBe(encoding);
      expect([result.sourceVertexCount, result.sourceFaceCount, result.weldedVertexCount]).toEqual([162, 320, 162]);
      expect(meshTriangles(result.mesh, fround6)).toEqual(meshTriangles(sphere32, fround6));
      const loaded = new PLYLoader().parse(data);
      expect(meshTriangles(result.mesh, fround6)).toEqual(canonicalTriangles(loaded.getAttribute('position').array, loaded.getIndex()!.array, fround6));
    });
  }

  for (const binary of [false, true]) {
    it(`reads ${binary ? 'binary' : 'ASCII'} STL from three.js’s STLExporter like three.js’s STLLoader does, welding it back to shared vertices`, () => {
      const data = new STLExporter().parse(threeMesh(sphere), { binary }) as string | DataView;
      const bytes = typeof data === 'string' ? text(data) : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
      const result = readSurface(bytes, 'sphere.stl');
      expect(result.encoding).toBe(binary ? 'binary-little-endian' : 'text');
      expect(result.sourceVertexCount).toBe(3 * 320);
      expect(result.weldedVertexCount).toBe(162);
      expect(result.collapsedTriangles.count).toBe(0);
      expect(buildTopology(result.mesh).boundaryLoops.length).toBe(0);
      expect(meshTriangles(result.mesh, fround6)).toEqual(meshTriangles(sphere32, fround6));
      const loaded = new STLLoader().parse(typeof data === 'string' ? data : (data.buffer as ArrayBuffer));
      expect(meshTriangles(result.mesh, fround6)).toEqual(canonicalTriangles(loaded.getAttribute('position').array, null, fround6));
    });
  }

  /** A scene of a transformed parent with a child, a mirrored node, a sparse accessor and a line primitive. */
  async function gltfTransformScene(): Promise<Document> {
    const doc = new Document();
    const buffer = doc.createBuffer();
    const ring = torus(2, 0.5, 12, 6);
    const positions = doc.createAccessor().setType('VEC3').setArray(Float32Array.from(ring.positions)).setBuffer(buffer);
    const indices = doc.createAccessor().setType('SCALAR').setArray(Uint16Array.from(ring.triangles)).setBuffer(buffer);
    const torusMesh = doc.createMesh('torus').addPrimitive(doc.createPrimitive().setAttribute('POSITION', positions).setIndices(indices));
    // Mostly zeros, so the writer may store it as a sparse accessor.
    const flat = new Float32Array(3 * 40);
    flat.set([1, 0, 0, 0, 1, 0], 3);
    const sparse = doc.createAccessor().setType('VEC3').setArray(flat).setSparse(true).setBuffer(buffer);
    const fanIndices = doc.createAccessor().setType('SCALAR').setArray(Uint32Array.of(0, 1, 2)).setBuffer(buffer);
    const fanMesh = doc.createMesh('one triangle').addPrimitive(doc.createPrimitive().setAttribute('POSITION', sparse).setIndices(fanIndices));
    const line = doc.createPrimitive().setAttribute('POSITION', positions).setMode(1);
    fanMesh.addPrimitive(line);
    const child = doc.createNode('child').setMesh(torusMesh).setRotation([0, 0.3826834, 0, 0.9238795]).setScale([1, 2, 0.5]).setTranslation([0, 1, 0]);
    const parent = doc.createNode('parent').setTranslation([5, 0, 0]).setRotation([0.5, 0.5, 0.5, 0.5]).addChild(child);
    const mirrored = doc.createNode('mirrored').setMesh(fanMesh).setScale([-1, 1, 1]);
    doc.createScene().addChild(parent).addChild(mirrored);
    return doc;
  }

  /** World-space triangles computed by glTF-Transform's own reader, for comparison. */
  async function referenceTriangles(glb: Uint8Array): Promise<string[]> {
    const doc = await new WebIO().readBinary(glb);
    const positions: number[] = [];
    const triangles: number[] = [];
    for (const node of doc.getRoot().listNodes()) {
      const mesh = node.getMesh();
      if (!mesh) continue;
      const m = node.getWorldMatrix() as mat4;
      const mirror = m[0] * (m[5] * m[10] - m[9] * m[6]) - m[4] * (m[1] * m[10] - m[9] * m[2]) + m[8] * (m[1] * m[6] - m[5] * m[2]) < 0;
      for (const primitive of mesh.listPrimitives()) {
        if (primitive.getMode() !== 4) continue;
        const base = positions.length / 3;
        const p = primitive.getAttribute('POSITION')!;
        for (let i = 0; i < p.getCount(); i++) {
          const [x, y, z] = p.getElement(i, [0, 0, 0]);
          positions.push(m[0] * x + m[4] * y + m[8] * z + m[12], m[1] * x + m[5] * y + m[9] * z + m[13], m[2] * x + m[6] * y + m[10] * z + m[14]);
        }
        const index = primitive.getIndices()!.getArray()!;
        for (let i = 0; i < index.length; i += 3) triangles.push(base + index[i], base + index[mirror ? i + 2 : i + 1], base + index[mirror ? i + 1 : i + 2]);
      }
    }
    return canonicalTriangles(positions, triangles, fround6);
  }

  it('reads a GLB written by glTF-Transform like glTF-Transform’s reader does: hierarchy, mirroring, sparse data', async () => {
    const glb = await new WebIO().writeBinary(await gltfTransformScene());
    const result = readSurface(glb, 'scene.glb');
    expect(result.format).toBe('glb');
    expect(result.sourceFaceCount).toBe(144 + 1);
    expect(result.sourceVertexCount).toBe(72 + 40);
    expect(result.notes.join(' ')).toMatch(/1 glTF primitives made of points or lines were ignored/);
    expect(meshTriangles(result.mesh, fround6)).toEqual(await referenceTriangles(glb));
  });

  it('reads a .gltf with its buffer embedded as a data URI', async () => {
    const io = new WebIO();
    const doc = await gltfTransformScene();
    const { json, resources } = await io.writeJSON(doc);
    for (const buffer of json.buffers ?? []) {
      const data = resources[buffer.uri!];
      buffer.uri = `data:application/octet-stream;base64,${btoa(String.fromCharCode(...data))}`;
    }
    const result = readSurface(text(JSON.stringify(json)), 'scene.gltf');
    expect(result.format).toBe('gltf');
    expect(meshTriangles(result.mesh, fround6)).toEqual(await referenceTriangles(await io.writeBinary(doc)));
  });
});

describe('hand-written files', () => {
  // Expected values come from the files' construction, described in tests/fixtures/surfaces/README.md,
  // and from the format specifications: Wavefront OBJ (Appendix B1 of the Advanced Visualizer
  // manual), PLY (Turk, "The PLY Polygon File Format"), STL (3D Systems, "StereoLithography
  // Interface Specification") and glTF 2.0 (Khronos Group), whose rules for strips, fans
  // and mirrored node transforms the glTF test follows.
  it('welds a UV-split cube of 24 file vertices into 8, closed, with positive and negative indices', () => {
    const result = readSurface(fixture('uv-split-cube.obj'), 'cube.obj');
    expect([result.sourceVertexCount, result.weldedVertexCount, result.sourceFaceCount, result.splitFaceCount]).toEqual([24, 8, 6, 6]);
    expect(result.mesh.triangles.length / 3).toBe(12);
    const topology = buildTopology(result.mesh);
    expect(topology.boundaryLoops.length).toBe(0);
    expect(surfaceArea(result.mesh)).toBeCloseTo(6, 14);
    // File vertices 0 (0,0,1), 13 (0,0,1) and 23 (0,0,1) are one corner.
    const map = result.mesh.fileVertexToVertex!;
    expect(map.length).toBe(24);
    expect(map[13]).toBe(map[0]);
    expect(map[23]).toBe(map[0]);
    expect(new Set(map).size).toBe(8);
    expect(result.mesh.groups).toEqual({ names: ['Cube'], groupOfFace: new Uint16Array(12) });
  });

  it('splits convex and concave polygons into triangles that tile them, keeping groups', () => {
    const result = readSurface(fixture('ngons-and-groups.obj'), 'ngons.obj');
    expect(result.sourceFaceCount).toBe(4);
    expect(result.splitFaceCount).toBe(4);
    expect(result.mesh.triangles.length / 3).toBe(2 + 3 + 4 + 2);
    // A tiling of the 6 × 2 rectangle, every triangle counter-clockwise from +z: the areas add
    // up to 12 only if no triangle overlaps another or lies outside its polygon.
    expect(surfaceArea(result.mesh)).toBeCloseTo(12, 13);
    const p = result.mesh.positions;
    const t = result.mesh.triangles;
    for (let f = 0; f < t.length / 3; f++) {
      const [a, b, c] = [0, 1, 2].map((k) => 3 * t[3 * f + k]);
      expect((p[b] - p[a]) * (p[c + 1] - p[a + 1]) - (p[b + 1] - p[a + 1]) * (p[c] - p[a])).toBeGreaterThan(0);
    }
    const topology = buildTopology(result.mesh);
    expect(topology.boundaryLoops.length).toBe(1);
    expect(result.mesh.groups!.names).toEqual(['default', 'left part', 'right']);
    expect(Array.from(result.mesh.groups!.groupOfFace)).toEqual([0, 0, 1, 1, 1, 2, 2, 2, 2, 1, 1]);
    expect(result.notes.join(' ')).toMatch(/2 lines, points or curves/);
  });

  it('skips PLY properties and elements it does not need, in ASCII', () => {
    const result = readSurface(fixture('extra-properties.ply'), 'pyramid.ply');
    expect([result.sourceVertexCount, result.sourceFaceCount]).toEqual([5, 4]);
    expect(Array.from(result.mesh.positions)).toEqual([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 1]);
    expect(Array.from(result.mesh.triangles)).toEqual([0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4]);
    expect(result.notes.join(' ')).toMatch(/material, edge/);
    const loaded = new PLYLoader().parse(new TextDecoder().decode(fixture('extra-properties.ply')));
    expect(meshTriangles(result.mesh)).toEqual(canonicalTriangles(loaded.getAttribute('position').array, loaded.getIndex()?.array ?? null, fround6));
  });

  it('reads big-endian binary PLY with mixed types, list counts of 16 bits and 32-bit indices', () => {
    const result = readSurface(fixture('cube-big-endian.ply'), 'cube.ply');
    expect(result.encoding).toBe('binary-big-endian');
    expect([result.weldedVertexCount, result.sourceFaceCount, result.mesh.triangles.length / 3]).toEqual([8, 6, 12]);
    expect(buildTopology(result.mesh).boundaryLoops.length).toBe(0);
    expect(Array.from(result.mesh.positions.subarray(18, 21))).toEqual([1, 1, 1]);
  });

  it('recognises a binary STL by its size even when its header starts with “solid”', () => {
    const bytes = fixture('tetra-solid-header.stl');
    expect(sniffContent(bytes)).toBe('stl-binary');
    const result = readSurface(bytes, 'tetra.stl');
    expect([result.weldedVertexCount, result.mesh.triangles.length / 3]).toEqual([4, 4]);
    expect(buildTopology(result.mesh).boundaryLoops.length).toBe(0);
  });

  it('reads glTF strips, fans and indexed triangles through the node hierarchy, ignoring points and unused meshes', () => {
    const result = readSurface(fixture('strip-fan-nodes.gltf'), 'pieces.gltf');
    // Strip: 2 triangles, drawn by node 1 (rotated 90° about z, scaled 2, then moved by x + 10).
    // Fan of 5 vertices: 3 triangles, moved by x + 10. Indexed: 1 triangle, mirrored in x and moved by z + 5.
    expect(result.sourceFaceCount).toBe(6);
    expect(result.sourceVertexCount).toBe(4 + 5 + 3);
    const expected = canonicalTriangles(
      [10, 0, 0, 10, 2, 0, 8, 0, 0, 8, 2, 0, 10.5, 0.5, 0, 10, 0, 0, 11, 0, 0, 11, 1, 0, 10, 1, 0, 0, 0, 5, -1, 0, 5, 0, 1, 5],
      [0, 1, 2, 2, 1, 3, 5, 6, 4, 6, 7, 4, 7, 8, 4, 9, 11, 10],
      round6,
    );
    expect(meshTriangles(result.mesh, round6)).toEqual(expected);
    expect(result.notes.join(' ')).toMatch(/1 glTF primitives made of points/);
  });

  it('drops triangles that collapse when welded, and counts them', () => {
    const obj = 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv 1e-9 0 0\nf 1 2 3\nf 1 4 3\nf 2 2 3\n';
    const result = readSurface(text(obj), 'thin.obj');
    expect(result.weldedVertexCount).toBe(3);
    expect(result.mesh.triangles.length).toBe(3);
    expect(result.collapsedTriangles).toEqual({ count: 2, examples: [1, 2] });
    expect(result.notes.join(' ')).toMatch(/2 triangles were left out/);
    // With welding only of equal positions, the thin triangle stays.
    expect(readSurface(text(obj), 'thin.obj', { weldTolerance: 0 }).mesh.triangles.length).toBe(6);
  });

  it('reads CRLF line ends, a byte-order mark, comments after statements and continued lines', () => {
    const obj = '\ufeffv 0 0 0 # origin\r\nv 1 0 0\r\nv 0 1 \\\r\n 0\r\nf 1 2 \\\r\n3\r\n';
    const result = readSurface(text(obj), 'crlf.obj');
    expect(Array.from(result.mesh.positions)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    expect(Array.from(result.mesh.triangles)).toEqual([0, 1, 2]);
  });

  it('welds each vertex to a kept vertex within the tolerance, without chaining', () => {
    // 0 and 0.6 are within 1 of each other, so are 0.6 and 1.2, but 0 and 1.2 are not.
    const { map, positions } = weldVertices(Float64Array.of(0, 0, 0, 0.6, 0, 0, 1.2, 0, 0, 1.2, 0, 1e-12, -0, 0, 0), 1);
    expect(Array.from(map)).toEqual([0, 0, 1, 1, 0]);
    expect(Array.from(positions)).toEqual([0, 0, 0, 1.2, 0, 0]);
    expect(Array.from(weldVertices(Float64Array.of(0, 0, 0, -0, 0, 0, 0, 0, 1e-300, NaN, 0, 0, NaN, 0, 0), 0).map)).toEqual([0, 0, 1, 2, 3]);
  });

  it('uses 1e-6 of the bounding-box diagonal as the default weld distance', () => {
    const result = readSurface(text('v 0 0 0\nv 3 4 0\nv 0 4 0\nf 1 2 3\n'), 'a.obj');
    expect(result.weldTolerance).toBeCloseTo(5e-6, 20);
  });
});

describe('refusals, with the reason', () => {
  it('names what a file looks like when its extension lies', async () => {
    expectFieldError(() => readSurface(fixture('extra-properties.ply'), 'surface.stl'), 'wrong-format', /named like a STL file, but its content looks like a PLY file/);
    expectFieldError(() => readSurface(fixture('uv-split-cube.obj'), 'surface.ply'), 'wrong-format', /looks like an OBJ file/);
    expectFieldError(() => readSurface(fixture('tetra-solid-header.stl'), 'surface.obj'), 'wrong-format', /binary STL/);
    const glb = await new WebIO().writeBinary(new Document());
    expectFieldError(() => readSurface(glb, 'surface.gltf'), 'wrong-format', /binary glTF \(\.glb\)/);
    expectFieldError(() => readSurface(fixture('strip-fan-nodes.gltf'), 'surface.glb'), 'wrong-format', /glTF \(\.gltf\)/);
    expectFieldError(() => readSurface(fixture('uv-split-cube.obj'), 'surface.fbx'), 'unsupported-format', /looks like an OBJ file; rename/);
  });

  it('refuses a PLY whose header says binary but whose data is text', () => {
    expectFieldError(() => readSurface(fixture('claims-binary-is-text.ply'), 'a.ply'), 'wrong-format', /data after the header is text/);
  });

  it('refuses a truncated binary STL, saying how many bytes were promised', () => {
    expectFieldError(() => readSurface(fixture('truncated-binary.stl'), 'tetra.stl'), 'truncated-file', /promises 4 triangles \(284 bytes\), but the file has only 264/);
  });

  it('refuses empty files', () => {
    expectFieldError(() => readSurface(fixture('empty.stl'), 'empty.stl'), 'empty-file');
    expectFieldError(() => readSurface(text(' \n\t\n'), 'blank.obj'), 'empty-file');
  });

  it('refuses a glTF whose data is in another file, saying what to upload instead', () => {
    expectFieldError(() => readSurface(fixture('external-buffer.gltf'), 'a.gltf'), 'external-resource', /“mesh\.bin”.*\.glb/);
  });

  it('names the line of a bad OBJ statement and the face of a bad index', () => {
    expectFieldError(() => readSurface(text('v 0 0 0\nv 1 0 zero\n'), 'a.obj'), 'malformed-file', /“zero” is not a number \(line 2\)/);
    expectFieldError(() => readSurface(text('v 0 0 0\nf 1 2 -3\n'), 'a.obj'), 'vertex-out-of-range', /Line 2 refers to vertex -3/);
    expectFieldError(() => readSurface(text('v 0 0 0\nf 0 1 1\n'), 'a.obj'), 'vertex-out-of-range', /OBJ numbers vertices from 1/);
    expectFieldError(() => readSurface(text('v 0 0 0\nv 0 0 0\nf 1 2 7\nf 1 2 9\n'), 'a.obj'), 'vertex-out-of-range', /2 faces .*face 0 refers to vertex 7/);
  });

  it('stops at the face limit', () => {
    expectFieldError(() => readSurface(fixture('uv-split-cube.obj'), 'cube.obj', { maxFaces: 10 }), 'too-many-faces', /12 triangles; the limit is 10/);
    expectFieldError(() => readSurface(fixture('cube-big-endian.ply'), 'cube.ply', { maxFaces: 5 }), 'too-many-faces');
    expectFieldError(() => readSurface(fixture('tetra-solid-header.stl'), 'tetra.stl', { maxFaces: 3 }), 'too-many-faces');
  });

  it('accepts nan and inf coordinates for the checker to report', () => {
    const result = readSurface(fixture('degenerate-and-isolated.obj'), 'a.obj');
    expect(Number.isNaN(result.mesh.positions[3 * result.mesh.fileVertexToVertex![8]])).toBe(true);
  });
});
