import { beforeAll, describe, expect, it } from 'vitest';
import { solveField } from '@/lib/field';
import { prepareGroomSurface, solveGroomField } from '@/lib/groom';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import { FieldDrawing } from '@/lib/studio/client/field-drawing';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import { solvePart } from '@/lib/studio/client/protocol';
import { uvSphere } from '@/tests/fixtures/shapes';

const RINGS = 30, SEGMENTS = 36;
const strokes = { drawing: 'strokes', density: 800 } as const;
const streamlines = { drawing: 'streamlines', density: 2400 } as const;

/** The bench's groom (tests/browser/bench/drag-bench.ts): two twisted whorls on a sphere of radius 10. */
function benchSpec(first: [number, number, number]): GroomSpec {
  return parseGroomSpec({
    specVersion: 2,
    units: 'cm',
    upAxis: 'z',
    field: { singularities: [{ point: first, index: 1, twist: 0 }, { point: [-10, 0, 0], index: 1, twist: 180 }] },
    guides: { density: 2, length: 1.5 },
  });
}

describe('the field engine while a whorl is dragged', () => {
  const mesh = uvSphere(RINGS, SEGMENTS, 10);
  const engine = new FieldEngine();
  /** Vertices along the equator near +x: the places the drag visits, one after the other. */
  const places = [0, 1, 2, 3, 4, 5].map((j) => {
    const v = 1 + (RINGS / 2 - 1) * SEGMENTS + j;
    return Array.from(mesh.positions.subarray(3 * v, 3 * v + 3)) as [number, number, number];
  });

  beforeAll(async () => {
    const bytes = new TextEncoder().encode(surfaceToObj(mesh, 'sphere')).buffer as ArrayBuffer;
    await engine.open({ kind: 'bytes', bytes, fileName: 'sphere.obj' }, 'free');
  });

  it('quick solves draw the field of each place; the place let go of is solved fully and proved, and draws the same strokes', () => {
    let last = null as ReturnType<FieldEngine['solve']> | null;
    for (const place of places) {
      last = engine.solve(benchSpec(place), strokes, true);
      expect(last.error).toBeNull();
      expect(last.proof).toBeNull();
      expect(last.lineShade).toBeNull(); // short strokes: tail and head alternate
    }
    const released = engine.solve(benchSpec(places[places.length - 1]), strokes, false);
    expect(released.proof).toMatchObject({ strays: 0, mismatches: 0, nonZeroCount: 2, measuredSum: 2 });
    expect(released.singularities.map((s) => s.measured)).toEqual([expect.closeTo(1, 6), expect.closeTo(1, 6)]);
    // The same spec, the same field: the quick drawing is the proved one's, to the last bit.
    expect(Array.from(last!.lines!)).toEqual(Array.from(released.lines!));
  });

  it('each short stroke lies along the field’s direction in its face, as a separately prepared surface’s proved solve gives it', () => {
    const spec = benchSpec(places[3]);
    const report = engine.solve(spec, strokes, true);
    const surface = prepareGroomSurface(mesh, { boundary: 'free' });
    const solved = solveGroomField(spec, surface);
    const d = solved.field.faceDirection;
    const lines = report.lines!;
    const centroid = new Float64Array(3);
    let checked = 0;
    for (let i = 0; i < lines.length / 6; i++) {
      const tail = lines.subarray(6 * i, 6 * i + 3), head = lines.subarray(6 * i + 3, 6 * i + 6);
      const along = [0, 1, 2].map((k) => head[k] - tail[k]);
      const length = Math.hypot(...along);
      // The stroke's face: the one whose centroid is nearest the stroke's middle (lifted off the skin by 8% of an edge).
      for (let k = 0; k < 3; k++) centroid[k] = (head[k] + tail[k]) / 2;
      let face = -1, best = Infinity;
      for (let f = 0; f < surface.mesh.triangles.length / 3; f++) {
        let dist = 0;
        for (let k = 0; k < 3; k++) {
          const c = (surface.mesh.positions[3 * surface.mesh.triangles[3 * f] + k] + surface.mesh.positions[3 * surface.mesh.triangles[3 * f + 1] + k] + surface.mesh.positions[3 * surface.mesh.triangles[3 * f + 2] + k]) / 3;
          dist += (c - centroid[k]) ** 2;
        }
        if (dist < best) {
          best = dist;
          face = f;
        }
      }
      for (let k = 0; k < 3; k++) expect(along[k] / length).toBeCloseTo(d[3 * face + k], 5);
      if (++checked === 40) break;
    }
    expect(checked).toBe(40);
    // And the field is the one lib/field proves on its own.
    expect(() => solveField(surface.field, engine.requestFor(spec))).not.toThrow();
  });

  it('streamlines traced into the kept buffers: a drawing is not changed by the next one, and the same field draws the same lines', () => {
    const first = engine.solve(benchSpec(places[0]), streamlines, true);
    const copy = Float32Array.from(first.lines!);
    const second = engine.solve(benchSpec(places[5]), streamlines, true);
    expect(Array.from(first.lines!)).toEqual(Array.from(copy));
    expect(second.lines!.buffer).not.toBe(first.lines!.buffer);
    expect(second.lineShade!.length * 3).toBe(second.lines!.length);
    const again = engine.solve(benchSpec(places[0]), streamlines, false);
    expect(Array.from(again.lines!)).toEqual(Array.from(copy));
  });

  it('a solve request carries the spec without what a solve never reads (guide sets, painted maps, symmetry), and solves the same', () => {
    const spec = parseGroomSpec({
      ...benchSpec(places[2]),
      guideSets: [{ name: 'crown', guides: { density: 3 } }],
      symmetry: { axis: 'x' },
    });
    const part = solvePart(spec);
    expect(Object.keys(part).sort()).toEqual(['field', 'guides', 'pins', 'specVersion', 'units', 'upAxis']);
    const whole = engine.solve(spec, strokes, false);
    const sent = engine.solve(structuredClone(part), strokes, false);
    expect(Array.from(sent.lines!)).toEqual(Array.from(whole.lines!));
    expect(sent.proof).toEqual(whole.proof);
  });

  it('draws strokes without working out the field’s directions over the whole surface', () => {
    const surface = prepareGroomSurface(mesh, { boundary: 'free' });
    const solved = solveGroomField(benchSpec(places[1]), surface);
    let read = 0;
    const watched = Object.defineProperty({ ...solved.field }, 'faceDirection', { get: () => (read++, solved.field.faceDirection) });
    new FieldDrawing(surface).draw({ field: watched, requestedIndex: solved.connection.requestedIndex, cutEdge: solved.connection.cutEdge }, strokes);
    expect(read).toBe(0);
  });
});
