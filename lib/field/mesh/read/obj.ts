/**
 * Wavefront OBJ, the format most modelling tools export: positions, texture coordinates, polygons
 * and face groups, which become growth regions.
 */
import { FieldError } from '../errors';
import { GrowableFloat64, GrowableUint32 } from './growable';
import { assertFaceBudget, assertVertexBudget, type PolygonSoup } from './soup';
import { TextCursor, clip, parseInteger, parseNumber } from './text';

const IGNORED_GEOMETRY = new Set(['l', 'p', 'curv', 'curv2', 'surf']);
const MAX_GROUPS = 0xffff;
const NO_UV = 0xffffffff;

/**
 * Reads a Wavefront OBJ file: `v` positions, `vt` texture coordinates (u and v; a third value is
 * ignored) and `f` faces (`i`, `i/t`, `i//n`, `i/t/n`, negative indices counting back from the
 * latest vertex or texture coordinate), with `g` and `o` naming the group of the faces
 * that follow (the latest of the two wins). A corner's `t` becomes its UV. Lines, points, curves and every other statement are
 * ignored; lines, points and curves are noted.
 *
 * Guarantees: returns the polygons as written, or throws a FieldError (`malformed-file` naming the
 * line, `vertex-out-of-range`, `too-many-faces` or `too-many-vertices` as soon as a budget is
 * exceeded). Time and memory are linear in the file size, and bounded by the budgets.
 */
export function readObj(bytes: Uint8Array, maxFaces: number): PolygonSoup {
  const cursor = new TextCursor(bytes);
  const positions = new GrowableFloat64(3 * 1024);
  const polygonStart = new GrowableUint32(1024);
  polygonStart.push(0);
  const corners = new GrowableUint32(4096);
  const groupOfPolygon = new GrowableUint32(1024);
  const groupIndex = new Map<string, number>();
  const groupNames: string[] = [];
  let currentGroup = -1;
  let sawGroupStatement = false;
  let triangles = 0;
  let ignoredGeometry = 0;
  let vertexCount = 0;
  const textureCoordinates = new GrowableFloat64(2 * 1024);
  let uvCount = 0;
  // Per corner: the texture coordinate's 0-based number, or NO_UV.
  const cornerUv = new GrowableUint32(4096);
  let anyCornerUv = false;

  const useGroup = (name: string) => {
    let g = groupIndex.get(name);
    if (g === undefined) {
      g = groupNames.length;
      groupNames.push(name);
      groupIndex.set(name, g);
    }
    currentGroup = g;
  };

  const tokens: string[] = [];
  for (let line = cursor.nextLine(); line !== null; line = cursor.nextLine()) {
    const lineNumber = cursor.lineNumber;
    // A backslash at the end of a line continues the statement on the next line.
    while (line.endsWith('\\')) {
      const more = cursor.nextLine();
      line = line.slice(0, -1) + ' ' + (more ?? '');
      if (more === null) break;
    }
    const hash = line.indexOf('#');
    const text = hash === -1 ? line : line.slice(0, hash);
    const tokenCount = splitWords(text, tokens);
    if (tokenCount === 0) continue;
    const where = () => `line ${lineNumber}`;
    switch (tokens[0]) {
      case 'v':
        // Checked before the position is stored, so a file of nothing but `v` lines stops at the budget.
        assertVertexBudget(vertexCount + 1, maxFaces);
        positions.push(parseNumber(tokenCount > 1 ? tokens[1] : null, where));
        positions.push(parseNumber(tokenCount > 2 ? tokens[2] : null, where));
        positions.push(parseNumber(tokenCount > 3 ? tokens[3] : null, where));
        vertexCount++;
        break;
      case 'vt':
        assertVertexBudget(uvCount + 1, maxFaces);
        textureCoordinates.push(parseNumber(tokenCount > 1 ? tokens[1] : null, where));
        // A missing v is 0 by the format's definition.
        textureCoordinates.push(tokenCount > 2 ? parseNumber(tokens[2], where) : 0);
        uvCount++;
        break;
      case 'f':
      case 'fo': {
        for (let i = 1; i < tokenCount; i++) {
          let index = leadingInteger(tokens[i]);
          if (Number.isNaN(index)) {
            const slash = tokens[i].indexOf('/');
            index = parseInteger(slash === -1 ? tokens[i] : tokens[i].slice(0, slash), where);
          }
          const resolved = index > 0 ? index - 1 : vertexCount + index;
          if (index === 0 || resolved < 0) {
            throw new FieldError(
              'vertex-out-of-range',
              `Line ${lineNumber} refers to vertex ${index}, ${index === 0 ? 'but OBJ numbers vertices from 1' : `but only ${vertexCount} vertices come before it`}.`,
            );
          }
          corners.push(Math.min(resolved, 0xffffffff));
          const uv = textureIndex(tokens[i], where);
          if (uv === null) {
            cornerUv.push(NO_UV);
          } else {
            const uvResolved = uv > 0 ? uv - 1 : uvCount + uv;
            if (uv === 0 || uvResolved < 0 || uvResolved >= uvCount) {
              throw new FieldError(
                'vertex-out-of-range',
                `Line ${lineNumber} refers to texture coordinate ${uv}, but ${uv === 0 ? 'OBJ numbers them from 1' : `only ${uvCount} come before it`}.`,
              );
            }
            cornerUv.push(uvResolved);
            anyCornerUv = true;
          }
        }
        polygonStart.push(corners.length);
        if (tokenCount > 3) triangles += tokenCount - 3;
        assertFaceBudget(triangles, maxFaces);
        groupOfPolygon.push(currentGroup === -1 ? 0 : currentGroup);
        break;
      }
      case 'g':
      case 'o': {
        const name = text.trim().slice(1).trim() || 'default';
        // Faces before the first group statement were recorded as group 0; name it first.
        if (!sawGroupStatement && polygonStart.length > 1) useGroup('default');
        sawGroupStatement = true;
        useGroup(clip(name, 200));
        break;
      }
      default:
        if (IGNORED_GEOMETRY.has(tokens[0])) ignoredGeometry++;
    }
  }

  const notes: string[] = [];
  if (ignoredGeometry > 0) notes.push(`${ignoredGeometry} lines, points or curves in the file were ignored: only faces make the surface.`);
  let groups: PolygonSoup['groups'];
  if (sawGroupStatement && groupNames.length > MAX_GROUPS) {
    notes.push(`The file has ${groupNames.length} groups, more than the ${MAX_GROUPS} Whorlwind keeps; the groups were ignored.`);
  } else if (sawGroupStatement) {
    groups = { names: groupNames, groupOfFace: Uint16Array.from(groupOfPolygon.toArray()) };
  }
  let cornerUvs: Float64Array | undefined;
  if (anyCornerUv) {
    const uvs = textureCoordinates.toArray();
    cornerUvs = new Float64Array(2 * cornerUv.length).fill(Number.NaN);
    for (let i = 0; i < cornerUv.length; i++) {
      const t = cornerUv.get(i);
      if (t === NO_UV) continue;
      cornerUvs[2 * i] = uvs[2 * t];
      cornerUvs[2 * i + 1] = uvs[2 * t + 1];
    }
  }
  return {
    positions: positions.toArray(),
    polygonStart: polygonStart.toArray(),
    corners: corners.toArray(),
    ...(groups ? { groups } : {}),
    ...(cornerUvs ? { cornerUvs } : {}),
    firstVertexNumber: 1,
    notes,
  };
}

/**
 * The texture coordinate number of a face corner (`5/7`, `5/7/2` → 7; `5`, `5//2` → null), or a
 * FieldError when it is there but not a whole number.
 */
function textureIndex(token: string, where: () => string): number | null {
  const slash = token.indexOf('/');
  if (slash === -1) return null;
  const end = token.indexOf('/', slash + 1);
  const text = token.slice(slash + 1, end === -1 ? token.length : end);
  return text === '' ? null : parseInteger(text, where);
}

/** Splits a line at spaces and tabs into `out`, reusing it across lines; returns the word count. */
function splitWords(line: string, out: string[]): number {
  let count = 0;
  let i = 0;
  while (i < line.length) {
    while (i < line.length && line.charCodeAt(i) <= 32) i++;
    if (i === line.length) break;
    const start = i;
    while (i < line.length && line.charCodeAt(i) > 32) i++;
    out[count++] = line.slice(start, i);
  }
  return count;
}

/**
 * The whole number before the first “/” of a face corner (`12`, `-3/7`, `5//2`), read without
 * building substrings because faces make up half of a large OBJ; NaN when the text is anything
 * else, for the caller to report.
 */
function leadingInteger(token: string): number {
  let i = 0;
  let sign = 1;
  if (token.charCodeAt(0) === 45 /* - */) {
    sign = -1;
    i = 1;
  }
  let value = 0;
  const digitsStart = i;
  for (; i < token.length; i++) {
    const c = token.charCodeAt(i);
    if (c === 47 /* / */) break;
    if (c < 48 || c > 57) return Number.NaN;
    value = 10 * value + (c - 48);
  }
  return i === digitsStart || value > Number.MAX_SAFE_INTEGER ? Number.NaN : sign * value;
}
