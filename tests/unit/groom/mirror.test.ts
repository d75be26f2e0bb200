import { describe, expect, it } from 'vitest';
import type { TriangleMesh } from '@/lib/field';
import { mirrorSymmetricShape } from '@/tests/fixtures/shapes';
import { parseGroomSpec, parseGroomSpecJson, specToJson, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { prepareGroomSurface, type GroomSurface } from '@/lib/groom/place/surface';
import { solveGroomField } from '@/lib/groom/place/request';
import { vertexOfPlace } from '@/lib/groom/place/place';
import { growGuides } from '@/lib/groom/grow/guides';
import { detectMirrorPlane, SYMMETRIC_MISMATCH } from '@/lib/groom/place/mirror-plane';
import { mirrorDirection, mirrorPoint, planeOfSymmetry, type MirrorPlane } from '@/lib/groom/spec/symmetry';
import { isOnPlane, mirrorSingularity, mirrorSpecFeatures } from '@/lib/groom/place/mirror-features';
import { GroomError } from '@/lib/groom/errors';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import { worstMirrorGap } from './support';


const X_PLANE: MirrorPlane = { normal: [1, 0, 0], offset: 0 };
const surface = prepareGroomSurface(mirrorSymmetricShape());

/** Rotation about a unit axis by an angle (Rodrigues), applied to every vertex, then a shift. */
function moved(mesh: TriangleMesh, axis: number[], angle: number, shift: number[]): TriangleMesh {
  const p = Float64Array.from(mesh.positions);
  const [kx, ky, kz] = axis, c = Math.cos(angle), s = Math.sin(angle);
  for (let v = 0; v < p.length / 3; v++) {
    const [x, y, z] = [p[3 * v], p[3 * v + 1], p[3 * v + 2]];
    const dot = kx * x + ky * y + kz * z;
    const cross = [ky * z - kz * y, kz * x - kx * z, kx * y - ky * x];
    const r = [x * c + cross[0] * s + kx * dot * (1 - c), y * c + cross[1] * s + ky * dot * (1 - c), z * c + cross[2] * s + kz * dot * (1 - c)];
    for (let k = 0; k < 3; k++) p[3 * v + k] = r[k] + shift[k];
  }
  return { positions: p, triangles: mesh.triangles };
}

describe('the mirror plane of a surface', () => {
  it('finds x = 0 on the exactly symmetric shape, with no mismatch', () => {
    const found = detectMirrorPlane(surface);
    expect(found.plane.normal[0]).toBeCloseTo(1, 12);
    expect(Math.abs(found.plane.offset)).toBeLessThan(1e-12);
    expect(found.mismatch).toBeLessThan(1e-12);
    expect(found.symmetric).toBe(true);
  });

  it('finds a plane that is not a world axis: the shape turned and moved, the plane turned and moved with it', () => {
    const axis = [1, 2, 2].map((c) => c / 3);
    const angle = 0.7;
    const shift = [0.3, -0.2, 1.5];
    const found = detectMirrorPlane(prepareGroomSurface(moved(mirrorSymmetricShape(), axis, angle, shift)));
    // The plane x = 0 turned the same way: its normal is the turned x axis, through the moved origin.
    const normal = moved({ positions: Float64Array.of(1, 0, 0), triangles: new Uint32Array() }, axis, angle, [0, 0, 0]).positions;
    const alignment = Math.abs(normal[0] * found.plane.normal[0] + normal[1] * found.plane.normal[1] + normal[2] * found.plane.normal[2]);
    expect(alignment).toBeGreaterThan(1 - 1e-9);
    const sign = Math.sign(normal[0] * found.plane.normal[0] + normal[1] * found.plane.normal[1] + normal[2] * found.plane.normal[2]);
    expect(sign * found.plane.offset).toBeCloseTo(normal[0] * shift[0] + normal[1] * shift[1] + normal[2] * shift[2], 9);
    expect(found.mismatch).toBeLessThan(1e-9);
  });

  it('calls a lopsided surface not symmetric and says by how much', () => {
    const lopsided = mirrorSymmetricShape();
    const p = lopsided.positions;
    // One cheek pushed out by 20 % of the radius: no plane maps the surface onto itself.
    for (let v = 0; v < p.length / 3; v++) if (p[3 * v] > 0.3 && p[3 * v + 2] > 0) p[3 * v] *= 1.2;
    const found = detectMirrorPlane(prepareGroomSurface(lopsided));
    expect(found.symmetric).toBe(false);
    expect(found.mismatch).toBeGreaterThan(SYMMETRIC_MISMATCH);
  });

  it('finds the demo fox symmetric about x = 0 (Bramble is sculpted symmetric)', () => {
    const fox = DEMO_GROOMS.find((g) => g.id === 'bramble-fox-head')!;
    const found = detectMirrorPlane(prepareGroomSurface(fox.surface()));
    expect(found.symmetric).toBe(true);
    expect(found.plane.normal[0]).toBeCloseTo(1, 9);
  });
});

describe('the spec names its plane', () => {
  const base = { specVersion: 3 as const, units: 'cm' as const, field: {} };
  it('reads an axis or a normal and offset, and writes them back', () => {
    const byAxis = parseGroomSpec({ ...base, symmetry: { axis: 'x' } });
    expect(planeOfSymmetry(byAxis.symmetry!)).toEqual({ normal: [1, 0, 0], offset: 0 });
    const byNormal = parseGroomSpec({ ...base, symmetry: { normal: [0, 0, 2], offset: 3 } });
    expect(planeOfSymmetry(byNormal.symmetry!)).toEqual({ normal: [0, 0, 1], offset: 1.5 });
    expect(parseGroomSpecJson(specToJson(byNormal))).toEqual(byNormal);
    expect(parseGroomSpec(base).symmetry).toBeUndefined();
  });
  it('refuses a zero normal and a plane given both ways', () => {
    expect(() => parseGroomSpec({ ...base, symmetry: { normal: [0, 0, 0], offset: 0 } })).toThrow(GroomError);
    expect(() => parseGroomSpec({ ...base, symmetry: { axis: 'x', normal: [1, 0, 0], offset: 0 } } as unknown as GroomSpecInput)).toThrow(GroomError);
  });
});

describe('features mirrored', () => {
  it('reverses a spiral: a clockwise twist becomes the same twist anticlockwise; outflow stays outflow', () => {
    const spiral = mirrorSingularity(surface, X_PLANE, { point: [0.7, 0.5, 0.5], index: 1, twist: 40, handedness: 'clockwise' });
    expect(spiral.twist).toBeCloseTo(40, 12);
    expect(spiral.handedness).toBe('counterclockwise');
    expect(spiral.point).toEqual([-0.7, 0.5, 0.5]);
    expect(mirrorSingularity(surface, X_PLANE, spiral).handedness).toBe('clockwise');
    const outflow = mirrorSingularity(surface, X_PLANE, { point: [0.7, 0.5, 0.5], index: 1, twist: 0, handedness: 'counterclockwise' });
    expect(outflow.twist).toBe(0);
  });

  it('doubles the positive side, keeps places on the plane once and drops the negative side', () => {
    const spec = parseGroomSpec({
      specVersion: 3,
      units: 'cm',
      field: {
        singularities: [{ point: [0.7, 0.5, 0.5], index: 1 }, { vertex: 0, index: -1 }, { point: [-0.6, -0.5, 0.5], index: 1 }],
        strokes: [{ points: [[0.6, -0.9, 0.4], [0.7, -0.7, 0.5]] }],
        partings: [{ points: [[0.5, 0.9, -0.3], [0.6, 0.7, -0.5]] }],
      },
      pins: [{ point: [0.5, -0.2, 0.8], attribute: 'length', value: 2 }],
    });
    // Vertex 0 of the icosphere is (−1, φ, 0) normalised: off the plane; find one on it.
    const onPlane = [...Array(surface.mesh.positions.length / 3).keys()].find((v) => surface.mesh.positions[3 * v] === 0 && surface.mesh.positions[3 * v + 1] > 0)!;
    spec.field.singularities[1] = { vertex: onPlane, index: -1, handedness: 'counterclockwise' };
    expect(isOnPlane(surface, X_PLANE, { vertex: onPlane })).toBe(true);
    const mirrored = mirrorSpecFeatures(spec, surface, X_PLANE);
    expect(mirrored.field.singularities.map((s) => s.point ?? s.vertex)).toEqual([[0.7, 0.5, 0.5], [-0.7, 0.5, 0.5], onPlane]);
    expect(mirrored.field.strokes[1].points).toEqual([[-0.6, -0.9, 0.4], [-0.7, -0.7, 0.5]]);
    // The stroke's direction mirrored: from point to point, x reversed, y and z kept.
    const d0 = [0.1, 0.2, 0.1];
    const s1 = mirrored.field.strokes[1].points;
    expect([s1[1][0] - s1[0][0], s1[1][1] - s1[0][1], s1[1][2] - s1[0][2]].map((c) => Number(c.toFixed(12)))).toEqual(mirrorDirection(X_PLANE, d0).map((c) => Number(c.toFixed(12))));
    expect(mirrored.field.partings[1].points).toEqual([[-0.5, 0.9, -0.3], [-0.6, 0.7, -0.5]]);
    expect(mirrored.pins.map((p) => p.point)).toEqual([[0.5, -0.2, 0.8], [-0.5, -0.2, 0.8]]);
    // Mirroring a symmetric spec again changes nothing.
    expect(mirrorSpecFeatures(mirrored, surface, X_PLANE)).toEqual(mirrored);
  });
});

describe('a mirrored spec on a symmetric surface', () => {
  // One side's features: a whorl, a flow stroke (it fixes the field's turn, which nothing else
  // would fix symmetrically: the engine starts an unfixed field from its first face) and a pin.
  // Jitter off here; with every per-guide variation on, see mirror-grow.test.ts.
  const half: GroomSpecInput = {
    specVersion: 3,
    units: 'cm',
    field: { singularities: [{ point: [0.7, 0.5, 0.5], index: 1 }], strokes: [{ points: [[0.6, -0.9, 0.4], [0.7, -0.7, 0.5], [0.8, -0.5, 0.55]] }] },
    guides: { count: 400, length: 0.5, jitter: 0, lift: 30, droop: 0.4 },
    pins: [{ point: [0.5, -0.2, 0.8], attribute: 'length', value: 2 }],
    symmetry: { axis: 'x' },
  };
  const spec = mirrorSpecFeatures(parseGroomSpec(half), surface, X_PLANE);
  const solved = solveGroomField(spec, surface);

  it('solves with the indices mirrored: every vertex measures the index of its mirror vertex (solveField’s proof)', () => {
    const p = surface.mesh.positions;
    const requested = spec.field.singularities.map((s, i) => vertexOfPlace(surface, s, `s${i}`));
    expect(requested).toHaveLength(2);
    for (let v = 0; v < p.length / 3; v++) {
      const w = vertexOfPlace(surface, { point: mirrorPoint(X_PLANE, [p[3 * v], p[3 * v + 1], p[3 * v + 2]]) }, 'mirror');
      // Measured as a sum of angles over 2π: equal up to rounding (the indices are whole here).
      expect(Math.abs(solved.measuredIndex[w] - solved.measuredIndex[v])).toBeLessThan(1e-9);
    }
    expect(requested.map((v) => Math.round(solved.measuredIndex[v] * 1e9) / 1e9)).toEqual([1, 1]);
  });

  it('grows guides that mirror each other within 1e-6 of the surface size, with the roots of one side mirrored', () => {
    const grown = growGuides(surface, solved, spec, { mirrorRootsAcross: X_PLANE });
    const { gap, paired } = worstMirrorGap(grown.guides.points, grown.guides.count, grown.guides.pointsPerGuide, X_PLANE);
    expect(paired).toBeGreaterThan(150);
    expect(gap / surface.diagonal).toBeLessThan(1e-6);
    // The sampler alone is not symmetric (candidates drawn face by face from a hash): without the
    // mirrored roots (no `symmetry`, no option) some guide has no mirror image.
    const { symmetry: _off, ...unmirrored } = spec;
    const plain = growGuides(surface, solved, unmirrored);
    expect(worstMirrorGap(plain.guides.points, plain.guides.count, plain.guides.pointsPerGuide, X_PLANE).gap / surface.diagonal).toBeGreaterThan(1e-3);
  });

  it('reverses a spiral’s twist in the solved field: −40° off the outward direction in the whorl’s first face, +40° off its mirror image in the mirror face', () => {
    const twisted = mirrorSpecFeatures(parseGroomSpec({ ...half, field: { ...half.field, singularities: [{ point: [0.7, 0.5, 0.5], index: 1, twist: 40, handedness: 'clockwise' }] } }), surface, X_PLANE);
    const field = solveGroomField(twisted, surface);
    const [v, w] = twisted.field.singularities.map((s, i) => vertexOfPlace(surface, s, `s${i}`));
    const first = firstFace(surface, v);
    expect(twistInFace(surface, field.field.faceDirection, v, first)).toBeCloseTo(-40, 6);
    expect(twistInFace(surface, field.field.faceDirection, w, mirrorFaceOf(surface, first))).toBeCloseTo(40, 6);
    expect(twisted.field.singularities.map((s) => Math.round(field.measuredIndex[vertexOfPlace(surface, s, 's')] * 1e9) / 1e9)).toEqual([1, 1]);
  });
});

describe('a twisted whorl and its twin, nothing else fixing the field (issue 16’s symmetry check)', () => {
  // Only the whorl is placed; its twin comes from mirrorSpecFeatures with the twist reversed and
  // measured from the mirrored direction (twistFrom), so the engine fixes the mirror image of the
  // whorl's twisted face. The minimal-norm connection of a reflected request is the reflected
  // connection (it is unique), so the fields must agree face by face up to rounding.
  for (const [index, twist] of [[1, 40], [1, 150]] as const) {
    it(`a whorl twisted ${twist}° clockwise: every face’s vector is its mirror face’s reflected within 1e-9, unit within 1e-9; indices mirrored, twists reversed`, () => {
      const spec = mirrorSpecFeatures(
        parseGroomSpec({ specVersion: 3, units: 'cm', field: { singularities: [{ point: [0.7, 0.5, 0.5], index, twist, handedness: 'clockwise' }] } }),
        surface,
        X_PLANE,
      );
      const [s, t] = spec.field.singularities;
      expect(t).toMatchObject({ index, twist, handedness: 'counterclockwise' });
      expect(s.twistFrom).toBeUndefined();
      const solved = solveGroomField(spec, surface);
      const d = solved.field.faceDirection, nF = d.length / 3;
      let gap = 0, unit = 0;
      for (let f = 0; f < nF; f++) {
        const g = mirrorFaceOf(surface, f);
        gap = Math.max(gap, Math.hypot(-d[3 * f] - d[3 * g], d[3 * f + 1] - d[3 * g + 1], d[3 * f + 2] - d[3 * g + 2]));
        unit = Math.max(unit, Math.abs(Math.hypot(d[3 * f], d[3 * f + 1], d[3 * f + 2]) - 1));
      }
      expect(gap).toBeLessThan(1e-9);
      expect(unit).toBeLessThan(1e-9);
      const p = surface.mesh.positions;
      for (let v = 0; v < p.length / 3; v++) {
        const w = vertexOfPlace(surface, { point: mirrorPoint(X_PLANE, [p[3 * v], p[3 * v + 1], p[3 * v + 2]]) }, 'mirror');
        expect(Math.abs(solved.measuredIndex[w] - solved.measuredIndex[v])).toBeLessThan(1e-9);
      }
      const [v, w] = [s, t].map((x, i) => vertexOfPlace(surface, x, `s${i}`));
      const first = firstFace(surface, v);
      expect(twistInFace(surface, d, v, first)).toBeCloseTo(-twist, 6);
      expect(twistInFace(surface, d, w, mirrorFaceOf(surface, first))).toBeCloseTo(twist, 6);
    });
  }
});

function firstFace(surface: GroomSurface, v: number): number {
  return (surface.field.topology.vertexHalfedge[v] / 3) | 0;
}

/** The face the reflection x → −x maps face f onto (the test shape is exactly symmetric). */
function mirrorFaceOf(surface: GroomSurface, f: number): number {
  const t = surface.field.topology.triangles, p = surface.mesh.positions;
  const mirrored = [0, 1, 2].map((k) => vertexOfPlace(surface, { point: mirrorPoint(X_PLANE, [p[3 * t[3 * f + k]], p[3 * t[3 * f + k] + 1], p[3 * t[3 * f + k] + 2]]) }, 'm')).sort((a, b) => a - b).join(',');
  for (let g = 0; g < t.length / 3; g++) if ([t[3 * g], t[3 * g + 1], t[3 * g + 2]].sort((a, b) => a - b).join(',') === mirrored) return g;
  throw new Error(`no mirror face of ${f}`);
}

/** The field's angle in degrees in face f, counterclockwise seen from outside, from the direction out of vertex v to f's centroid. */
function twistInFace(surface: GroomSurface, faceDirection: Float64Array, v: number, f: number): number {
  const t = surface.field.topology, p = surface.mesh.positions;
  const c = [0, 1, 2].map((k) => (p[3 * t.triangles[3 * f] + k] + p[3 * t.triangles[3 * f + 1] + k] + p[3 * t.triangles[3 * f + 2] + k]) / 3 - p[3 * v + k]);
  const n = surface.field.frames.normal.subarray(3 * f, 3 * f + 3);
  const d = faceDirection.subarray(3 * f, 3 * f + 3);
  const cross = [c[1] * d[2] - c[2] * d[1], c[2] * d[0] - c[0] * d[2], c[0] * d[1] - c[1] * d[0]];
  return (Math.atan2(cross[0] * n[0] + cross[1] * n[1] + cross[2] * n[2], c[0] * d[0] + c[1] * d[1] + c[2] * d[2]) * 180) / Math.PI;
}
