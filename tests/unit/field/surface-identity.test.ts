import { describe, expect, it, vi } from 'vitest';
import { Document, WebIO } from '@gltf-transform/core';
import { BufferAttribute, BufferGeometry, Mesh, MeshBasicMaterial } from 'three';
import { PLYExporter } from 'three/examples/jsm/exporters/PLYExporter.js';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { checkSurface, checkSurfaceFile } from '@/lib/field/mesh/check';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { readSurface } from '@/lib/field/mesh/read';
import { uvFacts } from '@/lib/field/mesh/uv-check';
import { quadSphere } from '@/tests/fixtures/quad-sphere';
import { torus } from '@/tests/fixtures/shapes';

const text = (s: string) => new TextEncoder().encode(s);
const key = (xs: ArrayLike<number>) => Array.from(xs, (x) => Math.fround(x).toPrecision(6)).join(' ');

/** Every triangle corner as "position | uv", the set a reference reader must agree with. */
function cornerSet(mesh: TriangleMesh): Set<string> {
  const out = new Set<string>();
  for (let h = 0; h < mesh.triangles.length; h++) {
    const v = mesh.triangles[h];
    out.add(`${key(mesh.positions.subarray(3 * v, 3 * v + 3))} | ${key(mesh.cornerUvs!.subarray(2 * h, 2 * h + 2))}`);
  }
  return out;
}

describe('surfaces keep their identity', () => {
  const sphere = quadSphere(8, 12);
  const read = readSurface(text(sphere.obj), 'sphere.obj');
  const mesh = read.mesh;

  it('maps every triangle back to its OBJ polygon and the polygon’s corners, in the file’s numbering', () => {
    expect(read.uvs).toBe('complete');
    // 12 + 12 pole triangles, 6 × 12 quads of two triangles each.
    expect(mesh.triangles.length / 3).toBe(24 + 2 * 72);
    const perPolygon = new Array(sphere.polygons.length).fill(0);
    for (let f = 0; f < mesh.triangles.length / 3; f++) {
      const polygon = sphere.polygons[mesh.facePolygon![f]];
      perPolygon[mesh.facePolygon![f]]++;
      for (let k = 0; k < 3; k++) {
        const corner = mesh.faceCorners![3 * f + k];
        expect(corner).toBeLessThan(polygon.vertices.length);
        // The triangle's vertex is the welded vertex of that polygon corner's file vertex …
        expect(mesh.triangles[3 * f + k]).toBe(mesh.fileVertexToVertex![polygon.vertices[corner]]);
        // … and its UV is that corner's vt, as written.
        const [u, v] = sphere.uvs[polygon.uvs[corner]];
        expect(mesh.cornerUvs![6 * f + 2 * k]).toBe(Math.fround(u));
        expect(mesh.cornerUvs![6 * f + 2 * k + 1]).toBe(Math.fround(v));
      }
    }
    // A polygon of n corners becomes n − 2 triangles.
    expect(perPolygon).toEqual(sphere.polygons.map((p) => p.vertices.length - 2));
    // The seam's twice-written vertices are welded: one vertex each, two UVs.
    expect(read.weldedVertexCount).toBe(2 + 7 * 12);
    expect(mesh.polygons!.start.length).toBe(sphere.polygons.length + 1);
  });

  it('reads the same corner UVs as three.js’s OBJLoader (r17x, examples/jsm)', () => {
    const loaded = new OBJLoader().parse(sphere.obj).children[0] as Mesh;
    const geometry = loaded.geometry as BufferGeometry;
    const p = geometry.getAttribute('position').array;
    const uv = geometry.getAttribute('uv').array;
    const reference = new Set<string>();
    for (let i = 0; i < p.length / 3; i++) reference.add(`${key(p.slice(3 * i, 3 * i + 3))} | ${key(uv.slice(2 * i, 2 * i + 2))}`);
    expect(cornerSet(mesh)).toEqual(reference);
  });

  it('keeps polygon and corner maps through a sculpt pass (same topology, moved vertices)', () => {
    const sculpted = quadSphere(8, 12, { sculpt: (v, [x, y, z]) => [x * (1 + 0.2 * Math.sin(3 * y)), y * 1.3, z + 0.1 * Math.sin(v)] });
    const again = readSurface(text(sculpted.obj), 'sculpt.obj').mesh;
    expect(Array.from(again.facePolygon!)).toEqual(Array.from(mesh.facePolygon!));
    expect(Array.from(again.faceCorners!)).toEqual(Array.from(mesh.faceCorners!));
    expect(Array.from(again.cornerUvs!)).toEqual(Array.from(mesh.cornerUvs!));
  });

  it('reports UVs present and not overlapping on a proper layout (the seam and poles only touch)', () => {
    const report = checkSurface(mesh);
    expect(report.facts?.uvs).toMatchObject({ present: true, overlapFraction: 0, overlappingFaces: { count: 0 }, collapsedFaces: { count: 0 } });
    expect(report.problems.map((p) => p.code)).toEqual([]);
  });

  it('reports overlapping UVs as a warning, not an error', () => {
    const mirrored = checkSurfaceFile(text(quadSphere(8, 12, { mirroredUvs: true }).obj), 'mirrored.obj').report;
    expect(mirrored.ok).toBe(true);
    const problem = mirrored.problems.find((p) => p.code === 'uvs-overlap');
    expect(problem).toMatchObject({ severity: 'warning', where: 'face' });
    // Folding the map about u = 0.5 puts the two halves on each other: every face overlaps and
    // (apart from the raster's edge cells) the whole map is used twice.
    expect(mirrored.facts?.uvs.overlappingFaces.count).toBe(mesh.triangles.length / 3);
    expect(mirrored.facts?.uvs.overlapFraction).toBeGreaterThan(0.9);
  });

  it('reports missing UVs as a fact, without a problem', () => {
    const { read: plain, report } = checkSurfaceFile(text(quadSphere(8, 12, { withoutUvs: true }).obj), 'plain.obj');
    expect(plain?.uvs).toBe('none');
    expect(plain?.mesh.cornerUvs).toBeUndefined();
    expect(plain?.mesh.facePolygon).toBeDefined();
    expect(report.facts?.uvs.present).toBe(false);
    expect(report.problems).toEqual([]);
  });

  it('finds a small overlap of two islands but not two islands that share an edge', () => {
    const square = (uvs: number[]): TriangleMesh => ({
      positions: Float64Array.of(0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 2, 0, 0, 2, 1, 0),
      triangles: Uint32Array.of(0, 1, 2, 0, 2, 3, 1, 4, 5, 1, 5, 2),
      cornerUvs: Float32Array.from(uvs),
    });
    // Two unit squares side by side in UV: they share the edge u = 1.
    const touching = square([0, 0, 1, 0, 1, 1, 0, 0, 1, 1, 0, 1, 1, 0, 2, 0, 2, 1, 1, 0, 2, 1, 1, 1]);
    expect(uvFacts(touching).overlappingFaces.count).toBe(0);
    // The second square moved 0.05 into the first: a strip of 5 % of a square overlaps.
    const shifted = square([0, 0, 1, 0, 1, 1, 0, 0, 1, 1, 0, 1, 0.95, 0, 1.95, 0, 1.95, 1, 0.95, 0, 1.95, 1, 0.95, 1]);
    const facts = uvFacts(shifted);
    expect(facts.overlappingFaces.count).toBeGreaterThanOrEqual(3);
    expect(facts.overlapFraction).toBeGreaterThan(0.02);
    expect(facts.overlapFraction).toBeLessThan(0.04);
  });

  it('reads PLY texture coordinates written by three.js’s PLYExporter (s, t per vertex)', async () => {
    const ring = torus(2, 0.5, 12, 6);
    const geometry = new BufferGeometry();
    geometry.setAttribute('position', new BufferAttribute(Float32Array.from(ring.positions), 3));
    const uv = Float32Array.from({ length: (2 * ring.positions.length) / 3 }, (_x, i) => (i % 2 === 0 ? (i / 2) / 72 : 0.25 + ((i * 7) % 5) / 10));
    geometry.setAttribute('uv', new BufferAttribute(uv, 2));
    geometry.setIndex(new BufferAttribute(Uint32Array.from(ring.triangles), 1));
    // PLYExporter hands its result over in an animation frame, which Node lacks.
    vi.stubGlobal('requestAnimationFrame', (callback: () => void) => setTimeout(callback, 0));
    const written = await new Promise<string>((resolve) =>
      new PLYExporter().parse(new Mesh(geometry, new MeshBasicMaterial()), (data) => resolve(data as string), { binary: false, excludeAttributes: [] }),
    );
    vi.unstubAllGlobals();
    expect(written).toMatch(/property float s\nproperty float t/);
    const result = readSurface(text(written), 'ring.ply');
    expect(result.uvs).toBe('complete');
    for (let h = 0; h < result.mesh.triangles.length; h++) {
      const fileVertex = result.mesh.polygons!.corners[result.mesh.polygons!.start[result.mesh.facePolygon![(h / 3) | 0]] + result.mesh.faceCorners![h]];
      expect(result.mesh.cornerUvs![2 * h]).toBeCloseTo(uv[2 * fileVertex], 6);
      expect(result.mesh.cornerUvs![2 * h + 1]).toBeCloseTo(uv[2 * fileVertex + 1], 6);
    }
  });

  it('reads PLY texture_u / texture_v and u / v (names of the PLY property list in common use) and OBJ negative vt numbers', () => {
    for (const [u, v] of [['texture_u', 'texture_v'], ['u', 'v']]) {
      const ply = [
        'ply', 'format ascii 1.0', 'element vertex 4', 'property float x', 'property float y', 'property float z',
        `property float ${u}`, `property float ${v}`, 'element face 1', 'property list uchar int vertex_indices', 'end_header',
        '0 0 0 0.1 0.2', '1 0 0 0.3 0.4', '1 1 0 0.5 0.6', '0 1 0 0.7 0.8', '4 0 1 2 3', '',
      ].join('\n');
      const mesh = readSurface(text(ply), 'quad.ply').mesh;
      expect(Array.from(mesh.polygons!.uvs!, (x) => Number(x.toFixed(6)))).toEqual([0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8]);
      expect(mesh.facePolygon).toEqual(Uint32Array.of(0, 0));
    }
    // −1 is the latest vt: the quad's corners take vt 1, 2, 3, 4 counted back from the end.
    const obj = 'v 0 0 0\nv 1 0 0\nv 1 1 0\nv 0 1 0\nvt 0 0\nvt 1 0\nvt 1 1\nvt 0 1\nf -4/-4 -3/-3 -2/-2 -1/-1\n';
    const mesh = readSurface(text(obj), 'quad.obj').mesh;
    expect(Array.from(mesh.polygons!.uvs!)).toEqual([0, 0, 1, 0, 1, 1, 0, 1]);
    // Triangle corners are polygon corners, each with its corner's UV.
    for (let h = 0; h < 6; h++) {
      const c = mesh.faceCorners![h];
      expect([mesh.cornerUvs![2 * h], mesh.cornerUvs![2 * h + 1]]).toEqual([[0, 0], [1, 0], [1, 1], [0, 1]][c]);
    }
    expect(() => readSurface(text('v 0 0 0\nv 1 0 0\nv 0 1 0\nvt 0 0\nf 1/1 2/2 3/1\n'), 'bad.obj')).toThrow(/texture coordinate 2, but only 1 come before it/);
  });

  it('reads glTF TEXCOORD_0 written by glTF-Transform, with v turned to 1 − v (glTF 2.0 spec §3.7.2.1: UV origin top left)', async () => {
    const doc = new Document();
    const buffer = doc.createBuffer();
    const ring = torus(2, 0.5, 12, 6);
    const uv = Float32Array.from({ length: (2 * ring.positions.length) / 3 }, (_x, i) => (i % 2 === 0 ? 0.1 : 0.2 + i / 1000));
    const primitive = doc
      .createPrimitive()
      .setAttribute('POSITION', doc.createAccessor().setType('VEC3').setArray(Float32Array.from(ring.positions)).setBuffer(buffer))
      .setAttribute('TEXCOORD_0', doc.createAccessor().setType('VEC2').setArray(uv).setBuffer(buffer))
      .setIndices(doc.createAccessor().setType('SCALAR').setArray(Uint16Array.from(ring.triangles)).setBuffer(buffer));
    doc.createScene().addChild(doc.createNode().setMesh(doc.createMesh().addPrimitive(primitive)));
    const result = readSurface(await new WebIO().writeBinary(doc), 'ring.glb');
    expect(result.uvs).toBe('complete');
    for (let h = 0; h < result.mesh.triangles.length; h++) {
      const fileVertex = ring.triangles[h];
      expect(result.mesh.facePolygon![(h / 3) | 0]).toBe((h / 3) | 0);
      expect(result.mesh.cornerUvs![2 * h]).toBe(Math.fround(uv[2 * fileVertex]));
      expect(result.mesh.cornerUvs![2 * h + 1]).toBe(Math.fround(1 - uv[2 * fileVertex + 1]));
    }
  });
});
