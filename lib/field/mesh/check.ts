/**
 * Everything wrong with an uploaded surface at once, in words a groomer can act on: the field
 * engine itself stops at the first problem, but an upload page should list them all with counts
 * and examples, plus the facts of the surface (χ, genus, boundary loops, area).
 */
import { analyseEdges, Examples } from './check-edges';
import { boundingBox, componentFacts, faceAreas, type BoundingBox, type ComponentFacts } from './geometry';
import { FieldError, describeFirst } from './errors';
import { faceCount, vertexCount, type TriangleMesh } from './mesh';
import { DEFAULT_MAX_FACES, readSurface, type ReadSurfaceOptions, type SurfaceReadResult } from './read';
import { EXAMPLE_LIMIT } from './read/soup';
import { buildTopology } from './topology';
import { uvFacts, type UvFacts } from './uv-check';

/**
 * Faces whose height, relative to their longest side, is below this are taken to have no area:
 * flatter than that, a face's normal and its two small angles are decided by the rounding of its
 * coordinates rather than by its shape, even for a face a thousand times smaller than the model.
 */
export const DEFAULT_DEGENERATE_TOLERANCE = 1e-9;

export interface Problem {
  /** Stable reason, e.g. `non-manifold-edge`; reader failures keep the reader's FieldError code. */
  readonly code: string;
  /** An error stops the field from being computed; a warning is worth knowing but allowed. */
  readonly severity: 'error' | 'warning';
  /** Plain words for the groomer: what is wrong, how much, where, and what it means. */
  readonly message: string;
  /** How many faces, vertices or edges have the problem. */
  readonly count: number;
  /**
   * The first few of them, numbered from 0: face or vertex indices; for `where: 'edge'`, the two
   * end vertices of each edge one after the other (a0, b0, a1, b1, …). Faces of the `collapsed-faces`
   * problem are numbered as in the file, since they are not in the mesh.
   */
  readonly examples: readonly number[];
  /**
   * The same examples in the file's own numbering (file vertices and file polygons; OBJ counts
   * from 1, the other formats from 0, see `inFileFrom`), when the mesh came with a `FileNumbering`.
   * The message names these.
   */
  readonly inFile?: readonly number[];
  /** Where the file's numbering starts: 1 for OBJ, 0 for the others. Present with `inFile`. */
  readonly inFileFrom?: 0 | 1;
  /** What `count` and `examples` count; `file` for a file that could not be read at all. */
  readonly where: 'face' | 'vertex' | 'edge' | 'file';
}

export interface SurfaceFacts {
  /** Vertices in the mesh, including any that no face uses. */
  readonly vertexCount: number;
  readonly usedVertexCount: number;
  readonly faceCount: number;
  /** Distinct edges of the faces that have three different, existing vertices. */
  readonly edgeCount: number;
  /** Pieces of the surface connected through shared edges. */
  readonly componentCount: number;
  /**
   * V − E + F over the vertices faces use, and the faces with three different, existing vertices
   * and their edges; 2 for a closed sphere-like surface.
   */
  readonly eulerCharacteristic: number;
  /**
   * Boundary loops, and per component χ, boundary loops and genus (χ = 2 − 2g − b); null when
   * the surface is not manifold and consistently oriented, where these are not defined.
   */
  readonly boundaryLoopCount: number | null;
  readonly genus: number | null;
  readonly components: readonly ComponentFacts[] | null;
  /** Total area of the faces whose coordinates are all finite, in the file's units squared. */
  readonly surfaceArea: number;
  readonly boundingBox: BoundingBox | null;
  /** Whether the surface has UVs and whether they overlap (see `uvFacts`). */
  readonly uvs: UvFacts;
}

export interface SurfaceReport {
  /** True when there is no problem of severity `error`. */
  readonly ok: boolean;
  readonly problems: readonly Problem[];
  /** Null only when the file could not be read. */
  readonly facts: SurfaceFacts | null;
}

/**
 * How the file a mesh was read from numbers what the mesh calls vertices and faces, so that
 * problems are stated in the artist's numbering (the numbers their modelling program shows).
 */
export interface FileNumbering {
  /** Where the file starts counting: 1 for OBJ (its faces name vertices from 1), 0 otherwise. */
  readonly from: 0 | 1;
  /** The file vertex (0-based) of each mesh vertex; null when the file has no vertex numbers (STL). */
  readonly vertex: ArrayLike<number> | null;
  /** The file polygon (0-based) each mesh face was cut from. */
  readonly face: ArrayLike<number>;
}

export interface CheckSurfaceOptions {
  /** States the problems' examples in the file's own numbering (see `FileNumbering`). */
  readonly numbering?: FileNumbering;
  /**
   * False leaves out what only describes the surface — UV overlaps, genus, boundary loops and
   * pieces (null or empty in the facts) and the warnings about them — for a caller that only needs
   * the errors (they are found the same). Default true.
   */
  readonly describe?: boolean;
  /** Most faces allowed. Default `DEFAULT_MAX_FACES`. */
  readonly maxFaces?: number;
  /** See `DEFAULT_DEGENERATE_TOLERANCE`. */
  readonly degenerateTolerance?: number;
}

const plural = (n: number, one: string, many: string) => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;

function pairs(flat: readonly number[]): string[] {
  const out: string[] = [];
  for (let i = 0; i + 1 < flat.length; i += 2) out.push(`${flat[i]}–${flat[i + 1]}`);
  return out;
}

/**
 * Words and numbers for a problem's examples: in the file's numbering when it is known ("vertices
 * 12, 40 as numbered in the file, from 1"), else the mesh's own, counted from 0.
 */
function namer(numbering: FileNumbering | undefined) {
  const map = (where: 'vertex' | 'face' | 'edge', items: readonly number[]): readonly number[] | null => {
    if (!numbering) return null;
    const table = where === 'face' ? numbering.face : numbering.vertex;
    return table ? items.map((i) => table[i] + numbering.from) : null;
  };
  return {
    list(where: 'vertex' | 'face' | 'edge', items: readonly number[]): string {
      const shown = map(where, items) ?? items;
      const which = where === 'edge' ? `between vertices ${describeFirst(pairs(shown))}` : `${where === 'face' ? 'faces' : 'vertices'} ${describeFirst(shown)}`;
      return `${which}${map(where, items) ? ` in the file's own numbering, counting from ${numbering!.from}` : ''}`;
    },
    inFile(where: 'vertex' | 'face' | 'edge', items: readonly number[]): Pick<Problem, 'inFile' | 'inFileFrom'> {
      const shown = map(where, items);
      return shown ? { inFile: shown, inFileFrom: numbering!.from } : {};
    },
    /** A problem whose message names `listed` (the examples unless given) where `words` puts them. */
    problem(code: string, severity: Problem['severity'], where: 'vertex' | 'face' | 'edge', count: number, examples: readonly number[], words: (at: string) => string, listed = examples): Problem {
      return { code, severity, message: words(this.list(where, listed)), count, examples, where, ...this.inFile(where, examples) };
    },
  };
}

/**
 * Checks a triangle mesh for everything that stops a direction field from being computed on it,
 * and measures it.
 *
 * Guarantees: never throws, and takes time linear in the numbers of vertices and faces, for any
 * mesh, however broken: out-of-range indices, repeated corners and non-finite coordinates are
 * reported, not trusted. Detects, with counts and first examples: no faces, too many faces,
 * non-finite coordinates, corners referring to missing vertices, edges with more than two faces,
 * neighbouring faces of opposite orientation, vertices where surface pieces meet at a single
 * point, faces of (numerically) zero area — all errors — and vertices no face uses, a surface
 * in several pieces, overlapping UVs and UV triangles of no area — warnings. `ok` is true exactly when there is no error, and then
 * `buildTopology(mesh)` succeeds and the facts include genus and boundary loops.
 */
export function checkSurface(mesh: TriangleMesh, options: CheckSurfaceOptions = {}): SurfaceReport {
  const maxFaces = options.maxFaces ?? DEFAULT_MAX_FACES;
  const tolerance = options.degenerateTolerance ?? DEFAULT_DEGENERATE_TOLERANCE;
  // Trailing values that do not make a whole vertex or face are ignored; readers never write them.
  const nV = Math.floor(vertexCount(mesh));
  const nF = Math.floor(faceCount(mesh));
  const tri = mesh.triangles.subarray(0, 3 * nF);
  const p = mesh.positions.subarray(0, 3 * nV);
  const whole: TriangleMesh = { positions: p, triangles: tri };
  const problems: Problem[] = [];
  const named = namer(options.numbering);

  if (nF === 0) {
    problems.push({ code: 'no-faces', severity: 'error', message: 'The surface has no faces, so there is nothing to grow on.', count: 0, examples: [], where: 'face' });
  }
  if (nF > maxFaces) {
    problems.push({
      code: 'too-many-faces',
      severity: 'error',
      message: `The surface has ${plural(nF, 'face', 'faces')}; the limit is ${maxFaces.toLocaleString('en-US')}. Decimate it before uploading.`,
      count: nF,
      examples: [],
      where: 'face',
    });
  }

  const finite = new Uint8Array(nV);
  const nonFinite = new Examples();
  for (let v = 0; v < nV; v++) {
    if (Number.isFinite(p[3 * v]) && Number.isFinite(p[3 * v + 1]) && Number.isFinite(p[3 * v + 2])) finite[v] = 1;
    else nonFinite.add(v);
  }
  if (nonFinite.count > 0) {
    problems.push(named.problem('non-finite-coordinates', 'error', 'vertex', nonFinite.count, nonFinite.items, (at) => `${plural(nonFinite.count, 'vertex has', 'vertices have')} a coordinate that is not a number or is infinite (${at}).`));
  }

  // Faces with three different, existing vertices take part in the edge analysis; the others are
  // reported and left out of it, since they have no well-defined sides.
  const valid = new Uint8Array(nF);
  const outOfRange = new Examples();
  const degenerate = new Examples();
  const used = new Uint8Array(nV);
  const areas = faceAreas(whole);
  let surfaceArea = 0;
  let repeatedCorners = 0;
  for (let f = 0; f < nF; f++) {
    const a = tri[3 * f];
    const b = tri[3 * f + 1];
    const c = tri[3 * f + 2];
    if (a >= nV || b >= nV || c >= nV) {
      outOfRange.add(f);
      continue;
    }
    used[a] = used[b] = used[c] = 1;
    if (a === b || b === c || c === a) {
      repeatedCorners++;
      degenerate.add(f);
      continue;
    }
    valid[f] = 1;
    if (!finite[a] || !finite[b] || !finite[c]) continue;
    surfaceArea += areas[f];
    let longest = 0;
    for (let k = 0; k < 3; k++) {
      const u = 3 * tri[3 * f + k];
      const w = 3 * tri[3 * f + ((k + 1) % 3)];
      longest = Math.max(longest, (p[w] - p[u]) ** 2 + (p[w + 1] - p[u + 1]) ** 2 + (p[w + 2] - p[u + 2]) ** 2);
    }
    // Twice the area over the longest side is the height onto that side.
    if (!((2 * areas[f]) / Math.sqrt(longest) > tolerance * Math.sqrt(longest))) degenerate.add(f);
  }
  if (outOfRange.count > 0) {
    problems.push(named.problem('vertex-out-of-range', 'error', 'face', outOfRange.count, outOfRange.items, (at) => `${plural(outOfRange.count, 'face refers', 'faces refer')} to vertices the surface does not have (it has ${nV}): ${at}.`));
  }
  if (degenerate.count > 0) {
    problems.push(named.problem('degenerate-faces', 'error', 'face', degenerate.count, degenerate.items, (at) => `${plural(degenerate.count, 'face has', 'faces have')} no area: their corners lie on one line or coincide (${at}). A direction cannot be laid on them; remove or repair them.`));
  }

  const edges = analyseEdges(tri, nV, valid);
  if (edges.nonManifold.count > 0) {
    problems.push(named.problem('non-manifold-edge', 'error', 'edge', edges.nonManifold.count, edges.nonManifold.items, (at) => `${plural(edges.nonManifold.count, 'edge is', 'edges are')} shared by more than two faces (${at}). Every edge may have at most one face on each side.`));
  }
  if (edges.misoriented.count > 0) {
    problems.push(named.problem('inconsistent-orientation', 'error', 'edge', edges.misoriented.count, edges.misoriented.items, (at) => `${plural(edges.misoriented.count, 'edge joins', 'edges join')} faces that face opposite ways (${at}): some faces are flipped. Unify the normals so that all point out of the skin.`));
  }
  if (edges.pinched.count > 0) {
    problems.push(named.problem('non-manifold-vertex', 'error', 'vertex', edges.pinched.count, edges.pinched.items, (at) => `At ${plural(edges.pinched.count, 'vertex', 'vertices')}, pieces of surface touch at a single point (${at}). Split or separate them.`));
  }

  const isolated = new Examples();
  let usedVertexCount = 0;
  for (let v = 0; v < nV; v++) {
    if (used[v]) usedVertexCount++;
    else isolated.add(v);
  }
  if (isolated.count > 0) {
    problems.push(named.problem('isolated-vertices', 'warning', 'vertex', isolated.count, isolated.items, (at) => `${plural(isolated.count, 'vertex belongs', 'vertices belong')} to no face (${at}); they are ignored.`));
  }
  if (edges.componentCount > 1) {
    problems.push(named.problem('several-components', 'warning', 'face', edges.componentCount, edges.componentStarts.slice(0, EXAMPLE_LIMIT), (at) => `The surface is made of ${edges.componentCount} separate pieces (first ${at}). Each piece gets its own field, and on each closed piece the singularities must add up on their own.`, edges.componentStarts));
  }

  const describe = options.describe ?? true;
  // Without cornerUvs the UV facts are "none", at no cost.
  const uvs = uvFacts({ ...whole, cornerUvs: describe ? mesh.cornerUvs : undefined });
  if (uvs.overlappingFaces.count > 0) {
    problems.push(named.problem('uvs-overlap', 'warning', 'face', uvs.overlappingFaces.count, uvs.overlappingFaces.examples, (at) => `The UVs of ${plural(uvs.overlappingFaces.count, 'face overlap', 'faces overlap')} others (${(100 * uvs.overlapFraction).toFixed(1)} % of the map is used twice; ${at}). Places and guide roots are still bound by polygon, but moving a groom to another surface by UV is ambiguous there.`));
  }
  if (uvs.collapsedFaces.count > 0) {
    problems.push(named.problem('uvs-collapsed', 'warning', 'face', uvs.collapsedFaces.count, uvs.collapsedFaces.examples, (at) => `${plural(uvs.collapsedFaces.count, 'face has', 'faces have')} UVs of no area (${at}): a UV names no single point there.`));
  }

  const ok = !problems.some((problem) => problem.severity === 'error');
  // Faces of zero area, or with non-finite corners, do not upset the connectivity; the rest does.
  const connectivityIntact =
    outOfRange.count === 0 && repeatedCorners === 0 && edges.nonManifold.count === 0 && edges.misoriented.count === 0 && edges.pinched.count === 0;
  const topology = connectivityIntact && describe ? buildTopology(whole) : null;
  const components = topology ? componentFacts(topology) : null;
  let validFaces = 0;
  for (let f = 0; f < nF; f++) validFaces += valid[f];
  return {
    ok,
    problems,
    facts: {
      vertexCount: nV,
      usedVertexCount,
      faceCount: nF,
      edgeCount: edges.edgeCount,
      componentCount: edges.componentCount,
      eulerCharacteristic: usedVertexCount - edges.edgeCount + validFaces,
      boundaryLoopCount: topology ? topology.boundaryLoops.length : null,
      genus: components ? components.reduce((sum, c) => sum + c.genus, 0) : null,
      components,
      surfaceArea,
      boundingBox: boundingBox(whole),
      uvs,
    },
  };
}

/**
 * How a read file numbers the mesh's vertices and faces: OBJ from 1 (as its face lines do), PLY
 * and glTF from 0 (as their index lists do); an STL file lists no vertices, so only its faces.
 */
export function fileNumbering(read: Pick<SurfaceReadResult, 'mesh' | 'format'>): FileNumbering {
  const { mesh } = read;
  const faces = mesh.triangles.length / 3;
  let vertex: Uint32Array | null = null;
  if (read.format !== 'stl' && mesh.fileVertexToVertex) {
    // Several file vertices may be welded into one: name it by the first.
    vertex = new Uint32Array(mesh.positions.length / 3).fill(0xffffffff);
    const map = mesh.fileVertexToVertex;
    for (let i = map.length - 1; i >= 0; i--) vertex[map[i]] = i;
  }
  const face = mesh.facePolygon ?? Uint32Array.from({ length: faces }, (_, f) => f);
  return { from: read.format === 'obj' ? 1 : 0, vertex, face };
}

/**
 * Reads a file and checks the surface in it, for an upload page: one report whatever happens.
 *
 * Guarantees: never throws a FieldError — a file that cannot be read gives a report with one
 * error problem carrying the reader's code and message (`where: 'file'`) and `facts: null`;
 * otherwise the report of `checkSurface`, plus a `collapsed-faces` warning when welding left out
 * triangles and a `uvs-incomplete` warning when only some corners had UVs, and `read` holds the reader's result.
 */
export function checkSurfaceFile(
  bytes: Uint8Array,
  fileName: string,
  options: ReadSurfaceOptions & CheckSurfaceOptions = {},
): { read: SurfaceReadResult | null; report: SurfaceReport } {
  let read: SurfaceReadResult;
  try {
    read = readSurface(bytes, fileName, options);
  } catch (error) {
    if (!(error instanceof FieldError)) throw error;
    return {
      read: null,
      report: { ok: false, problems: [{ code: error.code, severity: 'error', message: error.message, count: 1, examples: [], where: 'file' }], facts: null },
    };
  }
  const numbering = fileNumbering(read);
  let report = checkSurface(read.mesh, { numbering, ...options });
  if (read.uvs === 'incomplete') {
    const warning: Problem = {
      code: 'uvs-incomplete',
      severity: 'warning',
      message: 'Some corners of the file have texture coordinates (UVs) and some have none, so the surface is treated as having no UVs.',
      count: 1,
      examples: [],
      where: 'file',
    };
    report = { ...report, problems: [...report.problems, warning] };
  }
  const collapsed = read.collapsedTriangles;
  if (collapsed.count === 0) return { read, report };
  const warning: Problem = {
    code: 'collapsed-faces',
    severity: 'warning',
    message: `${plural(collapsed.count, 'triangle was', 'triangles were')} left out because two of its corners are the same point once vertices closer than ${read.weldTolerance.toPrecision(2)} are merged (from faces ${describeFirst(collapsed.examples.map((f) => f + numbering.from))} of the file, counted from ${numbering.from}).`,
    count: collapsed.count,
    examples: collapsed.examples,
    inFile: collapsed.examples.map((f) => f + numbering.from),
    inFileFrom: numbering.from,
    where: 'face',
  };
  return { read, report: { ...report, problems: [...report.problems, warning] } };
}
