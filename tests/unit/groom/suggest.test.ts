import { describe, expect, it } from 'vitest';
import { readSurface, solveField, type TriangleMesh } from '@/lib/field';
import { fieldRequestFromSpec, GroomError, prepareGroomSurface, specFromSuggestion, specToJson, parseGroomSpecJson, suggestGroomSpec } from '@/lib/groom';
import { icosphere, roundedCube } from '@/tests/fixtures/shapes';

/** An ASCII STL of the mesh: every triangle with its own three corners, as STL stores them, so reading welds them. */
function asciiStl(mesh: TriangleMesh): Uint8Array {
  const p = mesh.positions;
  const lines = ['solid test'];
  for (let f = 0; f < mesh.triangles.length / 3; f++) {
    lines.push('facet normal 0 0 0', 'outer loop');
    for (let k = 0; k < 3; k++) {
      const v = 3 * mesh.triangles[3 * f + k];
      lines.push(`vertex ${p[v]} ${p[v + 1]} ${p[v + 2]}`);
    }
    lines.push('endloop', 'endfacet');
  }
  lines.push('endsolid test');
  return new TextEncoder().encode(lines.join('\n'));
}

describe('a suggested layout as a groom spec', () => {
  // The spec names file vertices; an STL numbers every corner of every triangle anew, so each
  // welded vertex has several file numbers and the spec must name one that welds back to it.
  it('names welded vertices by a file vertex that maps back to them, and solves to exactly the suggestion', () => {
    const { mesh } = readSurface(asciiStl(roundedCube(8, 0.25)), 'cube.stl');
    expect(mesh.fileVertexToVertex!.length).toBe(3 * (mesh.triangles.length / 3));
    const surface = prepareGroomSurface(mesh);
    const { spec, layout } = suggestGroomSpec(surface, { specVersion: 2, units: 'cm', field: {} }, { order: 4 });
    // Source: a cross field on a cube has eight +1/4 singularities, one per corner (see tests/unit/field/suggest.test.ts).
    expect(layout.singularities.map((s) => s.index)).toEqual(Array(8).fill(0.25));
    const reread = parseGroomSpecJson(specToJson(spec));
    const request = fieldRequestFromSpec(reread, surface);
    expect(request.singularities).toEqual(layout.singularities.map((s) => ({ vertex: s.vertex, index: s.index })));
    const solved = solveField(surface.field, request);
    const asked = new Map(layout.singularities.map((s) => [s.vertex, s.index]));
    solved.measuredIndex.forEach((index, v) => expect(Math.abs(index - (asked.get(v) ?? 0))).toBeLessThan(1e-6));
  });

  it('keeps the base spec\'s settings and drops its curves and strokes', () => {
    const surface = prepareGroomSurface(icosphere(2, 5));
    const base = { specVersion: 2 as const, units: 'mm' as const, upAxis: 'z' as const, field: { order: 2, strokes: [{ points: [[0, 0, 5], [0, 1, 4.9]] as [number, number, number][] }] }, guides: { density: 3, lift: 40 } };
    const { spec } = suggestGroomSpec(surface, base, { order: 1 });
    expect(spec.units).toBe('mm');
    expect(spec.upAxis).toBe('z');
    expect(spec.guides.lift).toBe(40);
    expect(spec.field.order).toBe(1);
    expect(spec.field.strokes).toEqual([]);
    expect(spec.field.singularities.reduce((s, x) => s + x.index, 0)).toBe(2);
  });

  it('refuses a suggestion with more singularities than a spec holds', () => {
    const surface = prepareGroomSurface(icosphere(2));
    const many = { order: 1, faceDirection: new Float64Array(0), faceValue: new Float64Array(0), singularities: Array.from({ length: 257 }, (_, v) => ({ vertex: v, index: 1 })), energy: 0, iterations: 0, timings: { assembleMilliseconds: 0, factorMilliseconds: 0, solveMilliseconds: 0, measureMilliseconds: 0 } };
    expect(() => specFromSuggestion(surface, many, { specVersion: 2, units: 'cm', field: {} })).toThrow(GroomError);
  });
});
