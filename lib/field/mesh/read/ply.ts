/**
 * Stanford PLY in ASCII and both binary byte orders: the vertex positions and face lists, whatever
 * other properties a scanner or modeller stores beside them.
 */
import { FieldError } from '../errors';
import { GrowableUint32 } from './growable';
import { assertFaceBudget, assertVertexBudget, type PolygonSoup } from './soup';
import { TextCursor, clip, parseNumber } from './text';

type Encoding = 'ascii' | 'binary_little_endian' | 'binary_big_endian';

interface ScalarType {
  readonly size: number;
  readonly read: (view: DataView, offset: number, littleEndian: boolean) => number;
}

const TYPES: Record<string, ScalarType> = {};
for (const [names, size, read] of [
  [['char', 'int8'], 1, (d, o) => d.getInt8(o)],
  [['uchar', 'uint8'], 1, (d, o) => d.getUint8(o)],
  [['short', 'int16'], 2, (d, o, le) => d.getInt16(o, le)],
  [['ushort', 'uint16'], 2, (d, o, le) => d.getUint16(o, le)],
  [['int', 'int32'], 4, (d, o, le) => d.getInt32(o, le)],
  [['uint', 'uint32'], 4, (d, o, le) => d.getUint32(o, le)],
  [['float', 'float32'], 4, (d, o, le) => d.getFloat32(o, le)],
  [['double', 'float64'], 8, (d, o, le) => d.getFloat64(o, le)],
] as [string[], number, ScalarType['read']][]) {
  for (const name of names) TYPES[name] = { size, read };
}

interface Property {
  readonly name: string;
  readonly type: ScalarType;
  /** Present for list properties: the type of the item count. */
  readonly countType?: ScalarType;
}

interface Element {
  readonly name: string;
  readonly count: number;
  readonly properties: Property[];
  readonly headerLine: number;
}

/** Names of the vertex texture coordinates, in the order they are looked for (the first pair present wins). */
const UV_NAMES: readonly (readonly [string, string])[] = [
  ['s', 't'],
  ['u', 'v'],
  ['texture_u', 'texture_v'],
  ['texture_s', 'texture_t'],
];

/** Bytes at the start of the file searched for `end_header`; real headers are a few hundred bytes. */
const HEADER_SEARCH_LIMIT = 1 << 16;

export interface PlyRead {
  readonly soup: PolygonSoup;
  readonly encoding: 'text' | 'binary-little-endian' | 'binary-big-endian';
}

/**
 * Reads a PLY file, ASCII or binary of either byte order: `x y z` of the `vertex` element (any
 * numeric types), its texture coordinate when it has one (`s t`, `u v`, `texture_u texture_v`
 * or `texture_s texture_t`, as a per-vertex UV every corner at the vertex shares) and the `vertex_indices` (or `vertex_index`) list of the `face` element (any
 * count and index types). Every other element and property is skipped by its declared size.
 *
 * Guarantees: returns the polygons as written, or throws a FieldError: `truncated-file` when the
 * data is shorter than the header promises, `wrong-format` when a binary header is followed by
 * text, `malformed-file` for a broken header or value, `too-many-faces`. The header's counts are
 * checked against the bytes present before anything is allocated, so a hostile header cannot
 * make the reader allocate more than the file's size justifies.
 */
export function readPly(bytes: Uint8Array, maxFaces: number): PlyRead {
  const { encoding, elements, bodyStart, bodyLine } = readHeader(bytes);
  const vertexElement = elements.find((e) => e.name === 'vertex');
  if (!vertexElement) throw new FieldError('malformed-file', 'The PLY header declares no “vertex” element, so the file has no vertex positions.');
  const xyz = ['x', 'y', 'z'].map((axis) => vertexElement.properties.findIndex((p) => p.name === axis && !p.countType));
  if (xyz.some((i) => i === -1)) {
    throw new FieldError('malformed-file', `The PLY “vertex” element (header line ${vertexElement.headerLine}) lacks an x, y or z property.`);
  }
  const uvPair = UV_NAMES.map(([u, v]) => [u, v].map((name) => vertexElement.properties.findIndex((p) => p.name === name && !p.countType))).find(
    ([u, v]) => u !== -1 && v !== -1,
  );
  const faceElement = elements.find((e) => e.name === 'face');
  const indexProperty = faceElement ? faceElement.properties.findIndex((p) => (p.name === 'vertex_indices' || p.name === 'vertex_index') && p.countType) : -1;
  if (faceElement && indexProperty === -1) {
    throw new FieldError('malformed-file', `The PLY “face” element (header line ${faceElement.headerLine}) has no vertex_indices list.`);
  }
  if (faceElement) assertFaceBudget(faceElement.count, maxFaces);
  if (encoding !== 'ascii' && looksLikeTextNumbers(bytes.subarray(bodyStart, bodyStart + 4096))) {
    throw new FieldError(
      'wrong-format',
      `The PLY header says the data is binary (${encoding}), but the data after the header is text: it looks like an ASCII PLY with a wrong “format” line.`,
    );
  }
  assertCountsFit(elements, bytes.length - bodyStart, encoding);
  // A file may really hold that many vertices; still no more than the faces can use.
  assertVertexBudget(vertexElement.count, maxFaces);

  const positions = new Float64Array(3 * vertexElement.count);
  const vertexUvs = uvPair ? new Float64Array(2 * vertexElement.count) : undefined;
  const polygonStart = new Uint32Array((faceElement?.count ?? 0) + 1);
  const corners = new GrowableUint32(3 * (faceElement?.count ?? 0));
  const notes: string[] = [];
  const skipped = elements.filter((e) => e.name !== 'vertex' && e.name !== 'face' && e.count > 0).map((e) => e.name);
  if (skipped.length > 0) notes.push(`PLY elements ignored: ${skipped.map((name) => clip(name)).join(', ')}.`);

  // Every element is read record by record, property by property; `take` receives each value
  // (each list item for lists) and says where it goes.
  const take = (element: Element, record: number, property: number, value: number) => {
    if (element === vertexElement) {
      const axis = xyz.indexOf(property);
      if (axis !== -1) positions[3 * record + axis] = value;
      else if (vertexUvs && property === uvPair![0]) vertexUvs[2 * record] = value;
      else if (vertexUvs && property === uvPair![1]) vertexUvs[2 * record + 1] = value;
    } else if (element === faceElement && property === indexProperty) {
      if (!Number.isInteger(value) || value < 0) {
        throw new FieldError('vertex-out-of-range', `PLY face ${record} refers to vertex ${value}, which cannot exist.`);
      }
      corners.push(Math.min(value, 0xffffffff));
    }
  };
  const closeFace = (element: Element, record: number) => {
    if (element === faceElement) polygonStart[record + 1] = corners.length;
  };

  if (encoding === 'ascii') readAsciiBody(bytes, bodyStart, bodyLine, elements, take, closeFace);
  else readBinaryBody(bytes, bodyStart, encoding === 'binary_little_endian', elements, take, closeFace);

  const cornerList = corners.toArray();
  let cornerUvs: Float64Array | undefined;
  if (vertexUvs) {
    // A PLY vertex has one UV, so every corner at it shares that UV; corners out of range are
    // refused later, by the assembly, with the file's numbers.
    cornerUvs = new Float64Array(2 * cornerList.length).fill(Number.NaN);
    for (let i = 0; i < cornerList.length; i++) {
      if (cornerList[i] >= vertexElement.count) continue;
      cornerUvs[2 * i] = vertexUvs[2 * cornerList[i]];
      cornerUvs[2 * i + 1] = vertexUvs[2 * cornerList[i] + 1];
    }
  }
  return {
    soup: { positions, polygonStart, corners: cornerList, firstVertexNumber: 0, notes, ...(cornerUvs ? { cornerUvs } : {}) },
    encoding: encoding === 'ascii' ? 'text' : encoding === 'binary_little_endian' ? 'binary-little-endian' : 'binary-big-endian',
  };
}

function readHeader(bytes: Uint8Array): { encoding: Encoding; elements: Element[]; bodyStart: number; bodyLine: number } {
  const searched = bytes.subarray(0, Math.min(bytes.length, HEADER_SEARCH_LIMIT));
  const text = new TextDecoder('latin1').decode(searched);
  const match = /(^|\n)end_header[ \t]*(\r?\n|$)/.exec(text);
  if (!match) {
    throw bytes.length <= HEADER_SEARCH_LIMIT
      ? new FieldError('truncated-file', 'The PLY file ends inside its header (there is no “end_header” line): it may have been cut off.')
      : new FieldError('malformed-file', 'The PLY header has no “end_header” line.');
  }
  const headerText = text.slice(0, match.index + match[0].length);
  const bodyStart = headerText.length; // latin1 decodes one byte to one character
  const lines = headerText.split(/\r?\n/);
  let encoding: Encoding | undefined;
  const elements: Element[] = [];
  lines.forEach((raw, i) => {
    const lineNumber = i + 1;
    const tokens = raw.trim().split(/\s+/);
    const bad = (why: string) => new FieldError('malformed-file', `PLY header line ${lineNumber} (“${clip(raw.trim())}”): ${why}.`);
    switch (tokens[0]) {
      case 'format':
        if (tokens[1] !== 'ascii' && tokens[1] !== 'binary_little_endian' && tokens[1] !== 'binary_big_endian') throw bad('unknown format');
        encoding = tokens[1];
        break;
      case 'element': {
        const count = Number(tokens[2]);
        if (tokens.length < 3 || !Number.isSafeInteger(count) || count < 0) throw bad('expected an element name and count');
        elements.push({ name: tokens[1], count, properties: [], headerLine: lineNumber });
        break;
      }
      case 'property': {
        const element = elements[elements.length - 1];
        if (!element) throw bad('a property before any element');
        if (tokens[1] === 'list') {
          const countType = TYPES[tokens[2]];
          const type = TYPES[tokens[3]];
          if (!countType || !type || tokens.length < 5) throw bad('expected “property list <count type> <item type> <name>”');
          element.properties.push({ name: tokens[4], type, countType });
        } else {
          const type = TYPES[tokens[1]];
          if (!type || tokens.length < 3) throw bad('expected “property <type> <name>”');
          element.properties.push({ name: tokens[2], type });
        }
        break;
      }
      default:
      // ply, comment, obj_info, end_header and blank lines carry nothing the reader needs.
    }
  });
  if (!encoding) throw new FieldError('malformed-file', 'The PLY header has no “format” line.');
  return { encoding, elements, bodyStart, bodyLine: lines.length };
}

type Take = (element: Element, record: number, property: number, value: number) => void;
type CloseRecord = (element: Element, record: number) => void;

function readAsciiBody(bytes: Uint8Array, start: number, firstLine: number, elements: Element[], take: Take, close: CloseRecord): void {
  const cursor = new TextCursor(bytes, start, firstLine);
  for (const element of elements) {
    // Records without properties take no space, however many the header claims.
    if (element.properties.length === 0) continue;
    let record = 0;
    const next = (where: () => string) => {
      const token = cursor.nextToken();
      if (token === null) throw truncated(element, `inside record ${record}`);
      return parseNumber(token, where);
    };
    for (let r = 0; r < element.count; r++) {
      record = r;
      element.properties.forEach((property, p) => {
        const where = () => `PLY ${clip(element.name)} ${r}, line ${cursor.lineNumber}`;
        if (property.countType) {
          const n = next(where);
          if (!Number.isInteger(n) || n < 0) throw new FieldError('malformed-file', `A list length of ${n} is impossible (${where()}).`);
          for (let i = 0; i < n; i++) take(element, r, p, next(where));
        } else {
          take(element, r, p, next(where));
        }
      });
      close(element, r);
    }
  }
}

function readBinaryBody(bytes: Uint8Array, start: number, littleEndian: boolean, elements: Element[], take: Take, close: CloseRecord): void {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let offset = start;
  for (const element of elements) {
    if (element.properties.length === 0) continue;
    for (let r = 0; r < element.count; r++) {
      for (let p = 0; p < element.properties.length; p++) {
        const property = element.properties[p];
        if (property.countType) {
          if (offset + property.countType.size > bytes.length) throw truncated(element, `inside record ${r}`);
          const n = property.countType.read(view, offset, littleEndian);
          offset += property.countType.size;
          if (!Number.isInteger(n) || n < 0) throw new FieldError('malformed-file', `PLY ${element.name} ${r} has a list of length ${n}, which is impossible.`);
          if (offset + n * property.type.size > bytes.length) throw truncated(element, `inside record ${r}`);
          for (let i = 0; i < n; i++) {
            take(element, r, p, property.type.read(view, offset, littleEndian));
            offset += property.type.size;
          }
        } else {
          if (offset + property.type.size > bytes.length) throw truncated(element, `inside record ${r}`);
          take(element, r, p, property.type.read(view, offset, littleEndian));
          offset += property.type.size;
        }
      }
      close(element, r);
    }
  }
}

/**
 * Checks the header's counts against the bytes after it, before anything is allocated: a binary
 * record takes at least its fixed-size properties and list counts, an ASCII value at least one
 * character and one separator.
 */
function assertCountsFit(elements: Element[], bodyBytes: number, encoding: Encoding): void {
  let needed = 0;
  for (const element of elements) {
    let perRecord = 0;
    for (const p of element.properties) perRecord += encoding === 'ascii' ? 2 : p.countType ? p.countType.size : p.type.size;
    needed += element.count * perRecord;
    if (needed > bodyBytes + 1) throw truncated(element, `too soon (only ${bodyBytes} bytes follow the header)`);
  }
}

function truncated(element: Element, detail: string): FieldError {
  return new FieldError(
    'truncated-file',
    `The PLY header promises ${element.count} “${clip(element.name)}” records, but the file ends ${detail}: it may have been cut off.`,
  );
}

/** True when every byte is one that decimal numbers and their separators are written with. */
function looksLikeTextNumbers(sample: Uint8Array): boolean {
  if (sample.length === 0) return false;
  for (const b of sample) {
    const numeric = (b >= 0x30 && b <= 0x39) || b === 0x2b || b === 0x2d || b === 0x2e || b === 0x45 || b === 0x65;
    const space = b === 0x20 || b === 0x09 || b === 0x0a || b === 0x0d;
    if (!numeric && !space) return false;
  }
  return true;
}
