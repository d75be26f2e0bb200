import { now, type SolvedField, type TriangleMesh } from '../../field';
import { GroomError } from '../errors';
import { blendPins } from '../place/pins';
import { attributeFactors, type AttributeFactors } from '../place/maps';
import { guideRandom } from './random';
import { growthMask } from '../place/regions';
import { downOf } from '../place/request';
import { cellOrder, sampleRoots } from './roots';
import { bindRoots, rootsOnSculpt } from './binding';
import { growthPlane, mirroredRoots, randomKey } from './mirror-roots';
import { shapeGuide, waver, type WaverParameters } from './shape';
import { gatherOnto, type Gather } from './tufts';
import { planTufts, scaledGather } from './tuft-plan';
import { SKIN_QUERY_SIZE } from '../place/skin';
import { COAT_SETTING_RANGES } from '../spec/guide-settings';
import { CENTIMETRES_PER_UNIT, guidePointsProblem, type GroomSpec, type GuideSettings } from '../spec/spec';
import { growGuideSets } from './guide-sets';
import type { GrowOptions, GrowResult } from './grown';
import type { GroomSurface } from '../place/surface';
import { createTracer } from './trace';

export type { Guides, GrowResult, GrowOptions } from './grown';

/** What is done to a curve after its shape: drawn onto a tuft's centre curve, wandered. */
type Shaping = { gatherTo?: { curves: Float64Array; curve: number; gather: Gather }; waver?: WaverParameters };

/** First random channel of the wander's knots (channels 0–2 are the length, curl phase and lean). */
const WAVER_CHANNEL = 16;
/** At jitter 1, a guide's length varies by up to ±25 % and its tip leans sideways by up to 15 % of its length. */
const JITTER_LENGTH = 0.5;
const JITTER_LEAN = 0.15;
/** Height kept above the skin, as a fraction of the surface's bounding box diagonal. */
const CLEARANCE_FRACTION = 1e-4;


/** The waver's most waves along a guide (the schema's bound), which a painted `waves` map is capped at. */
const WAVES_MAX = COAT_SETTING_RANGES.waverWaves.max;

/** The most waves any guide gets under a `waves` map (the spec's waves × the map's largest factor, capped): what the knots must hold. */
function paintedWaves(waves: number, painted: Float64Array | undefined): number {
  let most = 1;
  if (painted) for (let v = 0; v < painted.length; v++) most = Math.max(most, painted[v]);
  return Math.min(WAVES_MAX, Math.max(waves, waves * most));
}

/** The guides' gather with its shares scaled by `share` (capped at 1) and its rise by `rise` (kept within the schema's bounds). */
function paintedGather(gather: Gather, share: number, rise: number): Gather {
  const { min, max } = COAT_SETTING_RANGES.gatherRise;
  return { ...scaledGather(gather, share), rise: rise === 1 ? gather.rise : Math.min(max, Math.max(min, gather.rise * rise)) };
}

/** Barycentric weights of (x, y, z) in face f (projected onto its plane), into w. */
function barycentric(p: Float64Array, tri: Uint32Array, f: number, x: number, y: number, z: number, w: Float64Array): void {
  const a = 3 * tri[3 * f], b = 3 * tri[3 * f + 1], c = 3 * tri[3 * f + 2];
  const v0x = p[b] - p[a], v0y = p[b + 1] - p[a + 1], v0z = p[b + 2] - p[a + 2];
  const v1x = p[c] - p[a], v1y = p[c + 1] - p[a + 1], v1z = p[c + 2] - p[a + 2];
  const v2x = x - p[a], v2y = y - p[a + 1], v2z = z - p[a + 2];
  const d00 = v0x * v0x + v0y * v0y + v0z * v0z, d01 = v0x * v1x + v0y * v1y + v0z * v1z, d11 = v1x * v1x + v1y * v1y + v1z * v1z;
  const d20 = v2x * v0x + v2y * v0y + v2z * v0z, d21 = v2x * v1x + v2y * v1y + v2z * v1z;
  const denom = d00 * d11 - d01 * d01;
  const v = denom > 0 ? (d11 * d20 - d01 * d21) / denom : 1 / 3;
  const u = denom > 0 ? (d00 * d21 - d01 * d20) / denom : 1 / 3;
  w[0] = 1 - v - u; w[1] = v; w[2] = u;
}

/**
 * Grows the spec's guides on a solved field: roots, streamlines, shapes, collision check.
 *
 * Guarantees: the same spec on the same surface and field gives identical guides (bit for bit);
 * the root count is `guides.count`, or density × growth area (cm², from the declared units,
 * weighted by density pins) rounded; every point is finite and no point but the root is under
 * the skin or nearer to it than the clearance (1e-4 of the bounding box diagonal), as the skin's
 * spatial index finds; each guide's first segment leaves the root along the field (see shapeGuide).
 * Tufts and waver (spec version 3) reshape guides after their combed shape and before the
 * collision check: they never move a root, never change the field, the roots or the ids (the same
 * spec with and without them has the same `guideId`, `rootFace` and `rootBarycentric`); a gather
 * or waver of 0 leaves the points bit for bit as without them; a point drawn with a share of 1
 * lies exactly on its tuft's centre curve (re-set there after the collision check, the curve
 * keeping its own clearance). Without them the guides are those of version 2, bit for bit.
 * With `guideSets` the top-level `guides` block is not grown: each set grows on its own region with
 * its own settings (see `growGuideSets`); without them the guides are exactly as before sets existed.
 * With the spec's `symmetry` (or `mirrorRootsAcross`), every set's roots are one side's and their
 * mirrors (ids: a root, then its mirror), each mirror grown with its source's random choices
 * mirrored and its tuft the mirror of its source's; on a surface that is its own mirror image,
 * under a field that is too, the two guides of a pair mirror each other to rounding. Without it,
 * exactly as before.
 */
export function growGuides(surface: GroomSurface, solved: SolvedField, spec: GroomSpec, options: GrowOptions = {}): GrowResult {
  const t0 = now();
  // Each attribute's factor per vertex: its painted map times its pins' blend (place/maps.ts).
  const pins: AttributeFactors = attributeFactors(spec, surface.mesh, blendPins(spec, surface));
  if (spec.guideSets) {
    return growGuideSets(surface, spec, options, t0, (settings, mask, at, setOptions, started) => growSet(surface, solved, spec, settings, mask, pins, at, setOptions, started));
  }
  return growSet(surface, solved, spec, spec.guides, growthMask(surface.mesh, spec.guides.regions), pins, 'guides', options, t0);
}

/** Grows one block of guide settings on the faces of `mask`; `at` is the block's spec path, for the budget's words. */
function growSet(surface: GroomSurface, solved: SolvedField, spec: GroomSpec, settings: GuideSettings, mask: Uint8Array, pins: AttributeFactors, at: string, options: GrowOptions, t0: number): GrowResult {
  const { mesh } = surface;
  const p = mesh.positions;
  const tri = mesh.triangles;
  const cm2PerUnit2 = CENTIMETRES_PER_UNIT[spec.units] ** 2;
  let area = 0;
  for (let f = 0; f < tri.length / 3; f++) {
    if (!mask[f]) continue;
    const d = pins.density;
    area += surface.faceArea[f] * (d ? (d[tri[3 * f]] + d[tri[3 * f + 1]] + d[tri[3 * f + 2]]) / 3 : 1);
  }
  const areaSquareCm = area * cm2PerUnit2;
  const asked = settings.count ?? Math.round((settings.density ?? 0) * areaSquareCm);
  // A count over budget never passes the schema; a density is checked here, where the area is known.
  const problem = guidePointsProblem(asked, settings.pointsPerGuide);
  if (problem) {
    const path = settings.count === undefined ? `${at}.density` : `${at}.count`;
    const made = settings.count === undefined ? `${at}.density: ${settings.density} guides per cm² over ${Math.round(areaSquareCm)} cm² makes ` : '';
    throw new GroomError('too-many-guides', `${made}${problem}`, path);
  }
  const wanted = options.sampleOf !== undefined ? Math.min(asked, options.sampleOf) : asked;
  const sample = (on: TriangleMesh, faceArea: Float64Array) =>
    sampleRoots({ positions: on.positions, triangles: on.triangles, faceArea, count: wanted, allowedFace: mask, vertexDensity: pins.density, seed: settings.seed });
  const sampled = options.rootsFrom ? rootsOnSculpt(options.rootsFrom, mesh, sample) : sample(mesh, surface.faceArea);
  // Mirror symmetry: one side's roots and their mirrors; a mirror takes its source's random choices (mirror-roots.ts).
  const plane = growthPlane(spec.symmetry, options.mirrorRootsAcross);
  const mirrored = plane ? mirroredRoots(surface, sampled, plane) : undefined;
  const roots = mirrored ?? sampled;
  const mirrorOf = mirrored?.mirrorOf;
  const t1 = now();

  const n = settings.pointsPerGuide;
  const count = roots.count;
  const points = new Float64Array(3 * n * count);
  const length = new Float64Array(count);
  const stop = new Uint8Array(count);
  const singular = new Uint8Array(surface.field.topology.vertexCount);
  const requested = solved.connection.requestedIndex;
  for (let v = 0; v < requested.length; v++) if (requested[v] !== 0) singular[v] = 1;
  const tracer = createTracer(surface.field, solved.field, singular, solved.connection.cutEdge);
  const faceDirection = solved.field.faceDirection;
  const faceNormal = surface.field.frames.normal;
  const vertexNormal = surface.vertexNormal;
  const gravity = downOf(spec.upAxis);
  const clearance = CLEARANCE_FRACTION * surface.diagonal;

  const targets = new Float64Array(n);
  const skin = new Float64Array(3 * n);
  const skinNormal = new Float64Array(3 * n);
  const skinFace = new Uint32Array(n);
  const weights = new Float64Array(3);
  const query = new Float64Array(SKIN_QUERY_SIZE);
  const factor = (values: Float64Array | undefined, f: number) =>
    values ? weights[0] * values[tri[3 * f]] + weights[1] * values[tri[3 * f + 1]] + weights[2] * values[tri[3 * f + 2]] : 1;
  let traceTime = 0;
  let pushedOut = 0;

  /**
   * Grows one curve from a root into `out` (as curve `slot`): traced, shaped, drawn onto `gatherTo`
   * (a tuft's centre curve) and wandered when asked, then kept above the skin. `seed` and `id` key
   * its own variation; `mirror` when it is the mirror image of the curve `id` names (its curl and lean reflected).
   */
  const growCurve = (out: Float64Array, slot: number, f0: number, root: Float64Array, bary: Float64Array, seed: number, id: number, shaping?: Shaping, mirror = false): void => {
    const rx = root[0], ry = root[1], rz = root[2];
    weights.set(bary);
    const jitter = settings.jitter * factor(pins.jitter, f0);
    const guideLength = settings.length * factor(pins.length, f0) * (1 + JITTER_LENGTH * jitter * (guideRandom(seed, id, 0) - 0.5));
    const lift = Math.min(90, settings.lift * factor(pins.lift, f0)) * (Math.PI / 180);
    const params = {
      length: guideLength,
      lift,
      droop: Math.min(1, settings.droop * factor(pins.droop, f0)),
      gravity,
      curlAmplitude: settings.curl.amplitude * factor(pins.curl, f0),
      curlWavelength: settings.curl.wavelength,
      curlPhase: 2 * Math.PI * guideRandom(seed, id, 1),
      jitterOffset: JITTER_LEAN * jitter * guideLength,
      jitterAngle: 2 * Math.PI * guideRandom(seed, id, 2),
      clearance,
      mirrored: mirror,
    };

    // The skin path: points at arc lengths s_i·cos(lift) along the streamline from the root.
    const tt = now();
    const step = guideLength / (n - 1);
    for (let i = 1; i < n; i++) targets[i - 1] = i * step * Math.cos(lift);
    const reached = tracer.trace(f0, rx, ry, rz, targets, n - 1, skin, skinFace, 1);
    traceTime += now() - tt;
    const e = tracer.end;
    for (let i = 1; i < n; i++) {
      if (i <= reached) {
        barycentric(p, tri, skinFace[i], skin[3 * i], skin[3 * i + 1], skin[3 * i + 2], weights);
        const f = skinFace[i];
        let nx = 0, ny = 0, nz = 0;
        for (let k = 0; k < 3; k++) {
          const v = 3 * tri[3 * f + k];
          nx += weights[k] * vertexNormal[v]; ny += weights[k] * vertexNormal[v + 1]; nz += weights[k] * vertexNormal[v + 2];
        }
        const l = Math.sqrt(nx * nx + ny * ny + nz * nz) || 1;
        skinNormal[3 * i] = nx / l; skinNormal[3 * i + 1] = ny / l; skinNormal[3 * i + 2] = nz / l;
      } else {
        // Past the end of the skin path the guide carries straight on, over the last skin normal.
        const beyond = targets[i - 1] - e.length;
        skin[3 * i] = e.x + beyond * e.dx; skin[3 * i + 1] = e.y + beyond * e.dy; skin[3 * i + 2] = e.z + beyond * e.dz;
        skinFace[i] = e.face;
        for (let k = 0; k < 3; k++) skinNormal[3 * i + k] = i > 1 ? skinNormal[3 * (i - 1) + k] : faceNormal[3 * e.face + k];
      }
    }
    const rootNormal = faceNormal.subarray(3 * f0, 3 * f0 + 3);
    shapeGuide(out, slot * n, n, root, faceDirection.subarray(3 * f0, 3 * f0 + 3), rootNormal, skin, skinNormal, params);
    if (shaping?.gatherTo) gatherOnto(out, slot, shaping.gatherTo.curves, shaping.gatherTo.curve, n, shaping.gatherTo.gather);
    if (shaping?.waver) waver(out, slot * n, n, rootNormal, shaping.waver);
    const moved = keepAboveSkin(surface, out, slot * n, n, skin, skinFace, reached, e, clearance, query);
    pushedOut += moved;
    // A point drawn the whole way onto the centre curve stays on it: the curve keeps its own clearance.
    if (moved > 0 && shaping?.gatherTo) gatherOnto(out, slot, shaping.gatherTo.curves, shaping.gatherTo.curve, n, shaping.gatherTo.gather, true);
  };

  const tuftStart = now();
  const traceBefore = traceTime;
  const tufting = settings.tufts ? planTufts(surface, settings.tufts, { mask, density: pins.density, maps: pins, areaSquareCm, area, seed: settings.seed, roots, growCurve, n, ...(plane && mirrorOf ? { mirror: { plane, mirrorOf } } : {}) }) : undefined;
  // The tufts' own tracing counts as tracing; the rest of their planning is reported apart.
  const tuftTime = now() - tuftStart - (traceTime - traceBefore);
  const waverSettings = settings.waver && settings.waver.amplitude > 0 ? settings.waver : undefined;
  const knots = waverSettings ? new Float64Array(2 * (Math.ceil(paintedWaves(waverSettings.waves, pins.waves)) + 2)) : undefined;
  // One shaping record of each kind, reused guide after guide (only the curve number changes).
  const gatherTo = tufting ? { curves: tufting.curves, curve: -1, gather: tufting.gather } : undefined;
  const waverParams = waverSettings && knots ? { amplitude: waverSettings.amplitude, waves: waverSettings.waves, knots } : undefined;
  const planGather = tufting?.gather;
  const gathered: Shaping = { gatherTo }, wandered: Shaping = { waver: waverParams }, both: Shaping = { gatherTo, waver: waverParams };
  const rootWidth = new Float64Array(count);
  const tipWidth = new Float64Array(count);

  // Guides are stored in id order but grown in space order, so that the tracing of one guide
  // finds the faces the one before it touched still in the cache.
  const rootCell = Math.sqrt(area / Math.max(1, count)) * 4 || 1;
  const traceOrder = cellOrder(roots.position.filter((_x, i) => i % 3 === 0), roots.position.filter((_x, i) => i % 3 === 1), roots.position.filter((_x, i) => i % 3 === 2), rootCell);
  for (const g of traceOrder) {
    const f0 = roots.face[g];
    const bary = roots.barycentric.subarray(3 * g, 3 * g + 3);
    const drawnOnto = tufting ? tufting.curveOf[g] : -1;
    if (gatherTo) gatherTo.curve = drawnOnto;
    const key = randomKey(mirrorOf, g), mirror = key !== g;
    // Knot values keyed by the guide's id on channels of their own, so the wander never shifts the other variation;
    // a mirror's across-values (even knots, along normal × tangent) negated, as in shape.ts's bend.
    if (knots) for (let k = 0; k < knots.length; k++) knots[k] = (mirror && k % 2 === 0 ? -1 : 1) * (2 * guideRandom(settings.seed, key, WAVER_CHANNEL + k) - 1);
    // Painted gather, rise, waver and waves scale the spec's at the root (the shares capped at 1); without a map the records stay as they are.
    weights.set(bary);
    if (gatherTo && planGather && (pins.gather || pins.gatherRise)) gatherTo.gather = paintedGather(planGather, factor(pins.gather, f0), factor(pins.gatherRise, f0));
    if (waverParams && waverSettings && pins.waver) waverParams.amplitude = waverSettings.amplitude * factor(pins.waver, f0);
    if (waverParams && waverSettings && pins.waves) waverParams.waves = Math.min(WAVES_MAX, waverSettings.waves * factor(pins.waves, f0));
    const shaping = drawnOnto >= 0 ? (waverParams ? both : gathered) : waverParams ? wandered : undefined;
    growCurve(points, g, f0, roots.position.subarray(3 * g, 3 * g + 3), bary, settings.seed, key, shaping, mirror);
    stop[g] = tracer.end.reason;
    weights.set(bary);
    const widthFactor = factor(pins.width, f0);
    rootWidth[g] = settings.width * widthFactor;
    tipWidth[g] = settings.tipWidth * widthFactor * (pins.tipWidth ? factor(pins.tipWidth, f0) : 1);

    let arc = 0;
    for (let i = 1; i < n; i++) {
      const q = 3 * (g * n + i);
      arc += Math.hypot(points[q] - points[q - 3], points[q + 1] - points[q - 2], points[q + 2] - points[q - 1]);
    }
    length[g] = arc;
  }
  const t2 = now();
  for (let i = 0; i < points.length; i++) {
    if (!Number.isFinite(points[i])) throw new GroomError('non-finite-guide', `Guide ${Math.floor(i / (3 * n))} has a point that is not finite; the surface may have degenerate faces there.`);
  }
  return {
    guides: {
      count,
      pointsPerGuide: n,
      points,
      guideId: Uint32Array.from({ length: count }, (_x, g) => g),
      rootFace: roots.face,
      rootBarycentric: roots.barycentric,
      binding: bindRoots(mesh, roots.face, roots.barycentric),
      length,
      stop,
      rootWidth: settings.width,
      tipWidth: settings.tipWidth,
      guideRootWidth: rootWidth,
      guideTipWidth: tipWidth,
      tuft: tufting?.tuft ?? new Int32Array(count).fill(-1),
      innerTuft: tufting?.innerTuft ?? new Int32Array(count).fill(-1),
      units: spec.units,
      upAxis: spec.upAxis,
      hairsPerGuide: settings.hairsPerGuide,
    },
    areaSquareCm,
    pushedOut,
    ...(tufting ? { tufts: { curves: tufting.curves, centres: tufting.centres, innerCentres: tufting.innerCentres } } : {}),
    timings: { rootsMilliseconds: t1 - t0, traceMilliseconds: traceTime, shapeMilliseconds: t2 - t1 - traceTime - tuftTime, tuftsMilliseconds: tuftTime },
  };
}

/**
 * Moves every point after the root that the skin's spatial index finds under the skin, or nearer
 * to it than `clearance`, out along the skin's pseudo-normal to `clearance` above it; the points
 * after it move with it, so the rest of the guide rests on the skin it met. Returns how many
 * points moved.
 *
 * A point needs no look-up when it lies well inside the skin-free ball around the point before
 * it: if the previous point is outside with no skin within `free`, a point less than
 * `free − clearance` from it is outside too (the segment between them meets no skin) and keeps
 * at least `clearance` from the skin.
 */
function keepAboveSkin(
  surface: GroomSurface,
  points: Float64Array,
  first: number,
  n: number,
  skin: Float64Array,
  skinFace: Uint32Array,
  reached: number,
  end: { x: number; y: number; z: number },
  clearance: number,
  query: Float64Array,
): number {
  let moved = 0;
  // Radius of a ball around the previous point known to hold no skin (0 at the root, on the skin).
  let free = 0;
  for (let i = 1; i < n; i++) {
    const q = 3 * (first + i);
    const x = points[q], y = points[q + 1], z = points[q + 2];
    const step = Math.sqrt((x - points[q - 3]) ** 2 + (y - points[q - 2]) ** 2 + (z - points[q - 1]) ** 2);
    if (step + clearance <= free) {
      free -= step;
      continue;
    }
    // The point's skin point (or the end of the skin path) lies on the skin, so no closest skin
    // point is farther than it is (plus rounding); that bound keeps the search small.
    const rx = i <= reached ? skin[3 * i] : end.x, ry = i <= reached ? skin[3 * i + 1] : end.y, rz = i <= reached ? skin[3 * i + 2] : end.z;
    const reach = Math.sqrt((x - rx) ** 2 + (y - ry) ** 2 + (z - rz) ** 2) + 2 * clearance;
    if (!surface.skin.closest(x, y, z, reach, query, skinFace[i])) {
      free = 0;
      continue;
    }
    if (query[6] >= clearance) {
      free = query[6];
      continue;
    }
    const nl = Math.hypot(query[3], query[4], query[5]) || 1;
    const dx = query[0] + (clearance * query[3]) / nl - x;
    const dy = query[1] + (clearance * query[4]) / nl - y;
    const dz = query[2] + (clearance * query[5]) / nl - z;
    for (let j = i; j < n; j++) {
      const r = 3 * (first + j);
      points[r] += dx; points[r + 1] += dy; points[r + 2] += dz;
    }
    free = 0;
    moved++;
  }
  return moved;
}
