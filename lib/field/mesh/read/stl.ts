/**
 * STL, ASCII and binary, the format of printers and sculpting tools: unshared triangles only, so
 * welding does all the joining.
 */
import { FieldError } from '../errors';
import { GrowableFloat64, GrowableUint32 } from './growable';
import { assertFaceBudget, triangleStarts, type PolygonSoup } from './soup';
import { TextCursor, clip, parseNumber } from './text';

const HEADER_BYTES = 80;
const RECORD_BYTES = 50;

/** True when the size is exactly that of a binary STL with the triangle count its header states. */
export function hasBinaryStlSize(bytes: Uint8Array): boolean {
  if (bytes.length < HEADER_BYTES + 4) return false;
  const count = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(HEADER_BYTES, true);
  return bytes.length === HEADER_BYTES + 4 + RECORD_BYTES * count;
}

/**
 * Reads a binary STL: an 80-byte header (whatever it says, even “solid”), a triangle count and
 * 50 bytes per triangle, of which the three corners are used (the stored normal is ignored; the
 * corner order defines the side, as in every STL writer).
 *
 * Guarantees: every triangle becomes a face with its own three file vertices (STL shares none;
 * welding joins them), or a FieldError: `truncated-file` when the file is shorter than its count
 * promises, `too-many-faces`. Bytes after the promised triangles are ignored and noted.
 */
export function readBinaryStl(bytes: Uint8Array, maxFaces: number): PolygonSoup {
  if (bytes.length < HEADER_BYTES + 4) {
    throw new FieldError('truncated-file', `A binary STL starts with 84 bytes of header and count; this file has only ${bytes.length} bytes.`);
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const count = view.getUint32(HEADER_BYTES, true);
  const expected = HEADER_BYTES + 4 + RECORD_BYTES * count;
  if (bytes.length < expected) {
    throw new FieldError(
      'truncated-file',
      `The STL header promises ${count} triangles (${expected} bytes), but the file has only ${bytes.length} bytes: it may have been cut off.`,
    );
  }
  assertFaceBudget(count, maxFaces);
  const positions = new Float64Array(9 * count);
  for (let t = 0; t < count; t++) {
    const record = HEADER_BYTES + 4 + RECORD_BYTES * t;
    for (let i = 0; i < 9; i++) positions[9 * t + i] = view.getFloat32(record + 12 + 4 * i, true);
  }
  const notes: string[] = [];
  if (bytes.length > expected) notes.push(`${bytes.length - expected} bytes after the last STL triangle were ignored.`);
  const corners = new Uint32Array(3 * count);
  for (let i = 0; i < corners.length; i++) corners[i] = i;
  return { positions, polygonStart: triangleStarts(count), corners, firstVertexNumber: 0, notes };
}

/**
 * Reads an ASCII STL: `solid … facet normal … outer loop, vertex x y z (×3), endloop, endfacet
 * … endsolid`, keywords in any case, several solids in a row allowed.
 *
 * Guarantees: each facet becomes one face (a facet with more than three vertices one polygon),
 * or a FieldError: `truncated-file` when the text stops before `endsolid`, `malformed-file`
 * naming the line of anything else out of place, `too-many-faces`.
 */
export function readAsciiStl(bytes: Uint8Array, maxFaces: number): PolygonSoup {
  const cursor = new TextCursor(bytes);
  const positions = new GrowableFloat64(9 * 1024);
  const polygonStart = new GrowableUint32(1024);
  polygonStart.push(0);
  let vertexCount = 0;
  let inSolid = false;
  let inFacet = false;
  let triangles = 0;
  let facetCorners = 0;
  const where = () => `line ${cursor.lineNumber}`;
  const unexpected = (token: string) => new FieldError('malformed-file', `“${clip(token)}” is out of place in an ASCII STL (${where()}).`);

  for (let token = cursor.nextToken(); token !== null; token = cursor.nextToken()) {
    const keyword = token.toLowerCase();
    if (!inSolid) {
      if (keyword !== 'solid') throw unexpected(token);
      inSolid = true;
      // The solid's name is the rest of its line, and may be empty.
      cursor.skipRestOfLine();
      continue;
    }
    switch (keyword) {
      case 'facet':
        if (inFacet) throw unexpected(token);
        inFacet = true;
        facetCorners = 0;
        break;
      case 'normal':
        for (let i = 0; i < 3; i++) parseNumber(cursor.nextToken(), where);
        break;
      case 'outer':
      case 'loop':
      case 'endloop':
        if (!inFacet) throw unexpected(token);
        break;
      case 'vertex':
        if (!inFacet) throw unexpected(token);
        for (let i = 0; i < 3; i++) positions.push(parseNumber(cursor.nextToken(), where));
        vertexCount++;
        facetCorners++;
        break;
      case 'endfacet':
        if (!inFacet || facetCorners < 3) throw new FieldError('malformed-file', `A facet ending at ${where()} has ${facetCorners} vertices; it needs three.`);
        inFacet = false;
        polygonStart.push(vertexCount);
        triangles += facetCorners - 2;
        assertFaceBudget(triangles, maxFaces);
        break;
      case 'endsolid':
        if (inFacet) throw unexpected(token);
        inSolid = false;
        cursor.skipRestOfLine();
        break;
      default:
        throw unexpected(token);
    }
  }
  if (inSolid) {
    throw new FieldError('truncated-file', `The ASCII STL ends at line ${cursor.lineNumber} without “endsolid”: it may have been cut off.`);
  }
  const corners = new Uint32Array(vertexCount);
  for (let i = 0; i < vertexCount; i++) corners[i] = i;
  return { positions: positions.toArray(), polygonStart: polygonStart.toArray(), corners, firstVertexNumber: 0, notes: [] };
}
