import type { GuideSettings } from '../spec/spec';
import type { GroomSurface } from '../place/surface';
import { guideRandom, hash32 } from './random';
import type { Roots } from './roots';
import { sampleRoots } from './roots';
import { gathersNothing, nearestCentres, type Gather } from './tufts';
import { firstMirroredRoots, mirroredRoots, mirrorPartners, randomKey } from './mirror-roots';
import type { MirrorPlane } from '../spec/symmetry';

/** Seeds of the two levels' centres, mixed with the groom's seed so the centres are not the guides' own first roots. */
const TUFT_SEED = 0x7af7;
const INNER_SEED = 0x1a2e;
/** The random channel that picks loners (0–2 are the length, curl phase and lean; 16 on the wander). */
const LONER_CHANNEL = 3;

/** Grows one curve from a root into `out` as curve `slot` (the grower's own routine), optionally drawn onto another curve. */
export type GrowCurve = (
  out: Float64Array,
  slot: number,
  face: number,
  root: Float64Array,
  barycentric: Float64Array,
  seed: number,
  id: number,
  shaping?: { gatherTo?: { curves: Float64Array; curve: number; gather: Gather } },
  mirror?: boolean,
) => void;

export interface TuftPlan {
  /** The centre curves guides are drawn onto (the inner level's when there is one), n points each. */
  readonly curves: Float64Array;
  /** For each guide the curve it is drawn onto, −1 for none (a loner, or a gather of 0 everywhere). */
  readonly curveOf: Int32Array;
  readonly gather: Gather;
  /** Each guide's tuft and inner tuft, −1 for none. */
  readonly tuft: Int32Array;
  readonly innerTuft: Int32Array;
  readonly centres: number;
  readonly innerCentres: number;
}

/** Painted factors per surface vertex (map × pins, `attributeFactors`) that steer the plan; each absent when unpainted. */
export interface TuftMaps {
  /** Weights where tuft centres fall, and how many: like the density map for roots. */
  readonly tuftDensity?: Float64Array;
  /** The same for the inner level's centres. */
  readonly innerTuftDensity?: Float64Array;
  /** Scales the outer gather that draws each inner centre curve onto its tuft's curve, at the inner centre's root. */
  readonly innerGather?: Float64Array;
  /** Scales the loners' share at each guide's root. */
  readonly loners?: Float64Array;
}

export interface TuftContext {
  readonly mask: Uint8Array;
  readonly density?: Float64Array;
  readonly maps?: TuftMaps;
  readonly areaSquareCm: number;
  /** The growth area in surface units², as weighted by density pins. */
  readonly area: number;
  readonly seed: number;
  readonly roots: Roots;
  readonly growCurve: GrowCurve;
  readonly n: number;
  /** Mirror symmetry: the plane, and which guide roots are mirrors of which (`MirroredRoots.mirrorOf`). */
  readonly mirror?: { readonly plane: MirrorPlane; readonly mirrorOf: Int32Array };
}

/**
 * Samples the tuft centres of both levels and grows their centre curves: each level's centres by
 * the root sampler at the level's density over the growth area (at most one per two guides, so
 * the centre curves of both levels together never hold more points than the guides), each
 * centre curve grown as a guide would be from that root (its variation keyed by the level's seed
 * and the centre's number), each inner centre curve drawn onto its tuft's centre curve by the
 * tufts' gather; then assigns every guide to the nearest centre (`nearestCentres`: in a straight
 * line, among centres facing its way) of the finest level, and its tuft through that centre.
 *
 * With `mirror`, each level's centres are one side's and their mirrors (`mirroredRoots`, cut to
 * the level's count without splitting a pair); a mirror centre's curve is grown with its source's
 * random choices mirrored, its parent is the partner of its source's parent, a mirror guide's
 * centre the partner of its source's, and its loner choice its source's — so membership mirrors
 * exactly, whatever rounding does to near ties.
 *
 * Guarantees: the same settings, surface and seed give the same plan; a loner (the `loners` share,
 * picked by the seed per guide id) has no tuft; an inner tuft lies in exactly one tuft. Painted
 * factors (`context.maps`): a level's density map weights its sampler's faces and candidates (times
 * the guides' density) and its count is the level's density × that weighted area, as the density
 * map does for roots; the loners' share is the spec's × the map at the guide's root (barycentric),
 * capped at 1, so a map of 0 makes no loner there; the inner gather scales the outer gather's
 * shares (capped at 1) at each inner centre's root. An absent map changes nothing, bit for bit.
 */
export function planTufts(surface: GroomSurface, tufts: NonNullable<GuideSettings['tufts']>, context: TuftContext): TuftPlan {
  const { roots, n, growCurve } = context;
  const { mesh } = surface;
  const faceNormal = surface.field.frames.normal;
  const count = roots.count;
  const { mirror } = context;
  const tri = mesh.triangles;
  const maps = context.maps ?? {};
  type Level = { centres: Roots; normals: Float64Array; curves: Float64Array; parent?: Int32Array; partner?: Int32Array };
  const level = (density: number, seed: number, painted: Float64Array | undefined, onto?: { curves: Float64Array; gather: Gather; level: Level }): Level => {
    const weight = painted ? weighted(context.density, painted) : context.density;
    const areaSquareCm = painted ? weightedArea(surface.faceArea, tri, context.mask, weight!) * (context.area > 0 ? context.areaSquareCm / context.area : 0) : context.areaSquareCm;
    const wanted = Math.min(Math.ceil(count / 2), Math.max(1, Math.round(density * areaSquareCm)));
    const sampled = sampleRoots({ positions: mesh.positions, triangles: tri, faceArea: surface.faceArea, count: wanted, allowedFace: context.mask, vertexDensity: weight, seed });
    const twins = mirror ? firstMirroredRoots(mirroredRoots(surface, sampled, mirror.plane), wanted) : undefined;
    const centres = twins ?? sampled;
    const normals = normalsAt(faceNormal, centres.face);
    const curves = new Float64Array(3 * n * centres.count);
    const parent = onto ? nearestCentres(centres.position, normals, onto.level.centres.position, normalsAt(faceNormal, onto.level.centres.face), spacing(context.area, onto.level.centres.count)) : undefined;
    if (parent && twins && onto?.level.partner) for (let c = 0; c < centres.count; c++) if (twins.mirrorOf[c] >= 0 && parent[twins.mirrorOf[c]] >= 0) parent[c] = onto.level.partner[parent[twins.mirrorOf[c]]];
    for (let c = 0; c < centres.count; c++) {
      const gather = onto && maps.innerGather ? scaledGather(onto.gather, atRoot(maps.innerGather, tri, centres.face[c], centres.barycentric, c)) : onto?.gather;
      const gatherTo = onto && parent && gather ? { curves: onto.curves, curve: parent[c], gather } : undefined;
      const key = randomKey(twins?.mirrorOf, c);
      growCurve(curves, c, centres.face[c], centres.position.subarray(3 * c, 3 * c + 3), centres.barycentric.subarray(3 * c, 3 * c + 3), seed, key, gatherTo && !gathersNothing(gatherTo.gather) ? { gatherTo } : undefined, key !== c);
    }
    return { centres, normals, curves, parent, ...(twins ? { partner: mirrorPartners(twins.mirrorOf) } : {}) };
  };
  const outer = level(tufts.density, hash32(context.seed, TUFT_SEED), maps.tuftDensity);
  // A tuft-density map of 0 everywhere leaves no tuft for inner tufts to lie in: then there are none.
  const inner = tufts.inner && outer.centres.count > 0 ? level(tufts.inner.density, hash32(context.seed, INNER_SEED), maps.innerTuftDensity, { curves: outer.curves, gather: tufts.gather, level: outer }) : undefined;
  const finest = inner ?? outer;
  const nearest = nearestCentres(roots.position, normalsAt(faceNormal, roots.face), finest.centres.position, finest.normals, spacing(context.area, finest.centres.count));
  const gather = tufts.inner ? tufts.inner.gather : tufts.gather;
  const tuft = new Int32Array(count), innerTuft = new Int32Array(count), curveOf = new Int32Array(count);
  const drawn = !gathersNothing(gather);
  if (mirror && finest.partner) for (let g = 0; g < count; g++) if (mirror.mirrorOf[g] >= 0 && nearest[mirror.mirrorOf[g]] >= 0) nearest[g] = finest.partner[nearest[mirror.mirrorOf[g]]];
  for (let g = 0; g < count; g++) {
    // A painted share is capped at 1 (every guide a loner), like the gather's shares.
    const share = maps.loners ? Math.min(1, tufts.loners * atRoot(maps.loners, tri, roots.face[g], roots.barycentric, g)) : tufts.loners;
    const loner = share > 0 && guideRandom(context.seed, randomKey(mirror?.mirrorOf, g), LONER_CHANNEL) < share;
    const c = loner ? -1 : nearest[g];
    innerTuft[g] = inner && c >= 0 ? c : -1;
    tuft[g] = c < 0 ? -1 : inner?.parent ? inner.parent[c] : c;
    curveOf[g] = drawn ? c : -1;
  }
  return { curves: finest.curves, curveOf, gather, tuft, innerTuft, centres: outer.centres.count, innerCentres: inner?.centres.count ?? 0 };
}

/** A gather with both shares scaled by `factor`, each capped at 1. */
export function scaledGather(gather: Gather, factor: number): Gather {
  return { root: Math.min(1, gather.root * factor), tip: Math.min(1, gather.tip * factor), rise: gather.rise };
}

/** A per-vertex value at point `i` of a sampled set (its face and barycentric weights): the barycentric blend of the face's corners. */
export function atRoot(values: Float64Array, tri: Uint32Array, face: number, barycentric: Float64Array, i: number): number {
  return barycentric[3 * i] * values[tri[3 * face]] + barycentric[3 * i + 1] * values[tri[3 * face + 1]] + barycentric[3 * i + 2] * values[tri[3 * face + 2]];
}

/** The product of the guides' density (when weighted) and a level's painted factor, vertex by vertex. */
function weighted(density: Float64Array | undefined, painted: Float64Array): Float64Array {
  return density ? painted.map((x, v) => x * density[v]) : painted;
}

/** The growth area (surface units²) weighted by the per-vertex `weight` (the mean of each face's corners), as the sampler weighs faces. */
function weightedArea(faceArea: Float64Array, tri: Uint32Array, mask: Uint8Array, weight: Float64Array): number {
  let area = 0;
  for (let f = 0; f < faceArea.length; f++) if (mask[f]) area += (faceArea[f] * (weight[tri[3 * f]] + weight[tri[3 * f + 1]] + weight[tri[3 * f + 2]])) / 3;
  return area;
}

function normalsAt(faceNormal: Float64Array, faces: Uint32Array): Float64Array {
  const out = new Float64Array(3 * faces.length);
  for (let i = 0; i < faces.length; i++) for (let k = 0; k < 3; k++) out[3 * i + k] = faceNormal[3 * faces[i] + k];
  return out;
}

/** The mean spacing of `count` points over `area`: the search grid's cell. */
function spacing(area: number, count: number): number {
  return Math.sqrt(area / Math.max(1, count));
}
