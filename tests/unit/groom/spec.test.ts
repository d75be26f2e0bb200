import { describe, expect, it } from 'vitest';
import { GroomError } from '@/lib/groom/errors';
import { parseGroomSpec, parseGroomSpecJson, SPEC_VERSION, specToJson, validateGroomSpec } from '@/lib/groom/spec/spec';

/** The fixed core of the spec exactly as DESIGN.md publishes it (specVersion 1). */
const FIXED_CORE_EXAMPLE = {
  specVersion: 1,
  units: 'cm',
  field: {
    order: 1,
    singularities: [
      { point: [0.0, 12.5, 3.1], index: 1 },
      { vertex: 812, index: -1 },
    ],
  },
};

function problemPath(input: unknown): string {
  try {
    parseGroomSpec(input);
  } catch (error) {
    expect(error).toBeInstanceOf(GroomError);
    expect((error as GroomError).code).toBe('invalid-spec');
    expect((error as GroomError).message.startsWith((error as GroomError).path!)).toBe(true);
    return (error as GroomError).path!;
  }
  throw new Error('the spec was accepted');
}

const minimal = (extra: Record<string, unknown> = {}) => ({ specVersion: 2, units: 'cm', field: {}, ...extra });

describe('groom spec', () => {
  it('reads the published fixed core (version 1) and migrates it to the current version', () => {
    const spec = parseGroomSpec(FIXED_CORE_EXAMPLE);
    expect(spec.specVersion).toBe(SPEC_VERSION);
    expect(spec.upAxis).toBe('y');
    expect(spec.field.singularities).toEqual([
      { point: [0, 12.5, 3.1], index: 1, handedness: 'counterclockwise' },
      { vertex: 812, index: -1, handedness: 'counterclockwise' },
    ]);
    expect(spec.guides.density).toBe(1);
  });

  it('migrates version 1 curl and pins to their version 2 places', () => {
    const spec = parseGroomSpec({
      ...FIXED_CORE_EXAMPLE,
      guides: { length: 30, curl: 2, curlWavelength: 8, pins: [{ attribute: 'length', vertex: 3, value: 1.5 }] },
      units: 'mm',
    });
    expect(spec.guides.curl).toEqual({ amplitude: 2, wavelength: 8 });
    expect(spec.pins).toEqual([{ attribute: 'length', vertex: 3, value: 1.5 }]);
    expect(spec.guides.length).toBe(30);
  });

  it('fills unit-dependent defaults in the declared units', () => {
    expect(parseGroomSpec(minimal({ units: 'mm' })).guides.length).toBeCloseTo(20);
    expect(parseGroomSpec(minimal({ units: 'm' })).guides.length).toBeCloseTo(0.02);
    expect(parseGroomSpec(minimal({ units: 'in' })).guides.curl.wavelength).toBeCloseTo(1 / 2.54);
  });

  it('rejects unknown fields with their path', () => {
    expect(problemPath(minimal({ colour: 'red' }))).toBe('colour');
    expect(problemPath(minimal({ guides: { densty: 3 } }))).toBe('guides.densty');
    expect(problemPath(minimal({ field: { singularities: [{ vertex: 1, index: 1, swirl: 3 }] } }))).toBe('field.singularities[0].swirl');
    expect(problemPath({ ...FIXED_CORE_EXAMPLE, field: { ...FIXED_CORE_EXAMPLE.field, boundary: 'free' } })).toBe('field.boundary');
  });

  it('rejects values out of range with their path', () => {
    expect(problemPath(minimal({ guides: { lift: 95 } }))).toBe('guides.lift');
    expect(problemPath(minimal({ guides: { density: -1 } }))).toBe('guides.density');
    expect(problemPath(minimal({ guides: { pointsPerGuide: 1 } }))).toBe('guides.pointsPerGuide');
    expect(problemPath(minimal({ guides: { droop: 1.5 } }))).toBe('guides.droop');
    expect(problemPath(minimal({ units: 'ft' }))).toBe('units');
    expect(problemPath(minimal({ field: { order: 13 } }))).toBe('field.order');
    expect(problemPath(minimal({ field: { singularities: [{ vertex: 1, index: 0.5 }] } }))).toBe('field.singularities[0].index');
    expect(problemPath(minimal({ field: { order: 4, singularities: [{ vertex: 1, index: 0.25 }, { vertex: 2, index: 0.3 }] } }))).toBe('field.singularities[1].index');
    expect(problemPath(minimal({ pins: [{ attribute: 'length', point: [0, 0, 0], value: 11 }] }))).toBe('pins[0].value');
    expect(problemPath(minimal({ field: { singularities: [{ vertex: 1, point: [0, 0, 0], index: 1 }] } }))).toBe('field.singularities[0]');
    expect(problemPath(minimal({ guides: { density: 2, count: 100 } }))).toBe('guides');
    expect(problemPath({ ...minimal(), specVersion: 7 })).toBe('specVersion');
  });

  it('lists every problem at once for the editor', () => {
    const result = validateGroomSpec(minimal({ guides: { lift: -1, droop: 2, extra: true } }));
    expect(result.problems?.map((p) => p.path).sort()).toEqual(['guides.droop', 'guides.extra', 'guides.lift']);
  });

  it('writes itself as JSON that reads back to the same spec', () => {
    const spec = parseGroomSpec({ ...minimal(), name: 'Marten winter coat', field: { partings: [{ points: [[0, 1, 0], [0, 1, 1]] }] }, pins: [{ attribute: 'lift', vertex: 2, value: 0.5 }] });
    const text = specToJson(spec);
    expect(parseGroomSpecJson(text)).toEqual(spec);
    expect(text.endsWith('}\n')).toBe(true);
    expect(() => parseGroomSpecJson('{ not json')).toThrow(/not valid JSON/);
  });
});
