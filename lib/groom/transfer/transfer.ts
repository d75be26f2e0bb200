import { FieldError, indexBudget, nextAroundVertex, nextHalfedge, type SolvedField } from '../../field';
import { GroomError } from '../errors';
import { edgePath, vertexOfPlace } from '../place/place';
import { fieldRequestFromSpec, solveGroomField } from '../place/request';
import { setRegionMask } from '../place/set-region';
import { SKIN_QUERY_SIZE } from '../place/skin';
import type { GroomSurface } from '../place/surface';
import { CENTIMETRES_PER_UNIT, parseGroomSpec, type GroomSpec, type SymmetrySpec, type Unit } from '../spec/spec';
import { planeOfSymmetry } from '../spec/symmetry';
import { alignDirection, alignPoint, alignSurfaces, type Alignment, type LandmarkPair } from './align';
import { anchorFeatures, placeFeatures, type AnchoredFeature, type FeatureKind, type Landing } from './features';
import { barycentricOnFace, pointOfPosition, positionOnFace, sameTopology, type SurfaceIdentity } from './identity';
import { buildNormalProbe } from './ray';
import { buildUvLocator } from './uv-locate';
import { carryMaps, type MapTransfer, type MaskTransfer } from './maps';

/**
 * Moving a groom spec onto another surface — a new sculpt pass, a retopology, another character —
 * and saying exactly what happened to each placed feature.
 */

export type TransferMethod = 'topology' | 'uv' | 'alignment';

/** One side of a transfer: the prepared surface, its identity, and its declared units and up axis. */
export interface TransferSide {
  readonly surface: GroomSurface;
  readonly identity: SurfaceIdentity;
  /** Default: the spec's own. */
  readonly units?: Unit;
  readonly upAxis?: GroomSpec['upAxis'];
}

export interface TransferOptions {
  /** `auto` (default): the same topology by polygon, else both UV layouts by UV, else by alignment. */
  readonly method?: 'auto' | TransferMethod;
  /** Three or more pairs of the same place on both surfaces; without them the bounding boxes are matched. */
  readonly landmarks?: readonly LandmarkPair[];
  /** Old region (group) name → new one, for regions the new surface names differently. */
  readonly regionMap?: Readonly<Record<string, string>>;
  /** How far along its normal a feature may look for the new surface, as a fraction of its diagonal. Default 0.05. */
  readonly reach?: number;
}

export interface FeatureTransfer {
  readonly kind: FeatureKind;
  readonly path: string;
  readonly from: [number, number, number];
  /** Null when not carried. */
  readonly to: [number, number, number] | null;
  /** Distance from where the alignment put the old place to where it landed, over the new surface's diagonal. */
  readonly moved: number | null;
  readonly reason?: string;
}

export interface SurfaceFacts {
  readonly faces: number;
  readonly polygons: number;
  readonly hasUv: boolean;
  /** Triangles whose UVs overlap others (0 without UVs). */
  readonly uvOverlaps: number;
}

/** What a transfer did: the method, the alignment, each feature, what was left behind and why, the new budget. */
export interface TransferReport {
  readonly method: TransferMethod;
  readonly alignment: Alignment;
  readonly from: SurfaceFacts;
  readonly to: SurfaceFacts;
  readonly features: readonly FeatureTransfer[];
  /** Everything not carried over, in words: features, whole curves and strokes, regions. */
  readonly notCarried: readonly { readonly path: string; readonly reason: string }[];
  readonly regions: readonly { readonly from: string; readonly to: string | null }[];
  /** The index budget on the new surface per piece; a remainder is placed as in the editor. */
  readonly budget: readonly { readonly piece: number; readonly demanded: number | null; readonly placed: number; readonly remainder: number | null }[];
  /** Whether the field solves on the new surface with exactly the carried singularities. */
  readonly field: { readonly solved: true } | { readonly solved: false; readonly code: string; readonly message: string };
  /** The painted maps carried, each once, and how (present when the spec has maps). */
  readonly maps?: readonly MapTransfer[];
  /** The painted masks carried, each once, and how (present when the spec has masks). */
  readonly masks?: readonly MaskTransfer[];
}

export interface TransferResult {
  readonly spec: GroomSpec;
  readonly report: TransferReport;
  /** The new surface's field, when it solved. */
  readonly solved?: SolvedField;
}

const DEFAULT_REACH = 0.05;

function facts(side: TransferSide, uvOverlaps: number): SurfaceFacts {
  return { faces: side.surface.mesh.triangles.length / 3, polygons: side.identity.polygonStart.length - 1, hasUv: side.identity.cornerUv !== undefined, uvOverlaps };
}

function chooseMethod(asked: TransferOptions['method'], from: TransferSide, to: TransferSide, overlaps: [number, number]): TransferMethod {
  const same = sameTopology(from.identity, to.identity);
  const uv = from.identity.cornerUv !== undefined && to.identity.cornerUv !== undefined;
  if (asked === 'topology' && !same) throw new GroomError('topology-differs', 'The new surface does not have the same polygons as the old one, so places cannot be carried by polygon; transfer by UV or by alignment instead.');
  if (asked === 'uv') {
    if (!uv) throw new GroomError('uv-missing', `A transfer by UV needs UVs on both surfaces; the ${from.identity.cornerUv ? 'new' : 'old'} surface has none.`);
    if (overlaps[0] + overlaps[1] > 0) throw new GroomError('uv-overlap', `A transfer by UV needs UVs that do not overlap; ${overlaps[0]} triangles of the old surface and ${overlaps[1]} of the new overlap others.`);
  }
  if (asked && asked !== 'auto') return asked;
  if (same) return 'topology';
  return uv && overlaps[0] + overlaps[1] === 0 ? 'uv' : 'alignment';
}

/**
 * Applies a spec made on one surface to another: every placed feature is carried (a) by polygon
 * and barycentric when both surfaces have the same polygons, (b) by UV when both have clean UV
 * layouts, (c) otherwise by alignment (units, up axis, then bounding boxes or landmarks) and the
 * nearest surface along the old normal facing the same way, no farther than `reach`.
 *
 * Guarantees: the returned spec parses, is stated in the new surface's units and up axis, and
 * places every carried feature on the new surface with its `surface` position there (on the same
 * topology: the very polygon, corners and weights it had); each feature appears once in the
 * report with where it landed or why not; a curve that would now cross an opening, a stroke left
 * with fewer than two points and a region the new surface lacks are listed in `notCarried`. The
 * field is solved on the new surface and the result reported, never thrown. Throws GroomError only
 * for a request that cannot be honoured at all (a method asked for that the surfaces cannot give,
 * degenerate landmarks, a spec place not on the old surface); nothing is returned half-made.
 */
export function transferSpec(spec: GroomSpec, from: TransferSide, to: TransferSide, options: TransferOptions = {}): TransferResult {
  const fromUnits = from.units ?? spec.units, toUnits = to.units ?? fromUnits;
  const fromUp = from.upAxis ?? spec.upAxis, toUp = to.upAxis ?? fromUp;
  const boxOrLandmarks = alignSurfaces(
    { units: fromUnits, upAxis: fromUp, positions: from.surface.mesh.positions },
    { units: toUnits, upAxis: toUp, positions: to.surface.mesh.positions },
    options.landmarks ?? [],
  );
  const toFaces = to.surface.mesh.triangles.length / 3;
  const fromUv = from.identity.cornerUv ? buildUvLocator(from.identity, from.surface.mesh.triangles.length / 3) : null;
  const toUv = to.identity.cornerUv ? buildUvLocator(to.identity, toFaces) : null;
  const overlaps: [number, number] = [fromUv?.overlappingFaces ?? 0, toUv?.overlappingFaces ?? 0];
  const method = chooseMethod(options.method, from, to, overlaps);
  const features = anchorFeatures(spec, from.surface, from.identity);
  const reach = (options.reach ?? DEFAULT_REACH) * to.surface.diagonal;
  const probe = method === 'alignment' ? buildNormalProbe(to.surface.mesh) : null;
  const query = new Float64Array(SKIN_QUERY_SIZE);

  const land = (f: AnchoredFeature): Landing | string => {
    if (method === 'topology') {
      const point = pointOfPosition(to.identity, to.surface.mesh, f.position)!;
      const vertex = keptVertex(spec, f);
      return { point, position: f.position, ...(vertex !== undefined ? { vertex } : {}) };
    }
    if (method === 'uv') {
      const uv = f.position.uv!;
      const hit = toUv!.locate(uv[0], uv[1], 1e-3);
      if (!hit) return `its UV (${uv.map((x) => x.toFixed(4)).join(', ')}) lies on no part of the new surface's UV layout`;
      const tri = to.surface.mesh.triangles, p = to.surface.mesh.positions;
      const point = [0, 1, 2].map((i) => hit.weights.reduce((s, w, k) => s + w * p[3 * tri[3 * hit.face + k] + i], 0)) as [number, number, number];
      return { point, position: positionOnFace(to.identity, hit.face, hit.weights) };
    }
    const start = alignPoint(boxOrLandmarks, f.point);
    const hit = probe!.along(start, alignDirection(boxOrLandmarks, f.normal), reach);
    if (!hit) {
      // Nothing straight along the normal (an edge of an opening, a fold): the nearest point, if it faces the same way.
      if (!to.surface.skin.closest(start[0], start[1], start[2], reach, query)) return `no part of the new surface lies within ${round(reach)} units of where the alignment puts it`;
      const n = alignDirection(boxOrLandmarks, f.normal);
      if (query[3] * n[0] + query[4] * n[1] + query[5] * n[2] <= 0) return 'the nearest part of the new surface faces the other way (it would cross a gap)';
      const point: [number, number, number] = [query[0], query[1], query[2]];
      return { point, position: positionOnFace(to.identity, query[7], barycentricOnFace(to.surface.mesh, query[7], point)) };
    }
    return { point: hit.point, position: positionOnFace(to.identity, hit.face, barycentricOnFace(to.surface.mesh, hit.face, hit.point)) };
  };

  const results = features.map(land);
  const landings = results.map((r) => (typeof r === 'string' ? null : r));
  const alignment = method === 'alignment' ? boxOrLandmarks : fitToFeatures(features, landings) ?? boxOrLandmarks;
  const reports: FeatureTransfer[] = [];
  for (let i = 0; i < features.length; i++) {
    const f = features[i], result = results[i], landing = landings[i];
    const aligned = alignPoint(alignment, f.point);
    reports.push({
      kind: f.kind,
      path: f.path,
      from: f.point,
      to: landing?.point ?? null,
      moved: landing ? Math.hypot(landing.point[0] - aligned[0], landing.point[1] - aligned[1], landing.point[2] - aligned[2]) / to.surface.diagonal : null,
      ...(typeof result === 'string' ? { reason: result } : {}),
    });
  }

  const crossing = curvesCrossingOpenings(spec, features, landings, from, to);
  const placed = placeFeatures(spec, features, landings, new Set(crossing.keys()));
  const notCarried: { path: string; reason: string }[] = reports.filter((r) => r.to === null).map((r) => ({ path: r.path, reason: r.reason! }));
  for (const path of placed.droppedCurves) {
    notCarried.push({ path, reason: crossing.get(path) ?? 'some of its points could not be carried, so the whole curve was left out' });
  }
  for (const path of placed.droppedStrokes) notCarried.push({ path, reason: 'fewer than two of its points could be carried' });
  notCarried.push(...placed.droppedSides);

  const names = to.surface.mesh.groups?.names ?? [];
  const regions = spec.guides.regions.map((name) => {
    const target = options.regionMap?.[name] ?? name;
    return { from: name, to: names.includes(target) ? target : null };
  });
  regions.forEach((r, i) => {
    if (r.to === null) {
      const mapped = options.regionMap?.[r.from];
      notCarried.push({
        path: `guides.regions[${i}]`,
        reason: `the new surface has no group ${JSON.stringify(mapped ?? r.from)}${names.length ? ` (it has ${names.map((n) => JSON.stringify(n)).join(', ')}); map the name to one of them` : ' (it has no named groups)'}`,
      });
    }
  });
  const keptRegions = regions.flatMap((r) => (r.to ? [r.to] : []));
  // A guide set's groups are carried as the top-level regions are (renamed, or left out in words).
  const setGroups = (spec.guideSets ?? []).map((set, i) =>
    (set.region.groups ?? []).flatMap((name, k) => {
      const target = options.regionMap?.[name] ?? name;
      if (names.includes(target)) return [target];
      notCarried.push({ path: `guideSets[${i}].region.groups[${k}]`, reason: `the new surface has no group ${JSON.stringify(target)}` });
      return [];
    }),
  );

  // Maps are factors, so they need no unit conversion; only where each new vertex reads them — by the features' own method.
  const carried = spec.maps?.length || spec.masks?.length ? carryMaps(spec, from, to, method === 'topology', alignment, reach / alignment.scale, method === 'uv' ? fromUv! : undefined) : undefined;
  const perUnit = CENTIMETRES_PER_UNIT[fromUnits] / CENTIMETRES_PER_UNIT[toUnits];
  const g = spec.guides;
  const scaled = <T extends typeof g>(block: T): T => ({
    ...block,
    length: block.length * perUnit,
    width: block.width * perUnit,
    tipWidth: block.tipWidth * perUnit,
    curl: { amplitude: block.curl.amplitude * perUnit, wavelength: block.curl.wavelength * perUnit },
    ...(block.waver ? { waver: { ...block.waver, amplitude: block.waver.amplitude * perUnit } } : {}),
  });
  const direction = spec.field.referenceDirection ? alignDirection(alignment, spec.field.referenceDirection) : undefined;
  const newSpec = parseGroomSpec({
    ...placed.spec,
    units: toUnits,
    upAxis: toUp,
    field: {
      ...placed.spec.field,
      ...(direction ? { referenceDirection: direction } : {}),
      // A twist's own direction turns with the surface, as the reference direction does.
      singularities: placed.spec.field.singularities.map((s) => (s.twistFrom ? { ...s, twistFrom: alignDirection(alignment, s.twistFrom) } : s)),
    },
    ...(carried && spec.maps?.length ? { maps: carried.maps } : {}),
    ...(carried && spec.masks?.length ? { masks: carried.masks } : {}),
    ...(spec.symmetry ? { symmetry: carriedSymmetry(spec.symmetry, alignment) } : {}),
    guides: { ...scaled(g), regions: keptRegions },
    ...(placed.spec.guideSets
      ? { guideSets: placed.spec.guideSets.map((set, i) => ({ ...set, region: set.region.groups ? { groups: setGroups[i] } : set.region, guides: scaled(set.guides) })) }
      : {}),
  });
  notCarried.push(...sideProblems(newSpec, to.surface));

  let budget: TransferReport['budget'] = [];
  let field: TransferReport['field'];
  let solved: SolvedField | undefined;
  try {
    const request = fieldRequestFromSpec(newSpec, to.surface);
    budget = indexBudget(to.surface.field, request).pieces.map((p) => ({ piece: p.piece, demanded: p.demanded, placed: p.placed, remainder: p.remainder }));
    solved = solveGroomField(newSpec, to.surface);
    field = { solved: true };
  } catch (error) {
    if (!(error instanceof FieldError || error instanceof GroomError)) throw error;
    field = { solved: false, code: error.code, message: error.message };
  }
  return {
    spec: newSpec,
    report: { method, alignment, from: facts(from, overlaps[0]), to: facts(to, overlaps[1]), features: reports, notCarried, regions, budget, field, ...(carried && spec.maps?.length ? { maps: carried.report } : {}), ...(carried && spec.masks?.length ? { masks: carried.maskReport } : {}) },
    ...(solved ? { solved } : {}),
  };
}

/**
 * The sides of partings the carried sets grow on that the new surface cannot give (a parting that
 * no longer cuts it in two, a `from` that landed on the parting), in the words growing would use.
 */
function sideProblems(spec: GroomSpec, surface: GroomSurface): { path: string; reason: string }[] {
  return (spec.guideSets ?? []).flatMap((set, i) => {
    if (!set.region.partings) return [];
    try {
      setRegionMask(surface, spec, set.region, `guideSets[${i}].region`);
      return [];
    } catch (error) {
      if (!(error instanceof GroomError || error instanceof FieldError)) throw error;
      return [{ path: `guideSets[${i}].region`, reason: `the carried side cannot be grown on: ${error.message}` }];
    }
  });
}

/**
 * By polygon or UV the places land without any alignment; how far each moved is then measured
 * against the similarity that best lays the old places onto their landings (Horn's fit), so a
 * character turned in its file does not read as every feature having moved. Null for fewer than
 * three carried places, or places on one line.
 */
function fitToFeatures(features: readonly AnchoredFeature[], landings: readonly (Landing | null)[]): Alignment | null {
  const pairs = features.flatMap((f, i) => (landings[i] ? [{ from: f.point, to: landings[i]!.point }] : []));
  if (pairs.length < 3) return null;
  try {
    const space = { units: 'cm' as const, upAxis: 'y' as const, positions: new Float64Array(3) };
    return { ...alignSurfaces(space, space, pairs), kind: 'features' };
  } catch (error) {
    if (error instanceof GroomError) return null;
    throw error;
  }
}

/** On the same topology a spec's file vertex stays the same file vertex. */
function keptVertex(spec: GroomSpec, f: AnchoredFeature): number | undefined {
  const s = f.slot;
  if (s.list === 'singularities') return spec.field.singularities[s.item].vertex;
  if (s.list === 'pins') return spec.pins[s.item].vertex;
  if (s.list === 'partings' || s.list === 'crests') return spec.field[s.list][s.item].vertices?.[s.point!];
  if (s.list === 'sides') return spec.guideSets![s.item].region.from!.vertex;
  return undefined;
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/** Whether any vertex of the chain (ends included) is on a free boundary or next to one. */
function touchesOpening(surface: GroomSurface, chain: readonly number[]): boolean {
  const t = surface.field.topology;
  for (const v of chain) {
    if (t.isBoundaryVertex[v]) return true;
    const start = t.vertexHalfedge[v];
    let h = start;
    do {
      if (t.isBoundaryVertex[t.triangles[nextHalfedge(h)]]) return true;
      h = nextAroundVertex(t, h);
    } while (h !== -1 && h !== start);
  }
  return false;
}

/**
 * Curves that would now cross an opening, with the reason: between two consecutive carried points
 * the new surface's path has to go round an opening (it runs along one) where the old path did
 * not, or the points are not joined at all. A curve that already ran beside an opening is kept.
 */
function curvesCrossingOpenings(
  spec: GroomSpec,
  features: readonly AnchoredFeature[],
  landings: readonly (Landing | null)[],
  from: TransferSide,
  to: TransferSide,
): Map<string, string> {
  const out = new Map<string, string>();
  const byCurve = new Map<string, { old: [number, number, number]; landing: Landing }[]>();
  features.forEach((f, i) => {
    if (f.kind !== 'curve vertex' || !landings[i]) return;
    const path = `field.${f.slot.list}[${f.slot.item}]`;
    if (!byCurve.has(path)) byCurve.set(path, []);
    byCurve.get(path)!.push({ old: f.point, landing: landings[i]! });
  });
  for (const [path, points] of byCurve) {
    const closed = (path.includes('partings') ? spec.field.partings : spec.field.crests)[Number(/\[(\d+)\]/.exec(path)![1])].closed;
    const ends = closed ? [...points, points[0]] : points;
    for (let j = 1; j < ends.length; j++) {
      try {
        const a0 = vertexOfPlace(from.surface, { point: ends[j - 1].old }, path), a1 = vertexOfPlace(from.surface, { point: ends[j].old }, path);
        const b0 = vertexOfPlace(to.surface, { point: ends[j - 1].landing.point }, path), b1 = vertexOfPlace(to.surface, { point: ends[j].landing.point }, path);
        const before = touchesOpening(from.surface, edgePath(from.surface, a0, a1, path));
        const after = touchesOpening(to.surface, edgePath(to.surface, b0, b1, path));
        if (after && !before) {
          out.set(path, `between its points ${j - 1} and ${j % points.length} an opening of the new surface lies across it (the path would have to go round it)`);
          break;
        }
      } catch (error) {
        if (!(error instanceof GroomError)) throw error;
        out.set(path, `its points ${j - 1} and ${j % points.length} are no longer joined on the new surface (an opening lies between them)`);
        break;
      }
    }
  }
  return out;
}

/**
 * The editor's mirror plane in the new surface's space: its normal turned and one of its points
 * moved by the alignment, the seam scaled. Written by normal and offset (the turned plane need not
 * lie across a world axis any more).
 */
function carriedSymmetry(symmetry: SymmetrySpec, alignment: Alignment): SymmetrySpec {
  const plane = planeOfSymmetry(symmetry);
  const n = plane.normal;
  const onPlane = alignPoint(alignment, [n[0] * plane.offset, n[1] * plane.offset, n[2] * plane.offset]);
  const normal = alignDirection(alignment, n);
  const offset = normal[0] * onPlane[0] + normal[1] * onPlane[1] + normal[2] * onPlane[2];
  return { normal, offset, ...(symmetry.seam !== undefined ? { seam: symmetry.seam * alignment.scale } : {}) };
}
