// The studio's computation, as the field worker runs it: read and prepare the growth surface
// once, then solve the spec's field on every edit, trace what the page draws, and grow guides —
// all with lib/field and lib/groom, the code the server runs for exports. No DOM, no messages:
// field-worker.ts wraps this in the worker protocol, and the unit tests call it directly.
import {
  FieldError,
  buildDirectionField,
  indexBudget,
  readSurface,
  solveConnection,
  type BoundaryMode,
  type DirectionField,
  type FieldRequest,
  type SolvedField,
  type TriangleMesh,
} from '@/lib/field';
import {
  DEMO_GROOMS,
  GroomError,
  createTracer,
  edgePath,
  fieldRequestFromSpec,
  growGuides,
  growthMask,
  prepareGroomSurface,
  solveGroomField,
  vertexOfPlace,
  CENTIMETRES_PER_UNIT,
  type GroomSpec,
  type GroomSurface,
} from '@/lib/groom';
import {
  NONZERO_LIMIT,
  type DisplayOptions,
  type GrownGuides,
  type InspectedSurface,
  type IndexProof,
  type OpenedSurface,
  type ProgressReport,
  type SingularityCheck,
  type SolveReport,
  type SurfaceSource,
  type WorkerError,
} from './protocol';
import type { Vec3 } from './features';

const now = () => performance.now();

/** Milliseconds per face for preparing a surface (topology, generators, factorization), for the progress estimate. */
const PREPARE_MS_PER_FACE = 0.03;
/** Milliseconds per guide before the first growth has been timed. */
const FIRST_GUESS_MS_PER_GUIDE = 0.5;
/** Most strokes the field drawing uses, whatever the density asked. */
export const MAX_STROKES = 60_000;
const TRACE_POINTS = 12;

export function errorOf(error: unknown): WorkerError {
  if (error instanceof GroomError) return { code: error.code, message: error.message, ...(error.path ? { path: error.path } : {}) };
  if (error instanceof FieldError) return { code: error.code, message: error.message };
  if (error instanceof Error) return { code: 'internal', message: `Something went wrong in the field worker: ${error.message}` };
  return { code: 'internal', message: 'Something went wrong in the field worker.' };
}

/** The bytes of a surface source, with download progress. */
export async function loadSurfaceBytes(source: SurfaceSource, progress: (report: ProgressReport) => void): Promise<{ bytes: Uint8Array; fileName: string } | { mesh: TriangleMesh; fileName: string }> {
  if (source.kind === 'bytes') return { bytes: new Uint8Array(source.bytes), fileName: source.fileName };
  if (source.kind === 'demo') {
    const demo = DEMO_GROOMS.find((groom) => groom.id === source.demoId);
    if (!demo) throw new FieldError('unknown-demo', `There is no demo character "${source.demoId}".`);
    return { mesh: demo.surface(), fileName: `${demo.id}.obj` };
  }
  progress({ stage: 'downloading the surface', fraction: 0 });
  let response: Response;
  try {
    response = await fetch(source.url);
  } catch {
    throw new FieldError('download-failed', 'The surface file could not be downloaded: the file store did not answer. Check the connection and reload the page.');
  }
  if (!response.ok || !response.body) {
    throw new FieldError('download-failed', `The surface file could not be downloaded (the file store answered ${response.status}). Reload the page to get a fresh link.`);
  }
  const total = Number(response.headers.get('content-length')) || 0;
  const reader = response.body.getReader();
  const chunks: Uint8Array[] = [];
  let received = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    received += value.length;
    progress({ stage: 'downloading the surface', fraction: total > 0 ? Math.min(1, received / total) : null });
  }
  const bytes = new Uint8Array(received);
  let at = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, at);
    at += chunk.length;
  }
  return { bytes, fileName: source.fileName };
}

/** The faces that carry a stroke of the field drawing, spread evenly, and where each stroke sits. */
interface StrokeLayout {
  readonly faces: Uint32Array;
  /** Centre of each stroke (lifted off the skin a little). */
  readonly centers: Float32Array;
  readonly halfLength: number;
  /** Length of one spacing cell, in surface units. */
  readonly cell: number;
}

/** A deterministic shuffle of 0 … n − 1, so the strokes of a density do not follow the face order. */
function shuffledOrder(n: number): Uint32Array {
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  let seed = 0x9e3779b9;
  for (let i = n - 1; i > 0; i--) {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    const j = seed % (i + 1);
    const t = order[i];
    order[i] = order[j];
    order[j] = t;
  }
  return order;
}

/**
 * The studio's field engine. One instance holds one prepared surface; `solve` may be called on
 * every edit, and re-uses the factorization (lib/field never refactors for a new request).
 */
export class FieldEngine {
  private mesh: TriangleMesh | null = null;
  private surface: GroomSurface | null = null;
  private centroids: Float32Array | null = null;
  private order: Uint32Array | null = null;
  private totalArea = 0;
  private readonly layouts = new Map<number, StrokeLayout>();
  /** Resolved places of single features, by their JSON, so a drag re-resolves only what moved. */
  private readonly placeMemo = new Map<string, unknown>();
  private lastFull: { key: string; solved: SolvedField } | null = null;
  private lastField: { key: string; field: DirectionField; requestedIndex: Float64Array; cutEdge: Uint8Array } | null = null;
  private msPerGuide = FIRST_GUESS_MS_PER_GUIDE;

  constructor(private readonly progress: (report: ProgressReport) => void = () => {}) {}

  get prepared(): GroomSurface | null {
    return this.surface;
  }

  /** Reads and prepares a surface: the one expensive step (the factorization), with progress. */
  async open(source: SurfaceSource, boundary: BoundaryMode): Promise<OpenedSurface> {
    const started = now();
    const loaded = await loadSurfaceBytes(source, this.progress);
    const t0 = now();
    let mesh: TriangleMesh;
    let fileVertexCount: number;
    if ('mesh' in loaded) {
      mesh = loaded.mesh;
      fileVertexCount = mesh.positions.length / 3;
    } else {
      this.progress({ stage: 'reading the surface file', fraction: null });
      const read = readSurface(loaded.bytes, loaded.fileName);
      mesh = read.mesh;
      fileVertexCount = read.sourceVertexCount;
    }
    const t1 = now();
    this.prepare(mesh, boundary);
    const t2 = now();
    return this.describe(fileVertexCount, { downloadMilliseconds: t0 - started, readMilliseconds: t1 - t0, prepareMilliseconds: t2 - t1 });
  }

  /** Reads a file that may be broken, only to draw it: no checks beyond what reading needs. */
  async inspect(source: SurfaceSource): Promise<InspectedSurface> {
    const loaded = await loadSurfaceBytes(source, this.progress);
    this.progress({ stage: 'reading the surface file', fraction: null });
    const mesh = 'mesh' in loaded ? loaded.mesh : readSurface(loaded.bytes, loaded.fileName).mesh;
    return { positions: mesh.positions.slice(), triangles: mesh.triangles.slice() };
  }

  private prepare(mesh: TriangleMesh, boundary: BoundaryMode): void {
    const faces = mesh.triangles.length / 3;
    this.progress({ stage: 'preparing the field solver (a one-off factorization of the surface)', fraction: null, expectedMilliseconds: faces * PREPARE_MS_PER_FACE });
    const t0 = now();
    const surface = prepareGroomSurface(mesh, { boundary });
    const spent = now() - t0;
    if (faces > 1000) this.progress({ stage: 'surface prepared', fraction: 1, expectedMilliseconds: spent });
    this.mesh = mesh;
    this.surface = surface;
    this.placeMemo.clear();
    this.lastFull = null;
    this.lastField = null;
    this.layouts.clear();
    const tri = mesh.triangles;
    const p = mesh.positions;
    const centroids = new Float32Array(tri.length);
    for (let f = 0; f < faces; f++) {
      for (let k = 0; k < 3; k++) {
        centroids[3 * f + k] = (p[3 * tri[3 * f] + k] + p[3 * tri[3 * f + 1] + k] + p[3 * tri[3 * f + 2] + k]) / 3;
      }
    }
    this.centroids = centroids;
    this.order = shuffledOrder(faces);
    this.totalArea = surface.faceArea.reduce((sum, a) => sum + a, 0);
  }

  private requireSurface(): GroomSurface {
    if (!this.surface) throw new FieldError('no-surface', 'No surface is open yet.');
    return this.surface;
  }

  private describe(fileVertexCount: number, timings: OpenedSurface['timings']): OpenedSurface {
    const surface = this.requireSurface();
    const { mesh, field } = surface;
    const topology = field.topology;
    const p = mesh.positions;
    const boundary: number[] = [];
    for (const loop of topology.boundaryLoops) {
      for (const h of loop) {
        const a = topology.triangles[h];
        const b = topology.triangles[h % 3 === 2 ? h - 2 : h + 1];
        boundary.push(p[3 * a], p[3 * a + 1], p[3 * a + 2], p[3 * b], p[3 * b + 1], p[3 * b + 2]);
      }
    }
    let cx = 0, cy = 0, cz = 0;
    const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
    for (let v = 0; v < p.length / 3; v++) {
      for (let k = 0; k < 3; k++) {
        min[k] = Math.min(min[k], p[3 * v + k]);
        max[k] = Math.max(max[k], p[3 * v + k]);
      }
    }
    cx = (min[0] + max[0]) / 2;
    cy = (min[1] + max[1]) / 2;
    cz = (min[2] + max[2]) / 2;
    return {
      vertexCount: topology.vertexCount,
      faceCount: topology.faceCount,
      fileVertexCount,
      positions: p.slice(),
      triangles: mesh.triangles.slice(),
      vertexNormals: Float32Array.from(surface.vertexNormal),
      componentOfVertex: field.componentOfVertex.slice(),
      components: field.components.map((c) => ({ faceCount: c.faceCount, eulerCharacteristic: c.eulerCharacteristic, boundaryLoopCount: c.boundaryLoopCount, genus: c.genus })),
      boundaryLines: Float32Array.from(boundary),
      groups: mesh.groups?.names.slice() ?? [],
      center: [cx, cy, cz],
      radius: surface.diagonal / 2,
      diagonal: surface.diagonal,
      meanEdge: surface.meanEdge,
      boundary: field.boundary,
      timings,
    };
  }

  /** Prepares the surface again when the spec holds its boundary differently (a new factorization). */
  private ensureBoundary(spec: GroomSpec): GroomSurface {
    const surface = this.requireSurface();
    if (surface.field.boundary !== spec.field.boundary && this.mesh) this.prepare(this.mesh, spec.field.boundary);
    return this.requireSurface();
  }

  private memo<T>(key: string, make: () => T): T {
    if (this.placeMemo.has(key)) return this.placeMemo.get(key) as T;
    const value = make();
    if (this.placeMemo.size > 5000) this.placeMemo.clear();
    this.placeMemo.set(key, value);
    return value;
  }

  /**
   * The field request of a spec, as `fieldRequestFromSpec` makes it, assembled feature by
   * feature so that features that did not change since the last solve are not snapped again
   * (joining a parting's points along the mesh is a shortest-path search). Each feature is
   * resolved by `fieldRequestFromSpec` itself, on a spec that holds that feature alone.
   */
  requestFor(spec: GroomSpec): FieldRequest {
    const surface = this.requireSurface();
    const empty = { ...spec.field, singularities: [], partings: [], crests: [], strokes: [] };
    const alone = (field: Partial<GroomSpec['field']>) => fieldRequestFromSpec({ ...spec, field: { ...empty, ...field } }, surface);
    const base = this.memo(`base ${spec.field.order} ${spec.upAxis} ${spec.field.rotation} ${JSON.stringify(spec.field.referenceDirection)}`, () => alone({}));
    const renumber = <T>(index: number, list: string, make: () => T): T => {
      try {
        return make();
      } catch (error) {
        // The single-feature spec numbers its one feature 0; say where it is in the whole spec.
        if (error instanceof GroomError) {
          const fix = (text: string) => text.replaceAll(`${list}[0]`, `${list}[${index}]`);
          throw new GroomError(error.code, fix(error.message), error.path ? fix(error.path) : undefined);
        }
        throw error;
      }
    };
    const singularities = spec.field.singularities.map((s, i) =>
      renumber(i, 'field.singularities', () => this.memo(`s ${JSON.stringify(s)}`, () => alone({ singularities: [s] }).singularities![0])),
    );
    const partings = spec.field.partings.map((c, i) => renumber(i, 'field.partings', () => this.memo(`p ${JSON.stringify(c)}`, () => alone({ partings: [c] }).curves![0])));
    const crests = spec.field.crests.map((c, i) => renumber(i, 'field.crests', () => this.memo(`c ${JSON.stringify(c)}`, () => alone({ crests: [c] }).curves![0])));
    const strokes = spec.field.strokes.map((s, i) => renumber(i, 'field.strokes', () => this.memo(`k ${JSON.stringify(s)}`, () => alone({ strokes: [s] }).strokes![0])));
    return { ...base, singularities, curves: [...partings, ...crests], strokes };
  }

  /**
   * Solves the spec's field. A full solve is `solveGroomField` — connection, field, and the
   * independent measurement of every vertex's index, which must equal what was placed — and
   * reports that measurement. A quick solve (while a feature is dragged) skips the measurement.
   * Never throws: a spec that cannot be solved comes back with the reason.
   */
  solve(spec: GroomSpec, display: DisplayOptions, quick: boolean): SolveReport {
    const t0 = now();
    const surface = this.ensureBoundary(spec);
    const fieldKey = JSON.stringify(spec.field) + spec.upAxis;
    let request: FieldRequest | null = null;
    let budget: SolveReport['budget'] = null;
    let error: WorkerError | null = null;
    try {
      request = this.requestFor(spec);
      budget = indexBudget(surface.field, request);
    } catch (failure) {
      error = errorOf(failure);
    }
    let pinVertices: number[] = [];
    try {
      pinVertices = spec.pins.map((pin, i) => vertexOfPlace(surface, pin, `pins[${i}]`));
    } catch (failure) {
      error ??= errorOf(failure);
    }

    let field: { field: DirectionField; requestedIndex: Float64Array; cutEdge: Uint8Array } | null = null;
    let solved: SolvedField | null = null;
    if (request && !error) {
      try {
        if (this.lastFull?.key === fieldKey) {
          solved = this.lastFull.solved;
        } else if (quick) {
          if (this.lastField?.key !== fieldKey) {
            const connection = solveConnection(surface.field, request);
            this.lastField = { key: fieldKey, field: buildDirectionField(surface.field, connection, request), requestedIndex: connection.requestedIndex, cutEdge: connection.cutEdge };
          }
        } else {
          solved = solveGroomField(spec, surface);
          this.lastFull = { key: fieldKey, solved };
        }
        if (solved) {
          this.lastField = { key: fieldKey, field: solved.field, requestedIndex: solved.connection.requestedIndex, cutEdge: solved.connection.cutEdge };
        }
        field = this.lastField;
      } catch (failure) {
        error = errorOf(failure);
      }
    }

    const singularities: SingularityCheck[] = (request?.singularities ?? []).map((s) => ({
      vertex: s.vertex,
      requested: field ? field.requestedIndex[s.vertex] : s.index,
      measured: solved ? solved.measuredIndex[s.vertex] : null,
    }));
    const drawing = field ? this.drawField(field, display) : null;
    return {
      quick,
      lines: drawing?.lines ?? null,
      lineShade: drawing?.shade ?? null,
      error,
      budget: budget && { components: budget.components.map((c) => ({ ...c })), balanced: budget.balanced },
      singularities,
      pinVertices,
      curves: (request?.curves ?? []).map((curve) => ({ kind: curve.kind, points: this.chainPoints(curve.vertices) })),
      proof: solved ? proofOf(solved) : null,
      milliseconds: now() - t0,
    };
  }

  private chainPoints(vertices: readonly number[]): Float32Array {
    const surface = this.requireSurface();
    const p = surface.mesh.positions;
    const n = surface.vertexNormal;
    const lift = 0.15 * surface.meanEdge;
    const out = new Float32Array(3 * vertices.length);
    vertices.forEach((v, i) => {
      for (let k = 0; k < 3; k++) out[3 * i + k] = p[3 * v + k] + lift * n[3 * v + k];
    });
    return out;
  }

  /** The faces that carry strokes at a density: one per cell of a grid whose cells hold about equal areas. */
  private layout(density: number): StrokeLayout {
    const surface = this.requireSurface();
    const wanted = Math.max(50, Math.min(MAX_STROKES, Math.round(density)));
    const cached = this.layouts.get(wanted);
    if (cached) return cached;
    const centroids = this.centroids!;
    const order = this.order!;
    const faces = order.length;
    const cell = Math.sqrt(this.totalArea / wanted);
    const taken = new Set<number>();
    const chosen: number[] = [];
    const span = 1 << 20;
    for (let i = 0; i < faces; i++) {
      const f = order[i];
      const ix = Math.floor(centroids[3 * f] / cell) + span / 2;
      const iy = Math.floor(centroids[3 * f + 1] / cell) + span / 2;
      const iz = Math.floor(centroids[3 * f + 2] / cell) + span / 2;
      const key = (ix * span + iy) * span + iz;
      if (taken.has(key)) continue;
      taken.add(key);
      chosen.push(f);
    }
    const normal = surface.field.frames.normal;
    const lift = 0.08 * surface.meanEdge;
    const centers = new Float32Array(3 * chosen.length);
    chosen.forEach((f, i) => {
      for (let k = 0; k < 3; k++) centers[3 * i + k] = centroids[3 * f + k] + lift * normal[3 * f + k];
    });
    const layout = { faces: Uint32Array.from(chosen), centers, halfLength: 0.38 * cell, cell };
    if (this.layouts.size > 8) this.layouts.clear();
    this.layouts.set(wanted, layout);
    return layout;
  }

  private drawField(solved: { field: DirectionField; requestedIndex: Float64Array; cutEdge: Uint8Array }, display: DisplayOptions): { lines: Float32Array; shade: Float32Array } {
    if (display.drawing === 'streamlines') return this.streamlines(solved, display.density / 6);
    const { faces, centers, halfLength } = this.layout(display.density);
    const d = solved.field.faceDirection;
    const lines = new Float32Array(6 * faces.length);
    const shade = new Float32Array(2 * faces.length);
    for (let i = 0; i < faces.length; i++) {
      const f = faces[i];
      for (let k = 0; k < 3; k++) {
        lines[6 * i + k] = centers[3 * i + k] - halfLength * d[3 * f + k];
        lines[6 * i + 3 + k] = centers[3 * i + k] + halfLength * d[3 * f + k];
      }
      shade[2 * i + 1] = 1;
    }
    return { lines, shade };
  }

  private streamlines(solved: { field: DirectionField; requestedIndex: Float64Array; cutEdge: Uint8Array }, seeds: number): { lines: Float32Array; shade: Float32Array } {
    const surface = this.requireSurface();
    const { faces, centers, cell } = this.layout(seeds);
    const singular = new Uint8Array(surface.field.topology.vertexCount);
    solved.requestedIndex.forEach((index, v) => {
      if (index !== 0) singular[v] = 1;
    });
    const tracer = createTracer(surface.field, solved.field, singular, solved.cutEdge);
    const length = 3.2 * cell;
    const targets = new Float64Array(TRACE_POINTS);
    for (let i = 0; i < TRACE_POINTS; i++) targets[i] = ((i + 1) * length) / TRACE_POINTS;
    const out = new Float64Array(3 * (TRACE_POINTS + 1));
    const outFace = new Uint32Array(TRACE_POINTS + 1);
    const normal = surface.field.frames.normal;
    const lift = 0.08 * surface.meanEdge;
    const lines: number[] = [];
    const shade: number[] = [];
    for (let i = 0; i < faces.length; i++) {
      const f = faces[i];
      const x = centers[3 * i] - lift * normal[3 * f], y = centers[3 * i + 1] - lift * normal[3 * f + 1], z = centers[3 * i + 2] - lift * normal[3 * f + 2];
      out[0] = x; out[1] = y; out[2] = z;
      outFace[0] = f;
      const reached = tracer.trace(f, x, y, z, targets, TRACE_POINTS, out, outFace, 1);
      for (let j = 0; j < reached; j++) {
        const a = j, b = j + 1;
        for (const [q, face] of [[a, outFace[a]], [b, outFace[b]]] as const) {
          lines.push(out[3 * q] + lift * normal[3 * face], out[3 * q + 1] + lift * normal[3 * face + 1], out[3 * q + 2] + lift * normal[3 * face + 2]);
        }
        shade.push(a / TRACE_POINTS, b / TRACE_POINTS);
      }
    }
    return { lines: Float32Array.from(lines), shade: Float32Array.from(shade) };
  }

  /** The last fully solved field of this spec, solving it when the field part changed. */
  private fullySolved(spec: GroomSpec): SolvedField {
    const surface = this.ensureBoundary(spec);
    const key = JSON.stringify(spec.field) + spec.upAxis;
    if (this.lastFull?.key === key) return this.lastFull.solved;
    this.progress({ stage: 'solving the field', fraction: null });
    const solved = solveGroomField(spec, surface);
    this.lastFull = { key, solved };
    return solved;
  }

  /** Grows the spec's guides with `growGuides`, exactly as an export would. */
  grow(spec: GroomSpec): GrownGuides {
    const t0 = now();
    const surface = this.requireSurface();
    const solved = this.fullySolved(spec);
    const expected = this.expectedGuides(spec, surface);
    this.progress({ stage: `growing about ${expected.toLocaleString('en-GB')} guides`, fraction: null, expectedMilliseconds: expected * this.msPerGuide });
    const grown = growGuides(surface, solved, spec);
    const spent = now() - t0;
    if (grown.guides.count > 200) this.msPerGuide = spent / grown.guides.count;
    return {
      count: grown.guides.count,
      pointsPerGuide: grown.guides.pointsPerGuide,
      points: Float32Array.from(grown.guides.points),
      areaSquareCm: grown.areaSquareCm,
      milliseconds: spent,
    };
  }

  private expectedGuides(spec: GroomSpec, surface: GroomSurface): number {
    if (spec.guides.count !== undefined) return spec.guides.count;
    let area = 0;
    try {
      const mask = growthMask(surface.mesh, spec.guides.regions);
      for (let f = 0; f < mask.length; f++) if (mask[f]) area += surface.faceArea[f];
    } catch {
      area = this.totalArea;
    }
    return Math.round((spec.guides.density ?? 1) * area * CENTIMETRES_PER_UNIT[spec.units] ** 2);
  }

  /** The path a curve being drawn would take: its points snapped to vertices and joined along mesh edges. */
  curvePath(points: readonly Vec3[], closed: boolean): Float32Array {
    const surface = this.requireSurface();
    const nearest = surface.nearestVertex();
    const anchors = points.map((p) => nearest.find(p[0], p[1], p[2]).vertex);
    if (closed && anchors.length > 2) anchors.push(anchors[0]);
    const chain: number[] = anchors.length > 0 ? [anchors[0]] : [];
    for (let i = 1; i < anchors.length; i++) {
      if (anchors[i] === chain[chain.length - 1]) continue;
      chain.push(...edgePath(surface, chain[chain.length - 1], anchors[i], 'the curve').slice(1));
    }
    return this.chainPoints(chain);
  }
}

/** What the independent measurement of a solved field says, against what was placed. */
export function proofOf(solved: SolvedField): IndexProof {
  const { requestedIndex, constrainedVertex } = solved.connection;
  const measured = solved.measuredIndex;
  const nonZero: { vertex: number; index: number }[] = [];
  let nonZeroCount = 0, strays = 0, mismatches = 0, measuredVertices = 0, measuredSum = 0;
  for (let v = 0; v < measured.length; v++) {
    if (!constrainedVertex[v]) continue;
    measuredVertices++;
    const m = Math.round(measured[v] * 1e9) / 1e9;
    measuredSum += m;
    if (Math.abs(m - requestedIndex[v]) > 1e-6) mismatches++;
    if (Math.abs(m) <= 1e-6) continue;
    nonZeroCount++;
    if (requestedIndex[v] === 0) strays++;
    if (nonZero.length < NONZERO_LIMIT) nonZero.push({ vertex: v, index: m });
  }
  return { measuredVertices, nonZero, nonZeroCount, strays, mismatches, measuredSum: Math.round(measuredSum * 1e6) / 1e6 };
}
