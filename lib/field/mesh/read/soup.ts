/**
 * What every reader produces and how it becomes a mesh: polygons as written in the file, then
 * split into triangles, welded, and checked against the face budget, in one place for all formats.
 */
import { FieldError, describeFirst } from '../errors';
import type { FaceGroups, SourcePolygons, TriangleMesh } from '../mesh';
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
   * u, v per corner (2 per entry of `corners`), NaN where the file gave that corner none; absent
   * when the file has no texture coordinates at all. The origin is at the bottom left.
   */
  readonly cornerUvs?: Float64Array;
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
  /**
   * Whether the file's corners have texture coordinates: all of them (the mesh then has
   * `cornerUvs`), some of them (the UVs are left out, and a note says so), or none.
   */
  readonly uvs: UvPresence;
  readonly notes: string[];
}

export type UvPresence = 'complete' | 'incomplete' | 'none';

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
 * from as examples. Face groups follow their triangles. Every kept triangle records its file
 * polygon (`facePolygon`) and which polygon corner each of its corners is (`faceCorners`); the
 * file's polygons stay on the mesh (`polygons`); UVs are kept per corner when every corner has
 * one (`cornerUvs`, `polygons.uvs`), else left out with a note when only some have.
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

  // Each triangle corner as a corner of its polygon (0 … n − 1), so that results can be stated
  // in the file's own terms and UVs, which belong to polygon corners, follow the triangles.
  const polygonCorner = new Uint32Array(3 * triangleCount);
  const sourceFace = new Uint32Array(triangleCount);
  let t = 0;
  let splitFaceCount = 0;
  for (let f = 0; f < nPolygons; f++) {
    const n = polygonStart[f + 1] - polygonStart[f];
    if (n < 3) continue;
    if (n > 3) splitFaceCount++;
    triangulatePolygon(positions, corners, polygonStart[f], n, (a, b, c) => {
      polygonCorner[3 * t] = a;
      polygonCorner[3 * t + 1] = b;
      polygonCorner[3 * t + 2] = c;
      sourceFace[t++] = f;
    });
  }
  const uvs = uvPresence(soup.cornerUvs);
  if (uvs === 'incomplete') notes.push('Some corners of the file have texture coordinates (UVs) and some have none, so the UVs were left out.');

  const weldTolerance = options.weldTolerance ?? defaultWeldTolerance(positions);
  const weld = weldVertices(positions, weldTolerance);
  const kept = new GrowableUint32(3 * triangleCount);
  const keptTriangle = new GrowableUint32(triangleCount);
  const collapsedExamples: number[] = [];
  let collapsed = 0;
  for (let i = 0; i < triangleCount; i++) {
    const start = polygonStart[sourceFace[i]];
    const a = weld.map[corners[start + polygonCorner[3 * i]]];
    const b = weld.map[corners[start + polygonCorner[3 * i + 1]]];
    const c = weld.map[corners[start + polygonCorner[3 * i + 2]]];
    if (a === b || b === c || c === a) {
      collapsed++;
      const f = sourceFace[i];
      if (collapsedExamples.length < EXAMPLE_LIMIT && collapsedExamples[collapsedExamples.length - 1] !== f) collapsedExamples.push(f);
      continue;
    }
    kept.push(a);
    kept.push(b);
    kept.push(c);
    keptTriangle.push(i);
  }
  if (collapsed > 0) {
    notes.push(
      `${collapsed} triangles were left out because two of their corners are the same point after welding (for example from faces ${collapsedExamples.slice(0, 5).join(', ')}).`,
    );
  }

  const nKept = keptTriangle.length;
  const facePolygon = new Uint32Array(nKept);
  const faceCorners = new Uint32Array(3 * nKept);
  for (let i = 0; i < nKept; i++) {
    const from = keptTriangle.get(i);
    facePolygon[i] = sourceFace[from];
    faceCorners.set(polygonCorner.subarray(3 * from, 3 * from + 3), 3 * i);
  }
  let groups: FaceGroups | undefined;
  if (soup.groups) {
    const groupOfFace = new Uint16Array(nKept);
    for (let i = 0; i < nKept; i++) groupOfFace[i] = soup.groups.groupOfFace[facePolygon[i]];
    groups = { names: soup.groups.names, groupOfFace };
  }
  const polygons: SourcePolygons = { start: polygonStart, corners, ...(uvs === 'complete' ? { uvs: Float32Array.from(soup.cornerUvs!) } : {}) };
  const mesh: TriangleMesh = {
    positions: weld.positions,
    triangles: kept.toArray(),
    fileVertexToVertex: weld.map,
    ...(groups ? { groups } : {}),
    facePolygon,
    faceCorners,
    polygons,
    ...(polygons.uvs ? { cornerUvs: triangleCornerUvs(polygons.uvs, polygonStart, facePolygon, faceCorners) } : {}),
  };
  return {
    mesh,
    sourceVertexCount: nFileVertices,
    sourceFaceCount: nPolygons,
    weldedVertexCount: weld.positions.length / 3,
    weldTolerance,
    splitFaceCount,
    collapsedTriangles: { count: collapsed, examples: collapsedExamples },
    uvs,
    notes,
  };
}

function uvPresence(cornerUvs: Float64Array | undefined): UvPresence {
  if (!cornerUvs) return 'none';
  let present = 0;
  for (let i = 0; i < cornerUvs.length; i += 2) if (!Number.isNaN(cornerUvs[i]) && !Number.isNaN(cornerUvs[i + 1])) present++;
  return present === 0 ? 'none' : 2 * present === cornerUvs.length ? 'complete' : 'incomplete';
}

/** u, v of each triangle corner, taken from its polygon corner. */
function triangleCornerUvs(polygonUvs: Float32Array, polygonStart: Uint32Array, facePolygon: Uint32Array, faceCorners: Uint32Array): Float32Array {
  const out = new Float32Array(2 * faceCorners.length);
  for (let h = 0; h < faceCorners.length; h++) {
    const corner = polygonStart[facePolygon[(h / 3) | 0]] + faceCorners[h];
    out[2 * h] = polygonUvs[2 * corner];
    out[2 * h + 1] = polygonUvs[2 * corner + 1];
  }
  return out;
}
