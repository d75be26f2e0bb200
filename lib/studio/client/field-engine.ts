// The studio's computation, as the field worker runs it: read and prepare the growth surface
// once, then solve the spec's field on every edit (re-using what did not change), and grow
// guides — all with lib/field and lib/groom, the code the server runs for exports. Opening is
// surface-opening.ts's, drawing field-drawing.ts's, reports field-reports.ts's. No DOM, no
// messages: field-worker.ts wraps this in the worker protocol, and the unit tests call it directly.
import {
  FieldError,
  buildDirectionField,
  indexBudget,
  now,
  readSurface,
  readSurfaceOrPrepared,
  solveConnection,
  suggestLayout,
  type BoundaryMode,
  type FieldRequest,
  type IndexBudget,
  type PreparedGroundwork,
  type SolvedField,
  type TriangleMesh,
} from '@/lib/field';
import {
  GroomError,
  edgePath,
  fieldRequestFromSpec,
  growGuides,
  prepareGroomSurface,
  solveGroomField,
  vertexOfPlace,
  downOf,
  detectMirrorPlane,
  twistFaceOf,
  type GroomSpec,
  type GroomSurface,
} from '@/lib/groom';
import type { Vec3 } from './features';
import { FieldDrawing, type DrawableField } from './field-drawing';
import { expectedGuideCount } from './guide-estimate';
import { errorOf, proofOf } from './field-reports';
import type { DisplayOptions, FoundMirror, GrainFollow, GrainReading, GrownGuides, InspectedSurface, OpenedSurface, ProgressReport, RootsSource, SingularityCheck, SolveReport, SurfaceSource, TwistFaces, WorkerError } from './protocol';
import { describeSurface, loadSurfaceBytes, previewOf } from './surface-opening';


/** Milliseconds per face for preparing a surface (topology, generators, factorization), for the progress estimate. */
const PREPARE_MS_PER_FACE = 0.03;
/** Milliseconds per guide before the first growth has been timed. */
const FIRST_GUESS_MS_PER_GUIDE = 0.5;

/**
 * The studio's field engine. One instance holds one prepared surface; `solve` may be called on
 * every edit, and re-uses the factorization (lib/field never refactors for a new request).
 */
export class FieldEngine {
  private mesh: TriangleMesh | null = null;
  /** What the server's check worked out for the open surface (its prepared form's), for every preparation of it. */
  private groundwork: PreparedGroundwork | undefined;
  private surface: GroomSurface | null = null;
  private drawing: FieldDrawing | null = null;
  /** The mesh guides sample their roots on when it is not the open surface (see RootsSource). */
  private roots: { key: string; mesh: TriangleMesh } | null = null;
  /** Resolved places of single features, by their JSON, so a drag re-resolves only what moved. */
  private readonly placeMemo = new Map<string, unknown>();
  private lastFull: { key: string; solved: SolvedField } | null = null;
  private lastField: ({ key: string; budget: IndexBudget } & DrawableField) | null = null;
  private msPerGuide = FIRST_GUESS_MS_PER_GUIDE;

  constructor(private readonly progress: (report: ProgressReport) => void = () => {}) {}

  get prepared(): GroomSurface | null {
    return this.surface;
  }

  /**
   * Reads and prepares a surface: the one expensive step (the factorization), with progress. A
   * source with a `fallback` (the prepared form, with the file behind it) is read from the
   * fallback when it cannot be fetched or read.
   */
  async open(source: SurfaceSource, boundary: BoundaryMode): Promise<OpenedSurface> {
    const started = now();
    let read: Awaited<ReturnType<FieldEngine['read']>>;
    try {
      read = await this.read(source);
    } catch (error) {
      if (source.kind !== 'url' || !source.fallback) throw error;
      this.progress({ stage: 'reading the surface file instead of its prepared form', fraction: null });
      read = await this.read(source.fallback);
    }
    // The page draws the surface while the solver is prepared.
    this.progress({ stage: 'surface read', fraction: 1, preview: previewOf(read.mesh) });
    const t2 = now();
    this.groundwork = read.groundwork;
    this.prepare(read.mesh, boundary);
    const t3 = now();
    return describeSurface(this.requireSurface(), read.fileVertexCount, { downloadMilliseconds: read.downloaded - started, readMilliseconds: read.readAt - read.downloaded, prepareMilliseconds: t3 - t2 });
  }

  private async read(source: SurfaceSource): Promise<{ mesh: TriangleMesh; fileVertexCount: number; downloaded: number; readAt: number; groundwork?: PreparedGroundwork }> {
    const loaded = await loadSurfaceBytes(source, this.progress);
    const downloaded = now();
    if ('mesh' in loaded) return { mesh: loaded.mesh, fileVertexCount: loaded.mesh.positions.length / 3, downloaded, readAt: now() };
    this.progress({ stage: 'reading the surface file', fraction: null });
    const read = readSurfaceOrPrepared(loaded.bytes, loaded.fileName);
    // Only a prepared form fetched from the studio's server (written by its check) is vouched for;
    // bytes handed over by the page are checked like any file. Orderings are checked before use, whatever their source.
    const groundwork = read.groundwork && (source.kind === 'url' ? read.groundwork : { ...read.groundwork, checked: false });
    return { mesh: read.mesh, fileVertexCount: read.sourceVertexCount, downloaded, readAt: now(), groundwork };
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
    // The server's ordering is checked before use (a wrong one is worked out again), its check mark taken at its word.
    const given = this.groundwork;
    const surface = prepareGroomSurface(mesh, { boundary, ...(given ? { checked: given.checked, ringOrderings: given.ringOrderings } : {}) });
    const spent = now() - t0;
    if (faces > 1000) this.progress({ stage: 'surface prepared', fraction: 1, expectedMilliseconds: spent });
    this.mesh = mesh;
    this.surface = surface;
    this.placeMemo.clear();
    this.lastFull = null;
    this.lastField = null;
    this.drawing = new FieldDrawing(surface);
  }

  private requireSurface(): GroomSurface {
    if (!this.surface) throw new FieldError('no-surface', 'No surface is open yet.');
    return this.surface;
  }

  private requireDrawing(): FieldDrawing {
    if (!this.drawing) throw new FieldError('no-surface', 'No surface is open yet.');
    return this.drawing;
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
    let error: WorkerError | null = null;
    try {
      request = this.requestFor(spec);
    } catch (failure) {
      error = errorOf(failure);
    }
    let pinVertices: number[] = [];
    let pinError: WorkerError | null = null;
    try {
      pinVertices = spec.pins.map((pin, i) => vertexOfPlace(surface, pin, `pins[${i}]`));
    } catch (failure) {
      pinError = errorOf(failure);
    }

    // The budget comes with the connection of a solve; only a spec that is not solved (refused, or
    // its pins off the surface) has it worked out on its own.
    let budget: IndexBudget | null = null;
    let field: (DrawableField & { budget: IndexBudget }) | null = null;
    let solved: SolvedField | null = null;
    const t2 = now();
    if (request && !error && !pinError) {
      try {
        if (this.lastFull?.key === fieldKey) {
          solved = this.lastFull.solved;
        } else if (quick) {
          if (this.lastField?.key !== fieldKey) {
            const connection = solveConnection(surface.field, request);
            this.lastField = { key: fieldKey, field: buildDirectionField(surface.field, connection, request), requestedIndex: connection.requestedIndex, cutEdge: connection.cutEdge, budget: connection.budget };
          }
        } else {
          solved = solveGroomField(spec, surface);
          this.lastFull = { key: fieldKey, solved };
        }
        if (solved) {
          this.lastField = { key: fieldKey, field: solved.field, requestedIndex: solved.connection.requestedIndex, cutEdge: solved.connection.cutEdge, budget: solved.connection.budget };
        }
        field = this.lastField;
        budget = field!.budget;
      } catch (failure) {
        error = errorOf(failure);
      }
    }
    if (request && !budget) {
      try {
        budget = indexBudget(surface.field, request);
      } catch (failure) {
        // The same refusal the solve gives; with pins off the surface it is the one to show first.
        if (pinError) error = errorOf(failure);
      }
    }
    error ??= pinError;

    const singularities: SingularityCheck[] = (request?.singularities ?? []).map((s) => ({
      vertex: s.vertex,
      requested: field ? field.requestedIndex[s.vertex] : s.index,
      measured: solved ? solved.measuredIndex[s.vertex] : null,
    }));
    const t3 = now();
    const drawing = field ? this.requireDrawing().draw(field, display) : null;
    const t4 = now();
    return {
      quick,
      lines: drawing?.lines ?? null,
      lineShade: drawing?.shade ?? null,
      error,
      budget,
      singularities,
      pinVertices,
      curves: (request?.curves ?? []).map((curve) => ({ kind: curve.kind, points: this.requireDrawing().chainPoints(curve.vertices) })),
      proof: solved ? proofOf(solved) : null,
      milliseconds: now() - t0,
      stages: { request: t2 - t0, solve: t3 - t2, drawing: t4 - t3 },
    };
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

  /**
   * Grows the spec's guides with `growGuides`, exactly as an export would: from roots sampled on
   * `rootsFrom` when given (read once, then kept while its key stays the same).
   */
  async grow(spec: GroomSpec, rootsFrom?: RootsSource): Promise<GrownGuides> {
    const rootsMesh = rootsFrom ? await this.rootsMesh(rootsFrom) : undefined;
    const t0 = now();
    const surface = this.requireSurface();
    const solved = this.fullySolved(spec);
    const expected = expectedGuideCount(spec, surface);
    this.progress({ stage: `growing about ${expected.toLocaleString('en-GB')} guides`, fraction: null, expectedMilliseconds: expected * this.msPerGuide });
    const grown = growGuides(surface, solved, spec, rootsMesh ? { rootsFrom: rootsMesh } : {});
    const spent = now() - t0;
    if (grown.guides.count > 200) this.msPerGuide = spent / grown.guides.count;
    return {
      count: grown.guides.count,
      pointsPerGuide: grown.guides.pointsPerGuide,
      points: Float32Array.from(grown.guides.points),
      areaSquareCm: grown.areaSquareCm,
      milliseconds: spent,
      ...(grown.guides.sets ? { sets: grown.guides.sets.map(({ name, first, count }) => ({ name, first, count })) } : {}),
    };
  }

  private async rootsMesh({ key, source }: RootsSource): Promise<TriangleMesh> {
    if (this.roots?.key !== key) {
      const loaded = await loadSurfaceBytes(source, this.progress);
      this.progress({ stage: 'reading the sculpt the guides are rooted on', fraction: null });
      this.roots = { key, mesh: 'mesh' in loaded ? loaded.mesh : readSurface(loaded.bytes, loaded.fileName).mesh };
    }
    return this.roots.mesh;
  }

  /** The open surface's mirror plane (`detectMirrorPlane`), with the mean edge as the seam. */
  findMirror(): FoundMirror {
    const surface = this.requireSurface();
    this.progress({ stage: 'looking for a mirror plane', fraction: null, expectedMilliseconds: surface.field.topology.vertexCount * 0.05 });
    const found = detectMirrorPlane(surface);
    const [x, y, z] = found.plane.normal;
    return { normal: [x, y, z], offset: found.plane.offset, mismatch: found.mismatch, symmetric: found.symmetric, seam: surface.meanEdge };
  }

  /** Per welded vertex of the open surface, the face a twist without `twistFrom` is fixed in (see TwistFaces). */
  twistFaces(): TwistFaces {
    const surface = this.requireSurface();
    const firstFace = new Int32Array(surface.field.topology.vertexCount);
    for (let v = 0; v < firstFace.length; v++) firstFace[v] = twistFaceOf(surface, v);
    return { firstFace };
  }

  /**
   * Reads the grain: the suggested layout of the spec's order (lib/field's suggestLayout) on the
   * surface as the spec holds its boundary, its singularities as grain marks. Nothing placed is
   * read: the suggestion is where the singularities would go if none had been placed.
   */
  readGrain(spec: GroomSpec, follow: GrainFollow): GrainReading {
    const t0 = now();
    const surface = this.ensureBoundary(spec);
    this.progress({ stage: 'reading the grain (one factorization and a few solves)', fraction: null, expectedMilliseconds: surface.field.topology.faceCount * 0.03 });
    const align = follow.toward === 'fall' ? { direction: spec.field.referenceDirection ?? downOf(spec.upAxis), weight: follow.weight } : follow.toward === 'bending' ? { curvature: true, weight: follow.weight } : undefined;
    const layout = suggestLayout(surface.field, { order: spec.field.order, align });
    const p = surface.mesh.positions;
    const n = surface.vertexNormal;
    const marks = layout.singularities.map((s) => ({
      vertex: s.vertex,
      index: s.index,
      point: [p[3 * s.vertex], p[3 * s.vertex + 1], p[3 * s.vertex + 2]] as Vec3,
      normal: [n[3 * s.vertex], n[3 * s.vertex + 1], n[3 * s.vertex + 2]] as Vec3,
    }));
    return { order: layout.order, marks, iterations: layout.iterations, milliseconds: now() - t0 };
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
    return this.requireDrawing().chainPoints(chain);
  }
}
