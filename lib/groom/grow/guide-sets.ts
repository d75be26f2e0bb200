import { now } from '../../field';
import { GroomError } from '../errors';
import { setRegionMask } from '../place/set-region';
import { MAX_GUIDE_POINTS, guidePointsProblem, type GroomSpec, type GuideSettings } from '../spec/spec';
import type { GroomSurface } from '../place/surface';
import type { GrowOptions, GrowResult, GuideSetRange, Guides } from './grown';

export type { GuideSetRange } from './grown';

/** Grows one block of settings on a mask of faces; `at` is its spec path, `started` when the set's work began. */
export type GrowSet = (settings: GuideSettings, mask: Uint8Array, at: string, options: GrowOptions, started: number) => GrowResult;

/**
 * Grows each of the spec's guide sets on its own region with its own settings and puts them
 * together, set after set.
 *
 * Guarantees: each set's guides are exactly those its settings grow alone on its region (its
 * roots, ids, points and widths depend on nothing in another set, so changing one set never
 * changes another's guides); `guides.sets` and `guides.guideSet` say which set each guide is in;
 * tuft numbers are made unique across the groom (a set's count on from the sets before it); the
 * whole groom keeps the points budget (GroomError `too-many-guides` naming the first set that takes
 * it over; each set alone is checked before it grows). With `sampleOf`, each set grows at most its share (sampleOf ÷ sets).
 */
export function growGuideSets(surface: GroomSurface, spec: GroomSpec, options: GrowOptions, t0: number, growSet: GrowSet): GrowResult {
  const sets = spec.guideSets!;
  const grown: GrowResult[] = [];
  let total = 0;
  let started = t0;
  sets.forEach((set, i) => {
    const at = `guideSets[${i}]`;
    const mask = setRegionMask(surface, spec, set.region, `${at}.region`);
    const setOptions = options.sampleOf !== undefined ? { ...options, sampleOf: Math.max(1, Math.floor(options.sampleOf / sets.length)) } : options;
    const result = growSet(set.guides, mask, `${at}.guides`, setOptions, started);
    started = now();
    total += result.guides.count;
    if (total * set.guides.pointsPerGuide > MAX_GUIDE_POINTS) {
      throw new GroomError('too-many-guides', `${at}: with this set the groom has ${guidePointsProblem(total, set.guides.pointsPerGuide)}`, `${at}.guides`);
    }
    grown.push(result);
  });
  return joinSets(spec, sets.map((s) => s.name), grown);
}

function joinSets(spec: GroomSpec, names: readonly string[], grown: readonly GrowResult[]): GrowResult {
  const count = grown.reduce((sum, r) => sum + r.guides.count, 0);
  const n = grown[0].guides.pointsPerGuide;
  const points = new Float64Array(3 * n * count);
  const guideId = new Uint32Array(count), rootFace = new Uint32Array(count), rootBarycentric = new Float64Array(3 * count);
  const length = new Float64Array(count), stop = new Uint8Array(count);
  const guideRootWidth = new Float64Array(count), guideTipWidth = new Float64Array(count);
  const tuft = new Int32Array(count), innerTuft = new Int32Array(count);
  const guideSet = new Uint16Array(count);
  // Each set's roots are already bound in the file's numbering; the groom's binding is theirs put together.
  const uvs = grown.every((r) => r.guides.binding.uv);
  const binding = { polygon: new Uint32Array(count), triangle: new Uint32Array(count), corners: new Uint32Array(3 * count), weights: new Float64Array(3 * count), ...(uvs ? { uv: new Float64Array(2 * count) } : {}) };
  const ranges: { name: string; first: number; count: number; hairsPerGuide: number; areaSquareCm: number }[] = [];
  let first = 0, centres = 0, innerCentres = 0, pushedOut = 0, areaSquareCm = 0;
  const curves: Float64Array[] = [];
  const timings = { rootsMilliseconds: 0, traceMilliseconds: 0, shapeMilliseconds: 0, tuftsMilliseconds: 0 };
  grown.forEach((r, s) => {
    const g = r.guides;
    points.set(g.points, 3 * n * first);
    guideId.set(g.guideId, first);
    rootFace.set(g.rootFace, first);
    rootBarycentric.set(g.rootBarycentric, 3 * first);
    length.set(g.length, first);
    stop.set(g.stop, first);
    guideRootWidth.set(g.guideRootWidth, first);
    guideTipWidth.set(g.guideTipWidth, first);
    binding.polygon.set(g.binding.polygon, first);
    binding.triangle.set(g.binding.triangle, first);
    binding.corners.set(g.binding.corners, 3 * first);
    binding.weights.set(g.binding.weights, 3 * first);
    if (binding.uv) binding.uv.set(g.binding.uv!, 2 * first);
    for (let k = 0; k < g.count; k++) {
      tuft[first + k] = g.tuft[k] < 0 ? -1 : g.tuft[k] + centres;
      innerTuft[first + k] = g.innerTuft[k] < 0 ? -1 : g.innerTuft[k] + innerCentres;
    }
    guideSet.fill(s, first, first + g.count);
    ranges.push({ name: names[s], first, count: g.count, hairsPerGuide: g.hairsPerGuide, areaSquareCm: r.areaSquareCm });
    if (r.tufts) {
      curves.push(r.tufts.curves);
      centres += r.tufts.centres;
      innerCentres += r.tufts.innerCentres;
    }
    for (const key of Object.keys(timings) as (keyof typeof timings)[]) timings[key] += r.timings[key];
    pushedOut += r.pushedOut;
    areaSquareCm += r.areaSquareCm;
    first += g.count;
  });
  const joinedCurves = new Float64Array(curves.reduce((sum, c) => sum + c.length, 0));
  curves.reduce((at, c) => (joinedCurves.set(c, at), at + c.length), 0);
  const head = grown[0].guides;
  const guides: Guides = {
    count,
    pointsPerGuide: n,
    points,
    guideId,
    rootFace,
    rootBarycentric,
    binding,
    length,
    stop,
    rootWidth: head.rootWidth,
    tipWidth: head.tipWidth,
    guideRootWidth,
    guideTipWidth,
    tuft,
    innerTuft,
    units: spec.units,
    upAxis: spec.upAxis,
    hairsPerGuide: head.hairsPerGuide,
    sets: ranges,
    guideSet,
  };
  return { guides, areaSquareCm, pushedOut, ...(curves.length > 0 ? { tufts: { curves: joinedCurves, centres, innerCentres } } : {}), timings };
}

/**
 * One set's guides as guides of their own (views on the groom's arrays, nothing copied), for the
 * writers that put each set in its own prim, node or group.
 *
 * Guarantees: guide k of the result is guide `set.first + k` of `guides`, every per-guide array cut
 * alike; no `sets` on the result; `hairsPerGuide` is the set's.
 */
export function guidesOfSet(guides: Guides, set: GuideSetRange): Guides {
  const a = set.first, b = set.first + set.count, n = guides.pointsPerGuide;
  const bind = guides.binding;
  const { sets: _sets, guideSet: _guideSet, ...rest } = guides;
  return {
    ...rest,
    count: set.count,
    points: guides.points.subarray(3 * n * a, 3 * n * b),
    guideId: guides.guideId.subarray(a, b),
    rootFace: guides.rootFace.subarray(a, b),
    rootBarycentric: guides.rootBarycentric.subarray(3 * a, 3 * b),
    binding: {
      polygon: bind.polygon.subarray(a, b),
      triangle: bind.triangle.subarray(a, b),
      corners: bind.corners.subarray(3 * a, 3 * b),
      weights: bind.weights.subarray(3 * a, 3 * b),
      ...(bind.uv ? { uv: bind.uv.subarray(2 * a, 2 * b) } : {}),
    },
    length: guides.length.subarray(a, b),
    stop: guides.stop.subarray(a, b),
    guideRootWidth: guides.guideRootWidth.subarray(a, b),
    guideTipWidth: guides.guideTipWidth.subarray(a, b),
    tuft: guides.tuft.subarray(a, b),
    innerTuft: guides.innerTuft.subarray(a, b),
    hairsPerGuide: set.hairsPerGuide,
  };
}
