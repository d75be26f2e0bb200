import { validateBytes } from 'gltf-validator';
import { BufferGeometry, LineSegments } from 'three';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { beforeAll, describe, expect, it } from 'vitest';
import { icosphere, torus } from '@/tests/fixtures/shapes';
import { fieldToPly } from '@/lib/groom/export/field-ply';
import { guidesToGltf } from '@/lib/groom/export/gltf';
import type { Guides } from '@/lib/groom/grow/guides';
import { guidesToObj } from '@/lib/groom/export/obj';
import { guidesToUsda, type UsdCurveBasis } from '@/lib/groom/export/usda';
import { groomOn } from './support';

let sphere: ReturnType<typeof groomOn>;
let ring: ReturnType<typeof groomOn>;
const sets = (): [string, Guides][] => [
  ['a Y-up groom in cm', sphere.guides],
  ['a Z-up groom in mm', ring.guides],
];

beforeAll(() => {
  sphere = groomOn(icosphere(3, 1), {
    specVersion: 2,
    units: 'cm',
    field: { singularities: [{ point: [0, 1, 0], index: 1 }, { point: [0, -1, 0], index: 1, twist: 180 }] },
    guides: { density: 20, length: 0.5, pointsPerGuide: 8, curl: { amplitude: 0.02, wavelength: 0.2 } },
  });
  ring = groomOn(torus(20, 7, 32, 16), {
    specVersion: 2,
    units: 'mm',
    upAxis: 'z',
    field: {},
    guides: { count: 150, length: 6, pointsPerGuide: 5 },
  });
});

/** Splits line segments (pairs of points) into polylines: a new curve starts where a segment does not begin at the previous one's end. */
function chainSegments(pairs: ArrayLike<number>): number[][][] {
  const curves: number[][][] = [];
  for (let s = 0; s < pairs.length / 6; s++) {
    const a = [0, 1, 2].map((k) => pairs[6 * s + k]);
    const b = [3, 4, 5].map((k) => pairs[6 * s + k]);
    const last = curves[curves.length - 1];
    const tail = last?.[last.length - 1];
    if (tail && tail.every((x, k) => x === a[k])) last.push(b);
    else curves.push([a, b]);
  }
  return curves;
}

describe('glTF export', () => {
  // Khronos glTF Validator (npm `gltf-validator`, the reference validator of the glTF 2.0
  // specification): every export must give zero errors.
  for (const binary of [false, true]) {
    it(`${binary ? '.glb' : '.gltf'} passes the Khronos validator, and its point and curve counts read back`, async () => {
      for (const [, guides] of sets()) {
        const bytes = guidesToGltf(guides, { binary });
        const report = await validateBytes(bytes, { format: binary ? 'glb' : 'gltf', maxIssues: 0 });
        expect(report.issues.messages.filter((m) => m.severity === 0)).toEqual([]);
        expect(report.issues.numErrors).toBe(0);

        let jsonText: string;
        let bin: Uint8Array;
        if (binary) {
          const view = new DataView(bytes.buffer, bytes.byteOffset);
          const jsonLength = view.getUint32(12, true);
          jsonText = new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength));
          bin = bytes.subarray(28 + jsonLength);
        } else {
          jsonText = new TextDecoder().decode(bytes);
          const uri: string = JSON.parse(jsonText).buffers[0].uri;
          bin = new Uint8Array(Buffer.from(uri.slice(uri.indexOf(',') + 1), 'base64'));
        }
        const json = JSON.parse(jsonText);
        const primitive = json.meshes[0].primitives[0];
        expect(primitive.mode).toBe(1);
        const position = json.accessors[primitive.attributes.POSITION];
        expect(position.count).toBe(guides.count * guides.pointsPerGuide);
        const indexAccessor = json.accessors[primitive.indices];
        const view = json.bufferViews[indexAccessor.bufferView];
        const indices = new Uint32Array(bin.slice(view.byteOffset, view.byteOffset + view.byteLength).buffer);
        let curves = 0;
        for (let s = 0; s < indices.length; s += 2) if (s === 0 || indices[s] !== indices[s - 1]) curves++;
        expect(curves).toBe(guides.count);
      }
    });
  }
});

describe('OBJ export', () => {
  it('reads back through three.js’s OBJLoader as the same curves and points', () => {
    // three.js OBJLoader (three/examples/jsm/loaders/OBJLoader.js): an independent reader of the
    // Wavefront OBJ format, which turns `l` elements into line segments.
    for (const [, guides] of sets()) {
      const group = new OBJLoader().parse(guidesToObj(guides));
      const lines = group.children.filter((c): c is LineSegments => (c as LineSegments).isLineSegments);
      expect(lines.length).toBe(1);
      const position = (lines[0].geometry as BufferGeometry).getAttribute('position').array;
      const curves = chainSegments(position);
      expect(curves.length).toBe(guides.count);
      const n = guides.pointsPerGuide;
      const tolerance = 1e-6 * Math.max(...Array.from(guides.points, Math.abs));
      curves.forEach((curve, g) => {
        expect(curve.length).toBe(n);
        curve.forEach((point, j) => point.forEach((x, k) => expect(Math.abs(x - guides.points[3 * (g * n + j) + k])).toBeLessThan(tolerance)));
      });
    }
  });
});

describe('USD export', () => {
  // three.js USDAParser (three/examples/jsm/loaders/usd/USDAParser.js), an independent general
  // USDA reader; the rules checked are those of the OpenUSD UsdGeomBasisCurves schema
  // documentation (openusd.org, class UsdGeomBasisCurves): type linear|cubic, basis
  // bezier|bspline|catmullRom, wrap nonperiodic|periodic|pinned; curveVertexCounts sums to the
  // number of points; a "vertex" primvar has one value per point; cubic nonperiodic curves need
  // at least 4 vertices, pinned ones at least 2; extent bounds the curves.
  const bases: UsdCurveBasis[] = ['linear', 'bspline', 'catmullRom'];
  for (const basis of bases) {
    it(`writes ${basis} BasisCurves that parse back to the same curves and follow the schema`, () => {
      for (const [, guides] of sets()) {
        const text = guidesToUsda(guides, basis);
        const parser = new USDAParser();
        const { specsByPath } = parser.parseData(text) as { specsByPath: Record<string, { fields: Record<string, unknown> }> };
        const prim = '/Groom/Guides';
        expect(specsByPath[prim].fields.typeName).toBe('BasisCurves');
        const attr = (name: string) => specsByPath[`${prim}.${name}`]?.fields.default;
        const type = attr('type') as string;
        const wrap = attr('wrap') as string;
        expect(['linear', 'cubic']).toContain(type);
        expect(['nonperiodic', 'periodic', 'pinned']).toContain(wrap);
        if (type === 'cubic') {
          expect(['bezier', 'bspline', 'catmullRom']).toContain(attr('basis'));
          expect(attr('basis')).toBe(basis);
          expect(wrap).toBe('pinned');
        } else expect(basis).toBe('linear');
        const counts = attr('curveVertexCounts') as number[];
        const points = attr('points') as number[];
        const widths = attr('widths') as number[];
        expect(counts.length).toBe(guides.count);
        expect(counts.reduce((a, b) => a + b, 0)).toBe(points.length / 3);
        const minimum = type === 'linear' ? 2 : wrap === 'pinned' ? 2 : 4;
        for (const c of counts) expect(c).toBeGreaterThanOrEqual(minimum);
        const tolerance = 1e-6 * Math.max(...Array.from(guides.points, Math.abs));
        expect(points.length).toBe(guides.points.length);
        points.forEach((x, i) => expect(Math.abs(x - guides.points[i])).toBeLessThan(tolerance));
        // The widths' interpolation sits in the attribute's metadata block.
        const tree = parser.parseText(text) as Record<string, Record<string, Record<string | symbol, unknown>>>;
        const guidesBlock = tree['def Xform "Groom"']['def BasisCurves "Guides"'];
        const metaKey = Object.getOwnPropertySymbols(guidesBlock)[0];
        const meta = guidesBlock[metaKey] as Record<string, Record<string, string>>;
        const interpolation = meta['float[] widths'].interpolation.replace(/"/g, '');
        expect(interpolation).toBe('vertex');
        expect(widths.length).toBe(points.length / 3);
        const extent = attr('extent') as number[];
        for (let i = 0; i < points.length; i++) {
          expect(points[i]).toBeGreaterThanOrEqual(extent[i % 3]);
          expect(points[i]).toBeLessThanOrEqual(extent[3 + (i % 3)]);
        }
        expect(specsByPath['/'].fields.upAxis).toBe(guides.upAxis.toUpperCase());
        expect(specsByPath['/'].fields.metersPerUnit).toBe(guides.units === 'mm' ? 0.001 : 0.01);
      }
    });
  }
});

describe('field PLY export', () => {
  it('writes the fixed-core layout: vertices with dx dy dz, faces with dx dy dz, in binary and ASCII', () => {
    const { surface, solved } = sphere;
    const mesh = surface.mesh;
    const nV = mesh.positions.length / 3, nF = mesh.triangles.length / 3;
    for (const ascii of [false, true]) {
      const bytes = fieldToPly(mesh, solved.field, { ascii });
      const text = new TextDecoder().decode(bytes.subarray(0, 600));
      const header = text.slice(0, text.indexOf('end_header\n') + 'end_header\n'.length);
      expect(header.split('\n').filter((l) => !l.startsWith('comment'))).toEqual([
        'ply',
        `format ${ascii ? 'ascii' : 'binary_little_endian'} 1.0`,
        `element vertex ${nV}`,
        'property float x',
        'property float y',
        'property float z',
        'property float dx',
        'property float dy',
        'property float dz',
        `element face ${nF}`,
        'property list uchar int vertex_indices',
        'property float dx',
        'property float dy',
        'property float dz',
        'end_header',
        '',
      ]);
      // three.js PLYLoader, an independent PLY reader, sees the same vertices and faces.
      const geometry = new PLYLoader().parse(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
      expect(geometry.getAttribute('position').count).toBe(nV);
      expect(geometry.getIndex()!.count).toBe(3 * nF);
      if (!ascii) {
        const view = new DataView(bytes.buffer, bytes.byteOffset + header.length);
        const faceStart = 24 * nV;
        for (let f = 0; f < nF; f += 37) {
          const o = faceStart + 25 * f;
          expect(view.getUint8(o)).toBe(3);
          for (let k = 0; k < 3; k++) {
            expect(view.getInt32(o + 1 + 4 * k, true)).toBe(mesh.triangles[3 * f + k]);
            expect(view.getFloat32(o + 13 + 4 * k, true)).toBeCloseTo(solved.field.faceDirection[3 * f + k], 6);
          }
        }
        for (let v = 0; v < nV; v += 13) {
          for (let k = 0; k < 3; k++) expect(view.getFloat32(24 * v + 12 + 4 * k, true)).toBeCloseTo(solved.field.vertexDirection[3 * v + k], 6);
        }
      }
    }
  });
});
