/**
 * What every reader produces and how it becomes a mesh: polygons as written in the file, then
 * split into triangles, welded, and checked against the face budget, in one place for all formats.
 */
import { FieldError, describeFirst } from '../errors';
import type { FaceGroups, TriangleMesh } from '../mesh';
import { GrowableUint32 } from './growable';
import { triangulatePolygon } from './polygon';
import { defaultWeldTolerance, weldVertices } from './weld';

/** What a format reader hands over: the file's vertices and faces, indices 0-based. */
export interface PolygonSoup {
  readonly positions: Float64Array;
  /** Face i has corners `corners[polygonStart[i]] … corners[polygonStart[i + 1] − 1]`. */
  readonly polygonStart: Uint32Array;
  readonly corners: Uint32Array;
  /** Group of each face of the file (before triangulation). */
  readonly groups?: FaceGroups;
  /**
   * How the file numbers its vertices, for messages: 1 for OBJ, 0 otherwise. Faces are numbered
   * from 0 in file order everywhere.
   */
  readonly firstVertexNumber: number;
  readonly notes: string[];
}

export interface AssembleOptions {
  readonly weldTolerance?: number;
  readonly maxFaces: number;
}

export interface AssembledSurface {
  readonly mesh: TriangleMesh;
  readonly sourceVertexCount: number;
  readonly sourceFaceCount: number;
  readonly weldedVertexCount: number;
  readonly weldTolerance: number;
  readonly splitFaceCount: number;
  readonly collapsedTriangles: { readonly count: number; readonly examples: readonly number[] };
  readonly notes: string[];
}

/** How many examples of a problem are kept for reports. */
export const EXAMPLE_LIMIT = 10;

/** Throws the reader's `too-many-faces` error when a surface will have more triangles than allowed. */
export function assertFaceBudget(triangles: number, maxFaces: number): void {
  if (triangles > maxFaces) {
    throw new FieldError(
      'too-many-faces',
      `The surface has ${triangles.toLocaleString('en-US')} triangles; the limit is ${maxFaces.toLocaleString('en-US')}. Decimate the surface before uploading it.`,
    );
  }
}

/**
 * Most vertices a file may declare or hold for at most `maxFaces` triangles: three per triangle,
 * the count of a soup whose triangles share no vertex (welding then merges them). More are
 * isolated points no face uses, and only memory to allocate.
 */
export function vertexBudget(maxFaces: number): number {
  return 3 * maxFaces;
}

/** Throws the reader's `too-many-vertices` error when a file holds more vertices than its face budget can use. */
export function assertVertexBudget(vertices: number, maxFaces: number): void {
  const limit = vertexBudget(maxFaces);
  if (vertices > limit) {
    throw new FieldError(
      'too-many-vertices',
      `The surface has more than ${limit.toLocaleString('en-US')} vertices, three for each of the at most ${maxFaces.toLocaleString('en-US')} triangles allowed. Decimate the surface (or remove unused vertices) before uploading it.`,
    );
  }
}

/** Polygon starts for a soup of `count` triangles: 0, 3, 6, … */
export function triangleStarts(count: number): Uint32Array {
  const starts = new Uint32Array(count + 1);
  for (let i = 0; i <= count; i++) starts[i] = 3 * i;
  return starts;
}

/**
 * Turns a reader's polygons into a welded triangle mesh.
 *
 * Guarantees: every corner refers to an existing file vertex (else FieldError
 * `vertex-out-of-range`); faces with fewer than three corners are left out and noted; polygons
 * become `n − 2` triangles each (see `triangulatePolygon`); at most `maxFaces` triangles (else
 * FieldError `too-many-faces`); vertices are welded (see `weldVertices`) and triangles whose three
 * welded vertices are not all different are left out and counted, with the file faces they came
 * from as examples. Face groups follow their triangles.
 */
export function assembleSurface(soup: PolygonSoup, options: AssembleOptions): AssembledSurface {
  const { positions, polygonStart, corners } = soup;
  const nFileVertices = positions.length / 3;
  const nPolygons = polygonStart.length - 1;
  const notes = [...soup.notes];

  const badFaces: number[] = [];
  let firstBad = '';
  let tooShort = 0;
  let triangleCount = 0;
  for (let f = 0; f < nPolygons; f++) {
    const n = polygonStart[f + 1] - polygonStart[f];
    if (n < 3) tooShort++;
    else triangleCount += n - 2;
    for (let i = polygonStart[f]; i < polygonStart[f + 1]; i++) {
      if (corners[i] >= nFileVertices) {
        if (badFaces.length === 0) firstBad = `face ${f} refers to vertex ${corners[i] + soup.firstVertexNumber}`;
        badFaces.push(f);
        break;
      }
    }
  }
  if (badFaces.length > 0) {
    throw new FieldError(
      'vertex-out-of-range',
      `${badFaces.length} faces refer to vertices the file does not have (it has ${nFileVertices}): ${firstBad}; faces ${describeFirst(badFaces)}.`,
    );
  }
  if (tooShort > 0) notes.push(`${tooShort} faces with fewer than three corners were ignored.`);
  assertFaceBudget(triangleCount, options.maxFaces);

  const fileTriangles = new Uint32Array(3 * triangleCount);
  const sourceFace = new Uint32Array(triangleCount);
  let t = 0;
  let splitFaceCount = 0;
  for (let f = 0; f < nPolygons; f++) {
    const n = polygonStart[f + 1] - polygonStart[f];
    if (n < 3) continue;
    if (n === 3) {
      fileTriangles.set(corners.subarray(polygonStart[f], polygonStart[f] + 3), 3 * t);
      sourceFace[t++] = f;
      continue;
    }
    splitFaceCount++;
    triangulatePolygon(positions, corners, polygonStart[f], n, (a, b, c) => {
      fileTriangles[3 * t] = a;
      fileTriangles[3 * t + 1] = b;
      fileTriangles[3 * t + 2] = c;
      sourceFace[t++] = f;
    });
  }

  const weldTolerance = options.weldTolerance ?? defaultWeldTolerance(positions);
  const weld = weldVertices(positions, weldTolerance);
  const kept = new GrowableUint32(fileTriangles.length);
  const keptSource = new GrowableUint32(triangleCount);
  const collapsedExamples: number[] = [];
  let collapsed = 0;
  for (let i = 0; i < triangleCount; i++) {
    const a = weld.map[fileTriangles[3 * i]];
    const b = weld.map[fileTriangles[3 * i + 1]];
    const c = weld.map[fileTriangles[3 * i + 2]];
    if (a === b || b === c || c === a) {
      collapsed++;
      const f = sourceFace[i];
      if (collapsedExamples.length < EXAMPLE_LIMIT && collapsedExamples[collapsedExamples.length - 1] !== f) collapsedExamples.push(f);
      continue;
    }
    kept.push(a);
    kept.push(b);
    kept.push(c);
    keptSource.push(sourceFace[i]);
  }
  if (collapsed > 0) {
    notes.push(
      `${collapsed} triangles were left out because two of their corners are the same point after welding (for example from faces ${collapsedExamples.slice(0, 5).join(', ')}).`,
    );
  }

  let groups: FaceGroups | undefined;
  if (soup.groups) {
    const groupOfFace = new Uint16Array(keptSource.length);
    for (let i = 0; i < keptSource.length; i++) groupOfFace[i] = soup.groups.groupOfFace[keptSource.get(i)];
    groups = { names: soup.groups.names, groupOfFace };
  }
  const mesh: TriangleMesh = {
    positions: weld.positions,
    triangles: kept.toArray(),
    fileVertexToVertex: weld.map,
    ...(groups ? { groups } : {}),
  };
  return {
    mesh,
    sourceVertexCount: nFileVertices,
    sourceFaceCount: nPolygons,
    weldedVertexCount: weld.positions.length / 3,
    weldTolerance,
    splitFaceCount,
    collapsedTriangles: { count: collapsed, examples: collapsedExamples },
    notes,
  };
}
