import { validateBytes } from 'gltf-validator';
import { Mesh, LineSegments, type BufferGeometry } from 'three';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { USDLoader } from 'three/examples/jsm/loaders/USDLoader.js';
import { beforeAll, describe, expect, it } from 'vitest';
import { readSurface, surfaceArea } from '@/lib/field';
import { writeExport, type GroomMade } from '@/lib/groom/export/write';
import { growGuides } from '@/lib/groom/grow/guides';
import { solveGroomField } from '@/lib/groom/place/request';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { quadSphere } from '@/tests/fixtures/quad-sphere';
import { readGlb } from './support';

const text = (s: string) => new TextEncoder().encode(s);
const PROVENANCE = { groomId: '5f0c6d1e-2a4b-4c7d-9e8f-0a1b2c3d4e5f', specRevision: 12, whorlwindVersion: '0.1.0' };

let made: GroomMade & { guides: NonNullable<GroomMade['guides']> };
/** The surface's size: the diagonal of its bounding box, in the spec's units. */
let size: number;

beforeAll(() => {
  // Radius 3 cm, Z up, so that the glTF's metres and axis turn are exercised.
  const sphere = quadSphere(10, 16, { radius: 3 });
  const spec = parseGroomSpec({
    specVersion: 2,
    units: 'cm',
    upAxis: 'z',
    field: { singularities: [{ point: [0, 3, 0], index: 1 }, { point: [0, -3, 0], index: 1 }] },
    guides: { count: 250, length: 0.8, pointsPerGuide: 6, seed: 4 },
  });
  const mesh = readSurface(text(sphere.obj), 'sphere.obj').mesh;
  const surface = prepareGroomSurface(mesh, { boundary: spec.field.boundary });
  const { guides } = growGuides(surface, solveGroomField(spec, surface), spec);
  made = { spec, surface, guides };
  size = surface.diagonal;
});

/** The first point of curve g, from a flat list of points and the points per curve. */
const firstPoint = (points: ArrayLike<number>, n: number, g: number) => [0, 1, 2].map((a) => points[3 * n * g + a]);

describe('USD binding data', () => {
  // Read back by three.js's USDAParser (three/examples/jsm/loaders/usd/USDAParser.js, r187), an
  // independent USDA reader. Rules from the OpenUSD documentation: UsdGeomBasisCurves — a
  // "uniform" primvar has one value per curve; UsdGeomMesh — faceVertexCounts, faceVertexIndices
  // and points describe the polygons, a "faceVarying" primvar has one value per face corner.
  let usda: string;
  let attr: (prim: string, name: string) => unknown;
  beforeAll(() => {
    usda = writeExport('usda', made, { withSurface: true, provenance: PROVENANCE }) as string;
    const { specsByPath } = new USDAParser().parseData(usda);
    attr = (prim, name) => specsByPath[`/Groom/${prim}.${name}`]?.fields.default;
    expect(specsByPath['/Groom/Surface'].fields.typeName).toBe('Mesh');
    expect(specsByPath['/'].fields).toMatchObject({ upAxis: 'Z', metersPerUnit: 0.01 });
  });

  it('rebuilds every root from rootFace, rootCorners and rootBarycentric on the written surface, to 1e-5 of its size', () => {
    const counts = attr('Surface', 'faceVertexCounts') as number[];
    const indices = attr('Surface', 'faceVertexIndices') as number[];
    const points = attr('Surface', 'points') as number[];
    const curvePoints = attr('Guides', 'points') as number[];
    const rootFace = attr('Guides', 'primvars:whorlwind:rootFace') as number[];
    const corners = attr('Guides', 'primvars:whorlwind:rootCorners') as number[];
    const weights = attr('Guides', 'primvars:whorlwind:rootBarycentric') as number[];
    const n = made.guides.pointsPerGuide;
    expect(rootFace.length).toBe(made.guides.count);
    const start = [0];
    for (const c of counts) start.push(start[start.length - 1] + c);
    for (let g = 0; g < made.guides.count; g++) {
      const root = [0, 0, 0];
      for (let i = 0; i < 3; i++) {
        expect(corners[3 * g + i]).toBeLessThan(counts[rootFace[g]]);
        const v = indices[start[rootFace[g]] + corners[3 * g + i]];
        for (let a = 0; a < 3; a++) root[a] += weights[3 * g + i] * points[3 * v + a];
      }
      const first = firstPoint(curvePoints, n, g);
      expect(Math.hypot(root[0] - first[0], root[1] - first[1], root[2] - first[2]) / size).toBeLessThan(1e-5);
    }
  });

  it('gives rootUv equal to the surface’s st interpolated at the root', () => {
    const counts = attr('Surface', 'faceVertexCounts') as number[];
    const st = attr('Surface', 'primvars:st') as number[];
    expect(st.length / 2).toBe(counts.reduce((a, b) => a + b, 0));
    const rootFace = attr('Guides', 'primvars:whorlwind:rootFace') as number[];
    const corners = attr('Guides', 'primvars:whorlwind:rootCorners') as number[];
    const weights = attr('Guides', 'primvars:whorlwind:rootBarycentric') as number[];
    const rootUv = attr('Guides', 'primvars:whorlwind:rootUv') as number[];
    const start = [0];
    for (const c of counts) start.push(start[start.length - 1] + c);
    for (let g = 0; g < made.guides.count; g++) {
      for (let a = 0; a < 2; a++) {
        let expected = 0;
        for (let i = 0; i < 3; i++) expected += weights[3 * g + i] * st[2 * (start[rootFace[g]] + corners[3 * g + i]) + a];
        expect(Math.abs(rootUv[2 * g + a] - expected)).toBeLessThan(1e-6);
      }
    }
  });

  it('writes ids, triangles and lengths per curve, every binding primvar "uniform"', () => {
    expect(attr('Guides', 'primvars:whorlwind:guideId')).toEqual(Array.from({ length: made.guides.count }, (_x, g) => g));
    const triangle = attr('Guides', 'primvars:whorlwind:rootTriangle') as number[];
    expect(new Set(triangle)).toEqual(new Set([0, 1]));
    const curvePoints = attr('Guides', 'points') as number[];
    const lengths = attr('Guides', 'primvars:whorlwind:length') as number[];
    const n = made.guides.pointsPerGuide;
    for (let g = 0; g < made.guides.count; g++) {
      let arc = 0;
      for (let j = 1; j < n; j++) arc += Math.hypot(...[0, 1, 2].map((a) => curvePoints[3 * (n * g + j) + a] - curvePoints[3 * (n * g + j - 1) + a]));
      expect(Math.abs(lengths[g] - arc) / arc).toBeLessThan(1e-5);
    }
    const tree = new USDAParser().parseText(usda) as Record<string, Record<string, Record<string | symbol, unknown>>>;
    const block = tree['def Xform "Groom"']['def BasisCurves "Guides"'];
    const meta = block[Object.getOwnPropertySymbols(block)[0]] as Record<string, Record<string, string>>;
    for (const name of ['int[] primvars:whorlwind:guideId', 'int[] primvars:whorlwind:rootFace', 'int[] primvars:whorlwind:rootTriangle', 'int3[] primvars:whorlwind:rootCorners', 'float3[] primvars:whorlwind:rootBarycentric', 'texCoord2f[] primvars:whorlwind:rootUv', 'float[] primvars:whorlwind:length']) {
      expect(meta[name]?.interpolation.replace(/"/g, ''), name).toBe('uniform');
    }
  });

  it('writes a Mesh prim that three.js’s USDLoader (r187) builds into the same surface: triangles, area and corner UVs', () => {
    const surfaces: Mesh[] = [];
    new USDLoader().parse(usda).traverse((object) => {
      if (object instanceof Mesh && object.name === 'Surface') surfaces.push(object);
    });
    expect(surfaces).toHaveLength(1);
    const geometry = surfaces[0].geometry as BufferGeometry;
    const position = geometry.getAttribute('position');
    const uv = geometry.getAttribute('uv');
    const mesh = made.surface!.mesh;
    // The loader cuts each quad its own way, so compare what does not depend on the cut.
    const triangles = (geometry.index ? geometry.index.count : position.count) / 3;
    expect(triangles).toBe(mesh.triangles.length / 3);
    let area = 0;
    const corner = (i: number) => (geometry.index ? geometry.index.getX(i) : i);
    for (let t = 0; t < triangles; t++) {
      const [a, b, c] = [0, 1, 2].map((k) => [position.getX(corner(3 * t + k)), position.getY(corner(3 * t + k)), position.getZ(corner(3 * t + k))]);
      const u = [0, 1, 2].map((k) => b[k] - a[k]), v = [0, 1, 2].map((k) => c[k] - a[k]);
      area += 0.5 * Math.hypot(u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]);
    }
    expect(Math.abs(area / surfaceArea(mesh) - 1)).toBeLessThan(1e-5);
    const key = (u: number, v: number) => `${u.toFixed(5)} ${v.toFixed(5)}`;
    const loaded = new Set(Array.from({ length: position.count }, (_x, i) => key(uv.getX(i), uv.getY(i))));
    const ours = new Set(Array.from({ length: mesh.cornerUvs!.length / 2 }, (_x, i) => key(mesh.cornerUvs![2 * i], mesh.cornerUvs![2 * i + 1])));
    expect(loaded).toEqual(ours);
  });

  it('records its provenance in customLayerData, and leaves the surface out unless asked', () => {
    const tree = new USDAParser().parseText(usda) as Record<string, Record<string, Record<string, Record<string, string>>>>;
    const data = tree['#usda 1.0'].customLayerData['dictionary whorlwind'];
    expect(JSON.parse(data['string groomId'])).toBe(PROVENANCE.groomId);
    expect(Number(data['int specRevision'])).toBe(12);
    expect(JSON.parse(data['string version'])).toBe('0.1.0');
    const plain = writeExport('usda', made) as string;
    expect(plain).not.toMatch(/def Mesh/);
    expect(plain).toMatch(/primvars:whorlwind:rootFace/);
  });
});

describe('glTF binding data', () => {
  it('passes the Khronos validator with the surface and binding accessors, as .gltf and .glb', async () => {
    for (const format of ['gltf', 'glb'] as const) {
      const bytes = writeExport(format, made, { withSurface: true, provenance: PROVENANCE }) as Uint8Array;
      const report = await validateBytes(bytes, { format, maxIssues: 0 });
      expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    }
  });

  it('rebuilds every root from surfaceTriangle and rootBarycentric on the Surface mesh, and rootUv from its TEXCOORD_0', () => {
    const { json, values } = readGlb(writeExport('glb', made, { withSurface: true, provenance: PROVENANCE }) as Uint8Array);
    expect(json.asset.extras.whorlwind).toEqual(PROVENANCE);
    const binding = json.meshes[0].extras.whorlwind.binding;
    const surface = json.meshes.find((m: { name: string }) => m.name === 'Surface').primitives[0].attributes;
    const corners = values(surface.POSITION);
    const uvs = values(surface.TEXCOORD_0);
    const guidePoints = values(json.meshes[0].primitives[0].attributes.POSITION);
    const triangle = values(binding.surfaceTriangle);
    const weights = values(binding.rootBarycentric);
    const rootUv = values(binding.rootUv);
    expect(values(binding.guideId)).toEqual(Array.from(made.guides.guideId));
    expect(values(binding.rootFace)).toEqual(Array.from(made.guides.binding.polygon));
    const n = made.guides.pointsPerGuide;
    // glTF is in metres: the spec's cm × 0.01.
    for (let g = 0; g < made.guides.count; g++) {
      const root = [0, 0, 0];
      const uv = [0, 0];
      for (let i = 0; i < 3; i++) {
        const vertex = 3 * triangle[g] + i;
        for (let a = 0; a < 3; a++) root[a] += weights[3 * g + i] * corners[3 * vertex + a];
        for (let a = 0; a < 2; a++) uv[a] += weights[3 * g + i] * uvs[2 * vertex + a];
      }
      const first = firstPoint(guidePoints, n, g);
      expect(Math.hypot(root[0] - first[0], root[1] - first[1], root[2] - first[2]) / (0.01 * size)).toBeLessThan(1e-5);
      for (let a = 0; a < 2; a++) expect(Math.abs(uv[a] - rootUv[2 * g + a])).toBeLessThan(1e-6);
    }
  });
});

describe('OBJ binding data', () => {
  it('writes the surface in the file’s numbering and one record per guide that rebuilds its root, read back by three.js’s OBJLoader', () => {
    const obj = writeExport('obj', made, { withSurface: true, provenance: PROVENANCE }) as string;
    const group = new OBJLoader().parse(obj);
    expect(group.children.map((c) => c.name)).toEqual(['surface', 'guides']);
    expect(group.children[0]).toBeInstanceOf(Mesh);
    expect(group.children[1]).toBeInstanceOf(LineSegments);
    const segments = (group.children[1] as LineSegments).geometry as BufferGeometry;
    expect(segments.getAttribute('position').count).toBe(2 * (made.guides.pointsPerGuide - 1) * made.guides.count);

    // An independent reading of the text: v, vt and f of the surface, then the records.
    const v: number[][] = [];
    const vt: number[][] = [];
    const faces: { v: number[]; t: number[] }[] = [];
    const firstOfGuide: number[] = [];
    const records: string[][] = [];
    for (const line of obj.split('\n')) {
      const words = line.trim().split(/\s+/);
      if (words[0] === 'v') v.push(words.slice(1).map(Number));
      else if (words[0] === 'vt') vt.push(words.slice(1).map(Number));
      else if (words[0] === 'f') faces.push({ v: words.slice(1).map((w) => Number(w.split('/')[0]) - 1), t: words.slice(1).map((w) => Number(w.split('/')[1]) - 1) });
      else if (words[0] === 'l') firstOfGuide.push(Number(words[1]) - 1);
      else if (words[0] === '#whorlwind-root') records.push(words.slice(1));
    }
    const sphere = quadSphere(10, 16, { radius: 3 });
    expect(faces.map((f) => f.v)).toEqual(sphere.polygons.map((p) => p.vertices));
    expect(records.length).toBe(made.guides.count);
    for (const record of records) {
      const [id, face, , c0, c1, c2, w0, w1, w2, , u, uvV] = record.map(Number);
      const polygon = faces[face];
      const root = [0, 0, 0];
      const uv = [0, 0];
      [c0, c1, c2].forEach((c, i) => {
        const w = [w0, w1, w2][i];
        for (let a = 0; a < 3; a++) root[a] += w * v[polygon.v[c]][a];
        for (let a = 0; a < 2; a++) uv[a] += w * vt[polygon.t[c]][a];
      });
      const first = v[firstOfGuide[id]];
      expect(Math.hypot(root[0] - first[0], root[1] - first[1], root[2] - first[2]) / size).toBeLessThan(1e-5);
      expect(Math.abs(uv[0] - u)).toBeLessThan(1e-6);
      expect(Math.abs(uv[1] - uvV)).toBeLessThan(1e-6);
    }
  });
});
