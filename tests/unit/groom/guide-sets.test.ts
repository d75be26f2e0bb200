import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { icosphere } from '@/tests/fixtures/shapes';
import { parseGroomSpec, parseGroomSpecJson, specToJson, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { setRegionMask } from '@/lib/groom/place/set-region';
import { bindRoots } from '@/lib/groom/grow/binding';
import { groomOn, withGroups } from './support';

type Vec3 = [number, number, number];
const field = { singularities: [{ point: [0, 1, 0] as Vec3, index: 1, twist: 30 }, { point: [0, -1, 0] as Vec3, index: 1, twist: 150, handedness: 'clockwise' as const }] };
const block = { density: 60, length: 0.4, lift: 25, droop: 0.5, curl: { amplitude: 0.02, wavelength: 0.15 }, jitter: 0.5 };
const hashOf = (a: Float64Array) => createHash('sha256').update(Buffer.from(a.buffer, a.byteOffset, a.byteLength)).digest('hex');
// North and south halves of the unit icosphere as OBJ-style groups.
const mesh = withGroups(icosphere(3, 1), ['north', 'south'], (_x, y) => (y >= 0 ? 0 : 1));

const setsSpec = (north: Record<string, unknown>, south: Record<string, unknown>): GroomSpecInput => ({
  specVersion: 3,
  units: 'cm',
  field,
  guideSets: [
    { name: 'crown', region: { groups: ['north'] }, guides: { ...block, ...north } },
    { name: 'under coat', region: { groups: ['south'] }, guides: { ...block, ...south } },
  ],
});

describe('guide sets in the spec', () => {
  it('leaves a spec without sets as it was: no guideSets written, the same guides as before sets existed', () => {
    const plain = { specVersion: 2 as const, units: 'cm' as const, field, guides: block };
    const spec = parseGroomSpec(plain);
    expect('guideSets' in spec).toBe(false);
    expect(parseGroomSpecJson(specToJson(spec))).toEqual(spec);
    // The hash tests/unit/groom/tufts.test.ts holds for this groom, grown before version 3 (commit 3abd111).
    const { guides } = groomOn(icosphere(3, 1), plain);
    expect(guides.count).toBe(750);
    expect(hashOf(guides.points)).toBe('9e715d5ea9e3f3c097d7c1ed3399dc7690385c7b5262619c89ecc354a988f9dd');
    expect(guides.sets).toBeUndefined();
  });

  it('resolves every set and writes them back unchanged', () => {
    const spec = parseGroomSpec(setsSpec({ length: 0.6 }, { seed: 7 }));
    expect(spec.guideSets!.map((s) => s.name)).toEqual(['crown', 'under coat']);
    expect(spec.guideSets![0].guides.length).toBe(0.6);
    expect(spec.guideSets![1].guides.pointsPerGuide).toBe(16);
    expect(spec.guideSets![1].guides.tipWidth).toBeCloseTo(0.2 * spec.guideSets![1].guides.width, 15);
    expect(parseGroomSpecJson(specToJson(spec))).toEqual(spec);
  });

  it('names what is wrong with a set by its path', () => {
    const bad = (sets: unknown[], partings: unknown[] = []) => () => parseGroomSpec({ specVersion: 3, units: 'cm', field: { ...field, partings }, guideSets: sets });
    expect(bad([{ name: 'a' }, { name: 'a' }])).toThrow(/guideSets\[1\]\.name: "a" is already the name of guide set 0/);
    expect(bad([{ name: 'a', region: { partings: [0], from: { point: [0, 1, 0] } } }])).toThrow(/guideSets\[0\]\.region\.partings\[0\]: there is no parting 0/);
    expect(bad([{ name: 'a', region: { partings: [0] } }], [{ points: [[1, 0, 0], [0, 0, 1]] }])).toThrow(/needs both "partings".*and "from"/);
    expect(bad([{ name: 'a', region: { groups: ['x'], partings: [0], from: { vertex: 0 } } }], [{ vertices: [0, 1] }])).toThrow(/either "groups" or "partings"/);
    expect(bad([{ name: 'a' }, { name: 'b', guides: { pointsPerGuide: 8 } }])).toThrow(/guideSets\[1\]\.guides\.pointsPerGuide: every guide set must have the same points per guide \(16/);
    expect(bad([{ name: 'a', guides: { regions: ['north'] } }])).toThrow(/guideSets\[0\]\.guides\.regions: a guide set grows on its "region"/);
    expect(bad([{ name: '  ' }])).toThrow(/guideSets\[0\]\.name/);
    expect(bad([])).toThrow(/guideSets/);
  });
});

describe('growing guide sets', () => {
  const both = groomOn(mesh, setsSpec({}, { length: 0.8, seed: 5 }));

  it('grows one set on one region exactly as its settings grow there alone', () => {
    const alone = groomOn(mesh, { specVersion: 3, units: 'cm', field, guides: { ...block, regions: ['north'] } });
    const g = both.guides;
    const crown = g.sets![0];
    expect(crown).toMatchObject({ name: 'crown', first: 0, count: alone.guides.count, hairsPerGuide: 100 });
    const n = g.pointsPerGuide;
    expect(hashOf(g.points.slice(0, 3 * n * crown.count))).toBe(hashOf(alone.guides.points));
    expect(Array.from(g.guideId.slice(0, crown.count))).toEqual(Array.from(alone.guides.guideId));
  });

  it('says which set each guide is in, and grows each only on its own region', () => {
    const g = both.guides;
    const [crown, under] = g.sets!;
    expect(under.first).toBe(crown.count);
    expect(crown.count + under.count).toBe(g.count);
    for (let i = 0; i < g.count; i++) {
      const set = g.guideSet![i];
      expect(set).toBe(i < crown.count ? 0 : 1);
      expect(mesh.groups!.groupOfFace[g.rootFace[i]]).toBe(set);
    }
    // The joined binding is the binding of the joined roots (lib/groom/grow/binding.ts).
    const bound = bindRoots(mesh, g.rootFace, g.rootBarycentric);
    expect(Array.from(g.binding.polygon)).toEqual(Array.from(bound.polygon));
    expect(Array.from(g.binding.weights)).toEqual(Array.from(bound.weights));
    // Ids are each set's own: both runs count from 0.
    expect(g.guideId[0]).toBe(0);
    expect(g.guideId[under.first]).toBe(0);
  });

  it("keeps one set's guides and ids when another set changes", () => {
    const changed = groomOn(mesh, setsSpec({}, { length: 1.2, density: 90, seed: 9, tufts: { density: 5 } })).guides;
    const g = both.guides;
    const n = g.pointsPerGuide;
    const k = g.sets![0].count;
    expect(changed.sets![0].count).toBe(k);
    expect(hashOf(changed.points.slice(0, 3 * n * k))).toBe(hashOf(g.points.slice(0, 3 * n * k)));
    expect(Array.from(changed.rootFace.slice(0, k))).toEqual(Array.from(g.rootFace.slice(0, k)));
    // The other set did change: longer guides, more of them.
    expect(changed.sets![1].count).toBeGreaterThan(g.sets![1].count);
    expect(changed.length[k]).toBeGreaterThan(g.length[g.sets![1].first]);
  });

  it('keeps the whole groom inside the points budget, naming the set that takes it over', () => {
    const huge = { density: undefined, count: 200_000 };
    expect(() => parseGroomSpec(setsSpec(huge, huge))).toThrow(/guideSets\[1\]\.guides\.count: with this set the groom has 400,000 guides × 16 points is 6,400,000 points/);
  });
});

describe('the side of a parting', () => {
  // A closed parting round the equator (our own worked example: it cuts the sphere into two caps).
  const ring = Array.from({ length: 12 }, (_x, i): Vec3 => [Math.cos((i * Math.PI) / 6), 0, Math.sin((i * Math.PI) / 6)]);
  const specWith = (partings: unknown[], from: Record<string, unknown>) =>
    parseGroomSpec({ specVersion: 3, units: 'cm', field: { ...field, partings }, guideSets: [{ name: 'cap', region: { partings: [0], from } }] });
  const surface = prepareGroomSurface(mesh);

  it('is every face reachable without crossing the parting, and the two sides share no face', () => {
    const north = specWith([{ points: ring, closed: true }], { point: [0, 1, 0] });
    const south = specWith([{ points: ring, closed: true }], { point: [0, -1, 0] });
    const a = setRegionMask(surface, north, north.guideSets![0].region, 'guideSets[0].region');
    const b = setRegionMask(surface, south, south.guideSets![0].region, 'guideSets[0].region');
    const p = mesh.positions, tri = mesh.triangles;
    for (let f = 0; f < a.length; f++) {
      expect(a[f] + b[f]).toBe(1);
      const cy = (p[3 * tri[3 * f] + 1] + p[3 * tri[3 * f + 1] + 1] + p[3 * tri[3 * f + 2] + 1]) / 3;
      // The edge path of the parting keeps near the equator (within a couple of edges of level 3).
      if (cy > 0.25) expect(a[f]).toBe(1);
      if (cy < -0.25) expect(b[f]).toBe(1);
    }
    const sum = (m: Uint8Array) => m.reduce((s, x) => s + x, 0);
    expect(Math.abs(sum(a) - sum(b))).toBeLessThan(0.2 * a.length);
  });

  it('refuses a parting that does not cut the surface in two, in words', () => {
    const arc = specWith([{ points: ring.slice(0, 4) }], { point: [0, 1, 0] });
    expect(() => setRegionMask(surface, arc, arc.guideSets![0].region, 'guideSets[0].region')).toThrow(
      /guideSets\[0\]\.region: parting 0 does not cut the surface in two: every face of the piece guideSets\[0\]\.region\.from lies on is reachable from it without crossing it/,
    );
  });

  it('refuses a starting vertex that lies on the parting', () => {
    const onIt = specWith([{ points: ring, closed: true }], { point: [0, 1, 0] });
    const v = surface.nearestVertex().find(1, 0, 0).vertex;
    const region = { ...onIt.guideSets![0].region, from: { vertex: v } };
    expect(() => setRegionMask(surface, onIt, region, 'guideSets[0].region')).toThrow(/guideSets\[0\]\.region\.from: the vertex lies on the parting/);
  });

  it('grows a set on its side only', () => {
    const { guides } = groomOn(mesh, { specVersion: 3, units: 'cm', field: { ...field, partings: [{ points: ring, closed: true }] }, guideSets: [{ name: 'cap', region: { partings: [0], from: { point: [0, 1, 0] } }, guides: block }] });
    expect(guides.count).toBeGreaterThan(100);
    for (let i = 0; i < guides.count; i++) expect(guides.points[3 * guides.pointsPerGuide * i + 1]).toBeGreaterThan(-0.3);
  });
});

describe('guide sets carried onto another surface', () => {
  it('states each set’s lengths in the new units and carries its groups by the region map', async () => {
    const { transferSpec } = await import('@/lib/groom/transfer/transfer');
    const { identityOfMesh } = await import('@/lib/groom/transfer/identity');
    // The same sphere in millimetres, its groups named anew.
    const scaled = { ...mesh, positions: mesh.positions.map((x) => 10 * x), groups: { names: ['top', 'bottom'], groupOfFace: mesh.groups!.groupOfFace } };
    const spec = parseGroomSpec(setsSpec({ length: 0.6, waver: { amplitude: 0.05 } }, {}));
    const side = (m: typeof mesh, units?: 'mm') => ({ surface: prepareGroomSurface(m), identity: identityOfMesh(m), ...(units ? { units } : {}) });
    const { spec: carried, report } = transferSpec(spec, side(mesh), side(scaled, 'mm'), { regionMap: { north: 'top' } });
    const [crown, under] = carried.guideSets!;
    // 1 cm = 10 mm.
    expect(crown.guides.length).toBeCloseTo(6, 9);
    expect(crown.guides.waver!.amplitude).toBeCloseTo(0.5, 9);
    expect(crown.guides.width).toBeCloseTo(10 * spec.guideSets![0].guides.width, 9);
    expect(crown.region).toEqual({ groups: ['top'] });
    // "south" has no counterpart: left out, and said so.
    expect(under.region).toEqual({ groups: [] });
    expect(report.notCarried).toContainEqual({ path: 'guideSets[1].region.groups[0]', reason: 'the new surface has no group "south"' });
  });

  it('states the groom’s own block in the new units too: length, both widths, curl and the waver', async () => {
    const { transferSpec } = await import('@/lib/groom/transfer/transfer');
    const { identityOfMesh } = await import('@/lib/groom/transfer/identity');
    const scaled = { ...mesh, positions: mesh.positions.map((x) => 10 * x) };
    const spec = parseGroomSpec({ specVersion: 3, units: 'cm', field, guides: { count: 50, length: 0.6, width: 0.02, tipWidth: 0.005, curl: { amplitude: 0.1, wavelength: 0.4 }, waver: { amplitude: 0.05 } } });
    const side = (m: typeof mesh, units?: 'mm') => ({ surface: prepareGroomSurface(m), identity: identityOfMesh(m), ...(units ? { units } : {}) });
    const { guides } = transferSpec(spec, side(mesh), side(scaled, 'mm')).spec;
    // 1 cm = 10 mm.
    expect(guides.length).toBeCloseTo(6, 9);
    expect(guides.width).toBeCloseTo(0.2, 9);
    expect(guides.tipWidth).toBeCloseTo(0.05, 9);
    expect(guides.curl).toEqual({ amplitude: expect.closeTo(1, 9), wavelength: expect.closeTo(4, 9) });
    expect(guides.waver!.amplitude).toBeCloseTo(0.5, 9);
  });
});
