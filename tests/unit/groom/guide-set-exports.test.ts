import { validateBytes } from 'gltf-validator';
import { LineSegments, type BufferGeometry } from 'three';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { describe, expect, it } from 'vitest';
import { writeExport } from '@/lib/groom/export/write';
import { objGroupNames, OBJ_ROOT_RECORD, OBJ_SET_RECORD } from '@/lib/groom/export/obj';
import { usdPrimNames } from '@/lib/groom/export/usda';
import { previewGuides } from '@/lib/groom/export/preview';
import { coatFacts } from '@/lib/groom/grow/coat-facts';
import { icosphere } from '@/tests/fixtures/shapes';
import { groomOn, readGlb, withGroups } from './support';

// Two sets on the unit sphere, Z up (so the glTF's axis turn is exercised), with names that are no
// valid prim names as they stand: a space, and a leading digit.
const mesh = withGroups(icosphere(3, 1), ['north', 'south'], (_x, _y, z) => (z >= 0 ? 0 : 1));
const made = groomOn(mesh, {
  specVersion: 3,
  units: 'cm',
  upAxis: 'z',
  field: { singularities: [{ point: [0, 0, 1], index: 1 }, { point: [0, 0, -1], index: 1 }] },
  guideSets: [
    { name: 'crown tufts', region: { groups: ['north'] }, guides: { count: 120, length: 0.3, pointsPerGuide: 6, seed: 2, hairsPerGuide: 40 } },
    { name: '2nd coat', region: { groups: ['south'] }, guides: { count: 80, length: 0.9, pointsPerGuide: 6, seed: 3 } },
  ],
});
const [crown, second] = made.guides.sets!;
const n = made.guides.pointsPerGuide;

describe('guide sets in the exports', () => {
  it('makes valid, distinct prim and group names', () => {
    // OpenUSD identifiers: [A-Za-z_][A-Za-z0-9_]* (OpenUSD's SdfPath rules for prim names).
    expect(usdPrimNames(['crown tufts', '2nd coat', 'crown_tufts', 'é'])).toEqual(['crown_tufts', '_2nd_coat', 'crown_tufts_2', '_']);
    expect(objGroupNames(['crown tufts', 'crown_tufts', ' '])).toEqual(['crown_tufts', 'crown_tufts_2', '_']);
  });

  it('writes each set as its own BasisCurves prim under /Groom/Guides, read back by three.js’s USDAParser', () => {
    const usda = writeExport('usda', made, { withSurface: true }) as string;
    // three/examples/jsm/loaders/usd/USDAParser.js (r187), an independent USDA reader.
    const { specsByPath } = new USDAParser().parseData(usda);
    const at = (path: string, name: string) => specsByPath[`${path}.${name}`]?.fields.default;
    expect(specsByPath['/Groom/Guides'].fields.typeName).toBe('Scope');
    for (const [path, set, length] of [['/Groom/Guides/crown_tufts', crown, 0.3], ['/Groom/Guides/_2nd_coat', second, 0.9]] as const) {
      expect(specsByPath[path].fields.typeName).toBe('BasisCurves');
      expect(at(path, 'whorlwind:guideSet')).toBe(set.name);
      // UsdGeomBasisCurves: curveVertexCounts has one entry per curve and sums to the points.
      const counts = at(path, 'curveVertexCounts') as number[];
      expect(counts).toHaveLength(set.count);
      expect((at(path, 'points') as number[]).length).toBe(3 * n * set.count);
      expect((at(path, 'primvars:whorlwind:guideId') as number[]).length).toBe(set.count);
      expect(at(path, 'primvars:hairsPerGuide')).toBe(set.hairsPerGuide);
      // The set's own points, in order: its first guide's root and last guide's tip.
      const points = at(path, 'points') as number[];
      const g = made.guides.points;
      for (const [written, own] of [[0, 3 * n * set.first], [points.length - 3, 3 * n * (set.first + set.count) - 3]]) {
        for (let k = 0; k < 3; k++) expect(points[written + k]).toBeCloseTo(g[own + k], 5);
      }
      const lengths = at(path, 'primvars:whorlwind:length') as number[];
      expect(lengths.reduce((s, x) => s + x, 0) / lengths.length).toBeGreaterThan(0.8 * length);
    }
    // The curves point at the surface written beside them.
    expect(specsByPath['/Groom/Surface'].fields.typeName).toBe('Mesh');
  });

  it('writes each set as its own node and mesh, named by the set, that pass the Khronos validator', async () => {
    for (const format of ['gltf', 'glb'] as const) {
      const bytes = writeExport(format, made, { withSurface: true }) as Uint8Array;
      const report = await validateBytes(bytes, { format, maxIssues: 0 });
      expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    }
    const { json, values } = readGlb(writeExport('glb', made, { withSurface: true }) as Uint8Array);
    expect(json.nodes.map((node: { name: string }) => node.name)).toEqual(['crown tufts', '2nd coat', 'Surface']);
    for (const [i, set] of [crown, second].entries()) {
      const mesh = json.meshes[i];
      expect(mesh.name).toBe(set.name);
      expect(mesh.extras).toMatchObject({ guideCount: set.count, hairsPerGuide: set.hairsPerGuide, whorlwind: { guideSet: set.name } });
      expect(json.accessors[mesh.primitives[0].attributes.POSITION].count).toBe(n * set.count);
      const ids = values(mesh.extras.whorlwind.binding.guideId);
      expect(ids).toEqual(Array.from(made.guides.guideId.slice(set.first, set.first + set.count)));
      // surfaceTriangle is the set's own guides' faces.
      expect(values(mesh.extras.whorlwind.binding.surfaceTriangle)).toEqual(Array.from(made.guides.rootFace.slice(set.first, set.first + set.count)));
    }
  });

  it('writes each set as an OBJ group, read back by three.js’s OBJLoader, with a record per set', () => {
    const obj = writeExport('obj', made, {}) as string;
    const group = new OBJLoader().parse(obj);
    // three's OBJLoader starts an object at each `g` line and names it by the group.
    const lines = group.children.filter((c): c is LineSegments => c instanceof LineSegments);
    expect(lines.map((c) => c.name)).toEqual(['crown_tufts', '2nd_coat']);
    lines.forEach((c, i) => expect(((c.geometry as BufferGeometry).getAttribute('position').count)).toBe(2 * (n - 1) * [crown, second][i].count));
    const records = obj.split('\n').filter((l) => l.startsWith(`${OBJ_SET_RECORD} `));
    expect(records).toEqual([`${OBJ_SET_RECORD} crown_tufts 0 120 "crown tufts"`, `${OBJ_SET_RECORD} 2nd_coat 120 80 "2nd coat"`]);
    expect(obj.split('\n').filter((l) => l.startsWith(`${OBJ_ROOT_RECORD} `))).toHaveLength(200);
  });

  it('previews a share of every set, not only the first', () => {
    const preview = previewGuides(made.guides, { share: 0.1, pointsPerGuide: 2, maxGuides: 1000 });
    expect(preview.count).toBe(12 + 8);
    // The 13th kept guide is the second set's first (its lowest id): its root, as written.
    for (let k = 0; k < 3; k++) expect(preview.points[3 * 2 * 12 + k]).toBe(made.guides.points[3 * n * second.first + k]);
    expect(previewGuides(made.guides, { share: 1, pointsPerGuide: 2, maxGuides: 100 }).count).toBe(60 + 40);
  });

  it('states the coat over all its sets', () => {
    const facts = coatFacts(made.surface, made.spec, made.guides);
    // Both halves: the whole icosphere (area within 1 % of 4π for level 3, from its own faces).
    const whole = made.surface.faceArea.reduce((s, a) => s + a, 0);
    expect(facts.growthAreaSquareCm).toBeCloseTo(whole, 10);
    expect(facts.hairsPerGuide).toBeCloseTo((120 * 40 + 80 * 100) / 200, 12);
    expect(facts.length.combed).toBeCloseTo((120 * 0.3 + 80 * 0.9) / 200, 12);
    expect(facts.regions).toEqual(['north', 'south']);
  });
});
