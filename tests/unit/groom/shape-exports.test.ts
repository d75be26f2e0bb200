import { validateBytes } from 'gltf-validator';
import { LineSegments } from 'three';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { beforeAll, describe, expect, it } from 'vitest';
import { writeExport, type GroomMade } from '@/lib/groom/export/write';
import { NO_TUFT } from '@/lib/groom/export/gltf';
import { OBJ_SHAPE_RECORD } from '@/lib/groom/export/obj';
import { icosphere } from '@/tests/fixtures/shapes';
import { groomOn, readGlb } from './support';

let made: GroomMade & { guides: NonNullable<GroomMade['guides']> };

beforeAll(() => {
  // Two levels of tufts, a share of loners (tuft −1) and width pins, so every value varies.
  const { spec, surface, guides } = groomOn(icosphere(3, 1), {
    specVersion: 3,
    units: 'cm',
    field: { singularities: [{ point: [0, 1, 0], index: 1 }, { point: [0, -1, 0], index: 1 }] },
    guides: { count: 300, length: 0.4, pointsPerGuide: 6, width: 0.02, tipWidth: 0.004, tufts: { density: 1, inner: { density: 4 }, loners: 0.2 } },
    pins: [{ attribute: 'width', point: [1, 0, 0], value: 2 }, { attribute: 'width', point: [-1, 0, 0], value: 0.5 }],
  });
  made = { spec, surface, guides };
  expect(guides.tuft.some((t) => t === -1)).toBe(true);
  expect(new Set(guides.innerTuft).size).toBeGreaterThan(3);
});

const close = (a: ArrayLike<number>, b: ArrayLike<number>, relative: number) => {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < a.length; i++) expect(Math.abs(a[i] - b[i])).toBeLessThanOrEqual(relative * Math.abs(b[i]) + 1e-12);
};

describe('the shaping data in every guide export', () => {
  it('USD: uniform primvars tuft, innerTuft, rootWidth and tipWidth, and per-point widths from each guide’s own, read by three.js’s USDAParser (r187)', () => {
    // OpenUSD, UsdGeomBasisCurves: a "uniform" primvar has one value per curve; `widths` with
    // "vertex" interpolation one per point.
    const usda = writeExport('usda', made) as string;
    const { specsByPath } = new USDAParser().parseData(usda);
    const attr = (name: string) => specsByPath[`/Groom/Guides.${name}`]?.fields.default as number[];
    const g = made.guides;
    expect(attr('primvars:whorlwind:tuft')).toEqual(Array.from(g.tuft));
    expect(attr('primvars:whorlwind:innerTuft')).toEqual(Array.from(g.innerTuft));
    close(attr('primvars:whorlwind:rootWidth'), g.guideRootWidth, 1e-6);
    close(attr('primvars:whorlwind:tipWidth'), g.guideTipWidth, 1e-6);
    const widths = attr('widths');
    const n = g.pointsPerGuide;
    expect(widths).toHaveLength(g.count * n);
    close(Array.from({ length: g.count }, (_x, i) => widths[i * n]), g.guideRootWidth, 1e-6);
    close(Array.from({ length: g.count }, (_x, i) => widths[i * n + n - 1]), g.guideTipWidth, 1e-6);
    const tree = new USDAParser().parseText(usda) as Record<string, Record<string, Record<string | symbol, unknown>>>;
    const block = tree['def Xform "Groom"']['def BasisCurves "Guides"'];
    const meta = block[Object.getOwnPropertySymbols(block)[0]] as Record<string, Record<string, string>>;
    for (const name of ['int[] primvars:whorlwind:tuft', 'int[] primvars:whorlwind:innerTuft', 'float[] primvars:whorlwind:rootWidth', 'float[] primvars:whorlwind:tipWidth']) {
      expect(meta[name]?.interpolation.replace(/"/g, ''), name).toBe('uniform');
    }
  });

  it('glTF: passes the Khronos validator with the shaping accessors; values in metres, NO_TUFT for none', async () => {
    for (const format of ['gltf', 'glb'] as const) {
      const bytes = writeExport(format, made) as Uint8Array;
      const report = await validateBytes(bytes, { format, maxIssues: 0 });
      expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    }
    const { json, values } = readGlb(writeExport('glb', made) as Uint8Array);
    const binding = json.meshes[0].extras.whorlwind.binding;
    const g = made.guides;
    expect(values(binding.tuft)).toEqual(Array.from(g.tuft, (t) => (t < 0 ? NO_TUFT : t)));
    expect(values(binding.innerTuft)).toEqual(Array.from(g.innerTuft, (t) => (t < 0 ? NO_TUFT : t)));
    // glTF is in metres: the spec's cm × 0.01.
    close(values(binding.rootWidth), Array.from(g.guideRootWidth, (x) => x * 0.01), 1e-6);
    close(values(binding.tipWidth), Array.from(g.guideTipWidth, (x) => x * 0.01), 1e-6);
    const widths = values(json.meshes[0].primitives[0].attributes._WIDTH);
    const n = g.pointsPerGuide;
    close(Array.from({ length: g.count }, (_x, i) => widths[i * n + n - 1]), Array.from(g.guideTipWidth, (x) => x * 0.01), 1e-6);
  });

  it('OBJ: one shaping record per guide in id order, which three.js’s OBJLoader skips', () => {
    const obj = writeExport('obj', made) as string;
    const group = new OBJLoader().parse(obj);
    expect(group.children).toHaveLength(1);
    expect(group.children[0]).toBeInstanceOf(LineSegments);
    const records = obj.split('\n').filter((line) => line.startsWith(`${OBJ_SHAPE_RECORD} `)).map((line) => line.split(' ').slice(1).map(Number));
    const g = made.guides;
    expect(records.map((r) => r[0])).toEqual(Array.from(g.guideId));
    expect(records.map((r) => r[1])).toEqual(Array.from(g.tuft));
    expect(records.map((r) => r[2])).toEqual(Array.from(g.innerTuft));
    close(records.map((r) => r[3]), g.guideRootWidth, 1e-6);
    close(records.map((r) => r[4]), g.guideTipWidth, 1e-6);
  });
});
