import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkSurface, checkSurfaceFile, type Problem, type SurfaceReport } from '@/lib/field/mesh/check';
import { FieldError } from '@/lib/field/mesh/errors';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, genusTwoSurface, gridPlane, icosphere, torus } from '@/tests/fixtures/shapes';
import { buildTopology } from '@/lib/field/mesh/topology';
import { concatenate, stanfordBunny } from './surfaces';
import { transferSphere } from '@/tests/fixtures/transfer-sphere';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/surfaces/${name}`, import.meta.url)));

function problem(report: SurfaceReport, code: string): Problem {
  const found = report.problems.find((p) => p.code === code);
  if (!found) throw new Error(`no ${code} in ${JSON.stringify(report.problems.map((p) => p.code))}`);
  return found;
}

const codes = (report: SurfaceReport) => report.problems.map((p) => p.code).sort();

function meshOf(positions: number[], triangles: number[]): TriangleMesh {
  return { positions: Float64Array.from(positions), triangles: Uint32Array.from(triangles) };
}

describe('checkSurface on good surfaces', () => {
  // Expected values: χ = 2 − 2g − b (classification of compact surfaces) and the counts of each
  // test surface as constructed.
  it('passes closed surfaces of genus 0, 1 and 2 and the Stanford bunny, with their facts', () => {
    const cases: [TriangleMesh, number, number][] = [
      [icosphere(2), 2, 0],
      [torus(2, 0.5, 24, 12), 0, 1],
      [genusTwoSurface(), -2, 2],
      [stanfordBunny(), 2, 0],
    ];
    for (const [mesh, chi, genus] of cases) {
      const report = checkSurface(mesh);
      expect(report.problems).toEqual([]);
      expect(report.ok).toBe(true);
      expect(report.facts).toMatchObject({ eulerCharacteristic: chi, genus, boundaryLoopCount: 0, componentCount: 1 });
    }
  });

  it('measures a sphere and a disc', () => {
    const { facts } = checkSurface(icosphere(1, 2));
    expect(facts).toMatchObject({ vertexCount: 42, usedVertexCount: 42, faceCount: 80, edgeCount: 120 });
    expect(facts!.boundingBox!.max[0]).toBeCloseTo(2, 12);
    expect(facts!.surfaceArea).toBeGreaterThan(0.9 * 16 * Math.PI);
    expect(facts!.surfaceArea).toBeLessThan(16 * Math.PI);
    const open = checkSurface(disc(3, 12)).facts!;
    expect(open).toMatchObject({ eulerCharacteristic: 1, boundaryLoopCount: 1, genus: 0 });
    expect(open.components).toEqual([{ faceCount: 60, vertexCount: 37, edgeCount: 96, boundaryLoopCount: 1, eulerCharacteristic: 1, genus: 0 }]);
  });
});

describe('checkSurface finds each problem, with counts and examples', () => {
  // What counts as a problem follows the definition of a 2-manifold triangle mesh: every edge in
  // one or two faces, the faces around a vertex forming a single fan, neighbouring faces
  // oriented alike (Botsch, Kobbelt, Pauly, Alliez, Lévy, "Polygon Mesh Processing", 2010, §1.3).
  // Expected counts and examples come from the fixtures' construction (tests/fixtures/surfaces/README.md).
  it('a vertex where two fans touch (bowtie)', () => {
    const { report } = checkSurfaceFile(fixture('bowtie.obj'), 'bowtie.obj');
    expect(codes(report)).toEqual(['non-manifold-vertex', 'several-components']);
    // OBJ numbers vertices from 1 (Wavefront OBJ specification, "Referencing vertex data"): the
    // message names the file's vertex 3, which the mesh numbers 2.
    expect(problem(report, 'non-manifold-vertex')).toMatchObject({ severity: 'error', count: 1, examples: [2], inFile: [3], inFileFrom: 1, where: 'vertex' });
    expect(problem(report, 'non-manifold-vertex').message).toMatch(/At 1 vertex, pieces of surface touch at a single point \(vertices 3 in the file's own numbering, counting from 1\)/);
    expect(report.ok).toBe(false);
    expect(report.facts!.genus).toBeNull();
    // buildTopology refuses the same surface, for the same reason.
    expect(() => buildTopology(checkSurfaceFile(fixture('bowtie.obj'), 'bowtie.obj').read!.mesh)).toThrow(FieldError);
  });

  it('an edge with three faces (fin)', () => {
    const { report } = checkSurfaceFile(fixture('fin.obj'), 'fin.obj');
    expect(codes(report)).toEqual(['non-manifold-edge']);
    expect(problem(report, 'non-manifold-edge')).toMatchObject({ count: 1, examples: [0, 1], inFile: [1, 2], where: 'edge' });
    expect(problem(report, 'non-manifold-edge').message).toMatch(/1 edge is shared by more than two faces \(between vertices 1–2 in the file's own numbering, counting from 1\)/);
  });

  it('names vertices and faces as the file numbers them, also where welding merged vertices, and says from where it counts', () => {
    // A fin whose second face uses a copy of vertex 2 (file vertex 3): welded, the copy is gone,
    // so the mesh's numbers are not the file's minus one. OBJ counts from 1, PLY from 0 (PLY
    // format, Turk 1994: face lists index the vertex element from 0).
    const obj = 'v 0 1 0\nv 0 0 0\nv 0 0 0\nv 1 0 0\nv 0 -1 0\nv 0 0 1\nf 2 4 1\nf 3 4 5\nf 2 4 6\n';
    const fromObj = problem(checkSurfaceFile(new TextEncoder().encode(obj), 'fin.obj').report, 'non-manifold-edge');
    expect(fromObj).toMatchObject({ inFile: [2, 4], inFileFrom: 1 });
    expect(fromObj.message).toContain('between vertices 2–4 in the file\'s own numbering, counting from 1');
    const ply = ['ply', 'format ascii 1.0', 'element vertex 5', 'property float x', 'property float y', 'property float z', 'element face 3', 'property list uchar int vertex_indices', 'end_header', '0 1 0', '0 0 0', '1 0 0', '0 -1 0', '0 0 1', '3 1 2 0', '3 1 2 3', '3 1 2 4', ''].join('\n');
    const fromPly = problem(checkSurfaceFile(new TextEncoder().encode(ply), 'fin.ply').report, 'non-manifold-edge');
    expect(fromPly).toMatchObject({ inFile: [1, 2], inFileFrom: 0 });
    expect(fromPly.message).toContain('between vertices 1–2 in the file\'s own numbering, counting from 0');
    // Faces are the file's polygons: a quad cut in two is one face of the file.
    const quads = 'v 0 0 0\nv 1 0 0\nv 1 1 0\nv 0 1 0\nv 5 5 5\nv 6 5 5\nv 6 6 5\nv 5 6 5\nf 1 2 3 4\nf 5 6 7 8\n';
    const pieces = problem(checkSurfaceFile(new TextEncoder().encode(quads), 'two.obj').report, 'several-components');
    expect(pieces).toMatchObject({ inFile: [1, 2], inFileFrom: 1 });
  });

  it('a flipped face in a strip: two misoriented edges', () => {
    const { report } = checkSurfaceFile(fixture('misoriented-strip.obj'), 'strip.obj');
    expect(codes(report)).toEqual(['inconsistent-orientation']);
    expect(problem(report, 'inconsistent-orientation')).toMatchObject({ count: 2, examples: [2, 3, 3, 4], where: 'edge' });
  });

  it('zero-area faces, unused vertices and non-finite coordinates', () => {
    const { report } = checkSurfaceFile(fixture('degenerate-and-isolated.obj'), 'a.obj');
    expect(codes(report)).toEqual(['degenerate-faces', 'isolated-vertices', 'non-finite-coordinates', 'several-components']);
    expect(problem(report, 'degenerate-faces')).toMatchObject({ severity: 'error', count: 1, examples: [2], where: 'face' });
    expect(problem(report, 'isolated-vertices')).toMatchObject({ severity: 'warning', count: 1, examples: [7], where: 'vertex' });
    expect(problem(report, 'non-finite-coordinates')).toMatchObject({ severity: 'error', count: 1, examples: [8], where: 'vertex' });
    expect(problem(report, 'several-components')).toMatchObject({ severity: 'warning', count: 3, examples: [0, 2, 3], where: 'face' });
    // The square counts; the face with a non-finite corner does not.
    expect(report.facts!.surfaceArea).toBe(1);
  });

  it('judges flatness relative to the face’s own size, so scaling changes nothing', () => {
    for (const scale of [1e-6, 1, 1e6]) {
      const flat = (height: number) => meshOf([0, 0, 0, scale, 0, 0, scale / 2, height * scale, 0], [0, 1, 2]);
      expect(checkSurface(flat(1e-6)).ok).toBe(true);
      expect(problem(checkSurface(flat(1e-12)), 'degenerate-faces').count).toBe(1);
      expect(problem(checkSurface(flat(1e-6), { degenerateTolerance: 1e-3 }), 'degenerate-faces').count).toBe(1);
    }
    expect(problem(checkSurface(meshOf([0, 0, 0, 1, 0, 0], [0, 1, 1])), 'degenerate-faces').count).toBe(1);
  });

  it('several components, as a warning that still lets the field be computed', () => {
    const report = checkSurface(concatenate(icosphere(0), torus(2, 0.5, 6, 4), gridPlane(1, 1)));
    expect(report.ok).toBe(true);
    expect(problem(report, 'several-components')).toMatchObject({ severity: 'warning', count: 3, examples: [0, 20, 68] });
    expect(report.facts).toMatchObject({ eulerCharacteristic: 3, genus: 1, boundaryLoopCount: 1 });
  });

  it('faces referring to missing vertices, no faces, too many faces', () => {
    const report = checkSurface(meshOf([0, 0, 0, 1, 0, 0, 0, 1, 0], [0, 1, 2, 0, 2, 9, 7, 1, 2]));
    expect(problem(report, 'vertex-out-of-range')).toMatchObject({ count: 2, examples: [1, 2], where: 'face' });
    expect(report.facts!.genus).toBeNull();
    expect(problem(checkSurface(meshOf([0, 0, 0], [])), 'no-faces').severity).toBe('error');
    expect(problem(checkSurface(icosphere(1), { maxFaces: 79 }), 'too-many-faces')).toMatchObject({ count: 80 });
  });

  it('counts every problem but keeps ten examples', () => {
    const bowties: number[] = [];
    const positions: number[] = [];
    for (let i = 0; i < 15; i++) {
      const o = positions.length / 3;
      positions.push(10 * i, 0, 0, 10 * i + 1, 0, 0, 10 * i + 1, 1, 0, 10 * i + 2, 1, 0, 10 * i + 2, 2, 0);
      bowties.push(o, o + 1, o + 2, o + 2, o + 3, o + 4);
    }
    const pinched = problem(checkSurface(meshOf(positions, bowties)), 'non-manifold-vertex');
    expect(pinched.count).toBe(15);
    expect(pinched.examples).toEqual([2, 7, 12, 17, 22, 27, 32, 37, 42, 47]);
    expect(pinched.message).toMatch(/vertices 2, 7, 12, 17, 22 and 5 more/);
  });

  it('reports files that cannot be read as one file problem', () => {
    const { read, report } = checkSurfaceFile(fixture('truncated-binary.stl'), 'tetra.stl');
    expect(read).toBeNull();
    expect(report).toMatchObject({ ok: false, facts: null, problems: [{ code: 'truncated-file', severity: 'error', where: 'file', count: 1 }] });
    expect(checkSurfaceFile(fixture('empty.stl'), 'empty.stl').report.problems[0].code).toBe('empty-file');
  });

  it('passes on the faces the reader had to leave out', () => {
    const obj = new TextEncoder().encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nv 1e-9 0 0\nf 1 2 3\nf 1 4 3\n');
    const { report } = checkSurfaceFile(obj, 'thin.obj');
    expect(report.ok).toBe(true);
    expect(problem(report, 'collapsed-faces')).toMatchObject({ severity: 'warning', count: 1, examples: [1], where: 'face' });
  });

  it('passes a UV-split cube once welded (its sides mix corners with and without vt, which is reported)', () => {
    const { report } = checkSurfaceFile(fixture('uv-split-cube.obj'), 'cube.obj');
    expect(report.ok).toBe(true);
    expect(report.problems.map((p) => p.code)).toEqual(['uvs-incomplete']);
    expect(report.facts?.uvs.present).toBe(false);
    expect(report.facts).toMatchObject({ vertexCount: 8, faceCount: 12, edgeCount: 18, eulerCharacteristic: 2, genus: 0, surfaceArea: 6 });
  });
});

describe('checkSurface without the description (what prepareSurface asks for)', () => {
  it('finds the same errors on every fixture, and leaves out the genus, the pieces and the UV facts', () => {
    for (const name of ['bowtie.obj', 'degenerate-and-isolated.obj', 'fin.obj', 'misoriented-strip.obj', 'ngons-and-groups.obj', 'uv-split-cube.obj']) {
      const { read, report } = checkSurfaceFile(fixture(name), name);
      const bare = checkSurface(read!.mesh, { describe: false });
      const errors = (r: SurfaceReport) => r.problems.filter((p) => p.severity === 'error').map((p) => [p.code, p.count, p.examples]);
      expect(errors(bare), name).toEqual(errors(report));
      expect(bare.ok, name).toBe(report.ok);
      expect(bare.facts).toMatchObject({ genus: null, boundaryLoopCount: null, components: null, uvs: { present: false } });
    }
    // A sphere with a UV on every corner: the full check measures its UVs, the bare one does not look.
    const uvSphere = checkSurfaceFile(new TextEncoder().encode(transferSphere(6, 8).obj), 'sphere.obj');
    expect(uvSphere.report.facts!.uvs.present).toBe(true);
    expect(checkSurface(uvSphere.read!.mesh, { describe: false }).facts!.uvs.present).toBe(false);
  });
});

describe('checkSurface on hostile meshes', () => {
  const smallMesh = fc
    .integer({ min: 1, max: 9 })
    .chain((nV) =>
      fc.record({
        positions: fc.array(fc.oneof(fc.double({ min: -2, max: 2, noNaN: true }), fc.constantFrom(Number.NaN, Infinity)), { minLength: 3 * nV, maxLength: 3 * nV }),
        triangles: fc.array(fc.tuple(...[0, 1, 2].map(() => fc.integer({ min: 0, max: nV + 1 }))), { maxLength: 12 }),
      }),
    )
    .map(({ positions, triangles }) => meshOf(positions, triangles.flat()));

  // Meshes whose faces have three different, existing vertices: all the connectivity problems
  // and clean surfaces turn up often.
  const plausibleMesh = fc
    .integer({ min: 3, max: 8 })
    .chain((nV) =>
      fc.record({
        positions: fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 3 * nV, maxLength: 3 * nV }),
        triangles: fc.array(fc.uniqueArray(fc.integer({ min: 0, max: nV - 1 }), { minLength: 3, maxLength: 3 }), { maxLength: 10 }),
      }),
    )
    .map(({ positions, triangles }) => meshOf(positions, triangles.flat()));

  it('never throws, and agrees with buildTopology about what breaks the connectivity', () => {
    // The reference for agreement is lib/field/mesh/topology.ts's buildTopology, which the field
    // engine uses: it must accept exactly the meshes the checker finds manifold and oriented.
    fc.assert(
      fc.property(fc.oneof(smallMesh, plausibleMesh), (mesh) => {
        const report = checkSurface(mesh);
        const repeated = Array.from({ length: mesh.triangles.length / 3 }, (_, f) => new Set(mesh.triangles.subarray(3 * f, 3 * f + 3)).size < 3).some(Boolean);
        const intact = !repeated && !report.problems.some((p) => ['vertex-out-of-range', 'non-manifold-edge', 'inconsistent-orientation', 'non-manifold-vertex'].includes(p.code));
        let thrown: FieldError | null = null;
        try {
          buildTopology(mesh);
        } catch (error) {
          thrown = error as FieldError;
        }
        expect(thrown === null).toBe(intact);
        if (thrown) expect(codes(report)).toContain(thrown.code);
        if (report.ok) expect(report.facts!.genus).not.toBeNull();
      }),
      { numRuns: 4000, seed: 20261204 },
    );
  });

  it('never throws on meshes with ragged arrays, or on files of random bytes', () => {
    expect(() => checkSurface({ positions: new Float64Array(7), triangles: Uint32Array.of(0, 1, 2, 4294967295, 1) })).not.toThrow();
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2000 }), fc.constantFrom('obj', 'ply', 'stl', 'gltf', 'glb', 'txt'), (bytes, extension) => {
        checkSurfaceFile(bytes, `random.${extension}`);
      }),
      { numRuns: 500, seed: 20261204 },
    );
  });
});
