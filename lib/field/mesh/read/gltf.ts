/*
 * glTF 2.0 is read here directly rather than through @gltf-transform/core: that library's
 * readers are asynchronous only (they return Promises), while `readSurface` is synchronous, and
 * the only parts needed — accessors, the node hierarchy and triangle primitives — are a small,
 * fully specified piece of the format. The tests check this reader against files written by
 * @gltf-transform/core.
 */
import { FieldError } from '../errors';
import { assertFaceBudget, triangleStarts, vertexBudget, type PolygonSoup } from './soup';
import { clip } from './text';

const GLB_MAGIC = 0x46546c67; // "glTF"
const CHUNK_JSON = 0x4e4f534a;
const CHUNK_BIN = 0x004e4942;

const COMPONENTS: Record<string, number> = { SCALAR: 1, VEC2: 2, VEC3: 3, VEC4: 4, MAT2: 4, MAT3: 9, MAT4: 16 };

interface ComponentType {
  readonly size: number;
  readonly read: (view: DataView, offset: number) => number;
  /** Maps a stored integer to [−1, 1] or [0, 1] for `normalized` accessors. */
  readonly normalize: (x: number) => number;
}

const COMPONENT_TYPES: Record<number, ComponentType> = {
  5120: { size: 1, read: (d, o) => d.getInt8(o), normalize: (x) => Math.max(x / 127, -1) },
  5121: { size: 1, read: (d, o) => d.getUint8(o), normalize: (x) => x / 255 },
  5122: { size: 2, read: (d, o) => d.getInt16(o, true), normalize: (x) => Math.max(x / 32767, -1) },
  5123: { size: 2, read: (d, o) => d.getUint16(o, true), normalize: (x) => x / 65535 },
  5125: { size: 4, read: (d, o) => d.getUint32(o, true), normalize: (x) => x / 4294967295 },
  5126: { size: 4, read: (d, o) => d.getFloat32(o, true), normalize: (x) => x },
};

const MODE_TRIANGLES = 4;
const MODE_TRIANGLE_STRIP = 5;
const MODE_TRIANGLE_FAN = 6;

// The JSON is untrusted: every field is read through these checks.
type Json = Record<string, unknown>;

function bad(message: string): FieldError {
  return new FieldError('malformed-file', `This glTF file is malformed: ${message}.`);
}

function isObject(x: unknown): x is Json {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

function list(x: unknown, what: string): unknown[] {
  if (x === undefined) return [];
  if (!Array.isArray(x)) throw bad(`${what} is not a list`);
  return x;
}

function entry(x: unknown, index: unknown, what: string): Json {
  const items = list(x, `the ${what} list`);
  if (typeof index !== 'number' || !Number.isInteger(index) || index < 0 || index >= items.length || !isObject(items[index])) {
    throw bad(`it refers to ${what} ${clip(String(index))}, which does not exist`);
  }
  return items[index] as Json;
}

function count(x: unknown, what: string, fallback?: number): number {
  if (x === undefined && fallback !== undefined) return fallback;
  if (typeof x !== 'number' || !Number.isSafeInteger(x) || x < 0) throw bad(`${what} is ${clip(String(x))}, not a whole number`);
  return x;
}

function numbers(x: unknown, length: number, what: string): number[] | undefined {
  if (x === undefined) return undefined;
  if (!Array.isArray(x) || x.length !== length || !x.every((v) => typeof v === 'number' && Number.isFinite(v))) {
    throw bad(`${what} is not a list of ${length} numbers`);
  }
  return x as number[];
}

/** Column-major 4×4 matrices, as glTF stores them. */
type Matrix = Float64Array;

function multiply(a: Matrix, b: Matrix): Matrix {
  const m = new Float64Array(16);
  for (let c = 0; c < 4; c++) {
    for (let r = 0; r < 4; r++) {
      let s = 0;
      for (let k = 0; k < 4; k++) s += a[4 * k + r] * b[4 * c + k];
      m[4 * c + r] = s;
    }
  }
  return m;
}

function identity(): Matrix {
  return Float64Array.of(1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1);
}

function localMatrix(node: Json, nodeIndex: number): Matrix {
  const what = `node ${nodeIndex}`;
  const matrix = numbers(node.matrix, 16, `the matrix of ${what}`);
  if (matrix) return Float64Array.from(matrix);
  const [tx, ty, tz] = numbers(node.translation, 3, `the translation of ${what}`) ?? [0, 0, 0];
  const [qx, qy, qz, qw] = numbers(node.rotation, 4, `the rotation of ${what}`) ?? [0, 0, 0, 1];
  const [sx, sy, sz] = numbers(node.scale, 3, `the scale of ${what}`) ?? [1, 1, 1];
  // Rotation from the unit quaternion, scaled per column: M = T · R · S.
  return Float64Array.of(
    (1 - 2 * (qy * qy + qz * qz)) * sx,
    2 * (qx * qy + qz * qw) * sx,
    2 * (qx * qz - qy * qw) * sx,
    0,
    2 * (qx * qy - qz * qw) * sy,
    (1 - 2 * (qx * qx + qz * qz)) * sy,
    2 * (qy * qz + qx * qw) * sy,
    0,
    2 * (qx * qz + qy * qw) * sz,
    2 * (qy * qz - qx * qw) * sz,
    (1 - 2 * (qx * qx + qy * qy)) * sz,
    0,
    tx,
    ty,
    tz,
    1,
  );
}

function determinant3(m: Matrix): number {
  return m[0] * (m[5] * m[10] - m[9] * m[6]) - m[4] * (m[1] * m[10] - m[9] * m[2]) + m[8] * (m[1] * m[6] - m[5] * m[2]);
}

interface GltfDocument {
  readonly json: Json;
  readonly buffers: Uint8Array[];
}

function parseJson(bytes: Uint8Array, where: string): Json {
  let json: unknown;
  try {
    json = JSON.parse(new TextDecoder('utf-8').decode(bytes));
  } catch {
    throw new FieldError('malformed-file', `The ${where} is not valid JSON; the file may be damaged or cut off.`);
  }
  if (!isObject(json)) throw bad('its JSON is not an object');
  const asset = json.asset;
  const version = isObject(asset) && typeof asset.version === 'string' ? asset.version : '';
  if (!version.startsWith('2.')) {
    throw new FieldError('unsupported-format', `This is a glTF ${clip(version) || 'file without a version'}; only glTF 2.0 is supported.`);
  }
  return json;
}

function parseGlb(bytes: Uint8Array): { json: Json; bin?: Uint8Array } {
  if (bytes.length < 12) throw new FieldError('truncated-file', `A GLB file starts with a 12-byte header; this one has only ${bytes.length} bytes.`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (view.getUint32(0, true) !== GLB_MAGIC) throw bad('it does not start with “glTF”');
  const version = view.getUint32(4, true);
  if (version !== 2) throw new FieldError('unsupported-format', `This is a GLB of version ${version}; only glTF 2.0 is supported.`);
  const length = view.getUint32(8, true);
  if (length > bytes.length) {
    throw new FieldError('truncated-file', `The GLB header promises ${length} bytes, but the file has only ${bytes.length}: it may have been cut off.`);
  }
  let json: Json | undefined;
  let bin: Uint8Array | undefined;
  let offset = 12;
  while (offset + 8 <= length) {
    const chunkLength = view.getUint32(offset, true);
    const chunkType = view.getUint32(offset + 4, true);
    const start = offset + 8;
    if (start + chunkLength > length) {
      throw new FieldError('truncated-file', `A GLB chunk at byte ${offset} runs past the end of the file: it may have been cut off.`);
    }
    const data = bytes.subarray(start, start + chunkLength);
    if (json === undefined) {
      if (chunkType !== CHUNK_JSON) throw bad('its first chunk is not JSON');
      json = parseJson(data, 'JSON chunk of this GLB');
    } else if (chunkType === CHUNK_BIN && bin === undefined) {
      bin = data;
    }
    offset = start + chunkLength;
  }
  if (!json) throw new FieldError('truncated-file', 'The GLB file ends before its JSON chunk: it may have been cut off.');
  return { json, bin };
}

function decodeDataUri(uri: string, bufferIndex: number): Uint8Array {
  const comma = uri.indexOf(',');
  if (comma === -1 || !uri.slice(0, comma).endsWith(';base64')) throw bad(`buffer ${bufferIndex} has a data URI that is not base64`);
  let binary: string;
  try {
    binary = atob(uri.slice(comma + 1));
  } catch {
    throw bad(`buffer ${bufferIndex} has base64 data that cannot be decoded`);
  }
  const out = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) out[i] = binary.charCodeAt(i);
  return out;
}

function loadDocument(bytes: Uint8Array, binary: boolean): GltfDocument {
  let json: Json;
  let bin: Uint8Array | undefined;
  if (binary) ({ json, bin } = parseGlb(bytes));
  else json = parseJson(bytes, '.gltf file');
  const buffers = list(json.buffers, 'the buffers list').map((b, i) => {
    if (!isObject(b)) throw bad(`buffer ${i} is not an object`);
    const byteLength = count(b.byteLength, `the byteLength of buffer ${i}`);
    let data: Uint8Array;
    if (b.uri === undefined) {
      if (!binary || i !== 0 || !bin) throw bad(`buffer ${i} has neither a URI nor the GLB's binary chunk`);
      data = bin;
    } else if (typeof b.uri === 'string' && b.uri.startsWith('data:')) {
      data = decodeDataUri(b.uri, i);
    } else {
      throw new FieldError(
        'external-resource',
        `This glTF keeps its data in a separate file (“${clip(String(b.uri), 80)}”), which was not uploaded with it. Export a single .glb file, or a .gltf with embedded data.`,
      );
    }
    if (data.length < byteLength) {
      throw new FieldError('truncated-file', `Buffer ${i} should hold ${byteLength} bytes but has only ${data.length}: the file may have been cut off.`);
    }
    return data;
  });
  return { json, buffers };
}

/** Count of an accessor's elements without reading them, for the face budget. */
function accessorCount(doc: GltfDocument, index: unknown): number {
  return count(entry(doc.json.accessors, index, 'accessor').count, `the count of accessor ${String(index)}`);
}

/**
 * An accessor's values as numbers, `count × components` of them, with normalization and sparse
 * substitution applied. `maxCount` bounds accessors that have no buffer view (all zeros plus
 * sparse values), the only ones whose size is not limited by the file's bytes.
 */
function readAccessor(doc: GltfDocument, index: number, expectedType: string, maxCount: number): Float64Array {
  const accessor = entry(doc.json.accessors, index, 'accessor');
  const what = `accessor ${index}`;
  if (accessor.type !== expectedType) throw bad(`${what} holds ${clip(String(accessor.type))} values where ${expectedType} values are needed`);
  const components = COMPONENTS[expectedType];
  const type = COMPONENT_TYPES[accessor.componentType as number];
  if (!type) throw bad(`${what} has the unknown component type ${clip(String(accessor.componentType))}`);
  const n = count(accessor.count, `the count of ${what}`);
  const normalized = accessor.normalized === true;
  // Checks that `elements` values lie inside their buffer view before anything is allocated
  // for them, and returns a reader for value c of element i.
  const locate = (bufferViewIndex: unknown, byteOffset: number, elements: number, componentType: ComponentType, perElement: number, packed: boolean) => {
    const bufferView = entry(doc.json.bufferViews, bufferViewIndex, 'buffer view');
    const bufferIndex = count(bufferView.buffer, `the buffer of buffer view ${String(bufferViewIndex)}`);
    const buffer = doc.buffers[bufferIndex];
    if (!buffer) throw bad(`buffer view ${String(bufferViewIndex)} refers to buffer ${bufferIndex}, which does not exist`);
    const viewOffset = count(bufferView.byteOffset, 'a buffer view offset', 0);
    const viewLength = count(bufferView.byteLength, 'a buffer view length');
    const elementSize = componentType.size * perElement;
    const stride = packed ? elementSize : count(bufferView.byteStride, 'a byte stride', 0) || elementSize;
    if (viewOffset + viewLength > buffer.length) throw bad(`buffer view ${String(bufferViewIndex)} runs past the end of its buffer`);
    if (elements > 0 && byteOffset + stride * (elements - 1) + elementSize > viewLength) throw bad(`${what} runs past the end of its buffer view`);
    const view = new DataView(buffer.buffer, buffer.byteOffset + viewOffset, viewLength);
    return (i: number, c: number) => componentType.read(view, byteOffset + stride * i + componentType.size * c);
  };
  const convert = (x: number) => (normalized ? type.normalize(x) : x);

  const dense = accessor.bufferView === undefined ? undefined : locate(accessor.bufferView, count(accessor.byteOffset, 'an accessor offset', 0), n, type, components, false);
  if (!dense && n > maxCount) throw bad(`${what} claims ${n} values without any data`);
  const values = new Float64Array(n * components);
  if (dense) {
    for (let i = 0; i < n; i++) for (let c = 0; c < components; c++) values[components * i + c] = convert(dense(i, c));
  }
  if (accessor.sparse !== undefined) {
    const sparse = accessor.sparse;
    if (!isObject(sparse) || !isObject(sparse.indices) || !isObject(sparse.values)) throw bad(`the sparse part of ${what} is incomplete`);
    const m = count(sparse.count, `the sparse count of ${what}`);
    if (m > n) throw bad(`${what} has more sparse values than values`);
    const indexTypeCode = sparse.indices.componentType;
    if (indexTypeCode !== 5121 && indexTypeCode !== 5123 && indexTypeCode !== 5125) throw bad(`the sparse indices of ${what} are not unsigned integers`);
    const targets = locate(sparse.indices.bufferView, count(sparse.indices.byteOffset, 'a sparse offset', 0), m, COMPONENT_TYPES[indexTypeCode], 1, true);
    const replacements = locate(sparse.values.bufferView, count(sparse.values.byteOffset, 'a sparse offset', 0), m, type, components, true);
    for (let i = 0; i < m; i++) {
      const target = targets(i, 0);
      if (target >= n) throw bad(`a sparse index of ${what} is ${target}, beyond its ${n} values`);
      for (let c = 0; c < components; c++) values[components * target + c] = convert(replacements(i, c));
    }
  }
  return values;
}

interface DrawnMesh {
  readonly mesh: number;
  readonly matrix: Matrix;
  /** Skinned meshes are placed by their joints, not their node; their bind pose is used as stored. */
  readonly skinned: boolean;
}

/** The meshes the default scene draws, depth-first through the node hierarchy, with their world matrices. */
function drawnMeshes(json: Json, notes: string[]): DrawnMesh[] {
  const nodes = list(json.nodes, 'the nodes list');
  const scenes = list(json.scenes, 'the scenes list');
  let roots: unknown[];
  if (scenes.length > 0) {
    roots = list(entry(json.scenes, json.scene ?? 0, 'scene').nodes, 'the nodes of the scene');
  } else if (nodes.length > 0) {
    const isChild = new Set<unknown>();
    nodes.forEach((node) => {
      if (isObject(node)) for (const c of list(node.children, 'the children of a node')) isChild.add(c);
    });
    roots = nodes.map((_n, i) => i).filter((i) => !isChild.has(i));
    notes.push('The glTF has no scene; every top-level node was used.');
  } else {
    notes.push('The glTF has no nodes; every mesh was used as stored.');
    return list(json.meshes, 'the meshes list').map((_m, mesh) => ({ mesh, matrix: identity(), skinned: false }));
  }

  const drawn: DrawnMesh[] = [];
  const seen = new Set<number>();
  const stack: { node: unknown; parent: Matrix }[] = roots.map((node) => ({ node, parent: identity() })).reverse();
  while (stack.length > 0) {
    const { node: index, parent } = stack.pop()!;
    const node = entry(json.nodes, index, 'node');
    const nodeIndex = index as number;
    // A node used twice would make the hierarchy a graph, possibly cyclic; glTF forbids it.
    if (seen.has(nodeIndex)) throw bad(`node ${nodeIndex} appears more than once in the node hierarchy`);
    seen.add(nodeIndex);
    const world = multiply(parent, localMatrix(node, nodeIndex));
    if (node.mesh !== undefined) {
      entry(json.meshes, node.mesh, 'mesh');
      drawn.push({ mesh: node.mesh as number, matrix: world, skinned: node.skin !== undefined });
    }
    const children = list(node.children, `the children of node ${nodeIndex}`);
    for (let i = children.length - 1; i >= 0; i--) stack.push({ node: children[i], parent: world });
  }
  return drawn;
}

function triangleCount(mode: number, n: number): number {
  return mode === MODE_TRIANGLES ? Math.floor(n / 3) : Math.max(0, n - 2);
}

/**
 * Reads glTF 2.0, as a `.gltf` JSON file with embedded (data: URI) buffers or as a `.glb`.
 *
 * Guarantees: the triangles of every primitive of mode TRIANGLES, TRIANGLE_STRIP or TRIANGLE_FAN
 * drawn by the default scene (or, without scenes, by every top-level node; without nodes, every
 * mesh), placed by the world matrix of its node (skinned meshes in their stored bind pose),
 * counter-clockwise as glTF defines it (winding reversed under mirroring transforms). Strips and
 * fans keep glTF's orientation rule. `TEXCOORD_0` gives each corner its UV (v turned to 1 − v).
 * Points and lines are skipped and noted. File vertices are the
 * vertices of each drawn primitive, concatenated in drawing order; a mesh drawn twice contributes
 * twice. Throws a FieldError for anything malformed or truncated, `external-resource` for data in
 * other files, `too-many-faces` before reading any vertex data. Memory is bounded by the file size
 * and the face budget.
 */
export function readGltf(bytes: Uint8Array, binary: boolean, maxFaces: number): PolygonSoup {
  const doc = loadDocument(bytes, binary);
  const notes: string[] = [];
  const drawn = drawnMeshes(doc.json, notes);

  interface Piece {
    readonly primitive: Json;
    readonly where: string;
    readonly mode: number;
    readonly triangles: number;
    readonly drawn: DrawnMesh;
  }
  const pieces: Piece[] = [];
  let skipped = 0;
  let triangles = 0;
  for (const d of drawn) {
    const mesh = entry(doc.json.meshes, d.mesh, 'mesh');
    list(mesh.primitives, `the primitives of mesh ${d.mesh}`).forEach((primitive, p) => {
      const where = `mesh ${d.mesh}, primitive ${p}`;
      if (!isObject(primitive)) throw bad(`${where} is not an object`);
      const mode = count(primitive.mode, `the mode of ${where}`, MODE_TRIANGLES);
      const attributes = primitive.attributes;
      if (mode !== MODE_TRIANGLES && mode !== MODE_TRIANGLE_STRIP && mode !== MODE_TRIANGLE_FAN) {
        skipped++;
        return;
      }
      if (!isObject(attributes) || attributes.POSITION === undefined) throw bad(`${where} has no POSITION attribute`);
      const n = accessorCount(doc, primitive.indices ?? attributes.POSITION);
      triangles += triangleCount(mode, n);
      assertFaceBudget(triangles, maxFaces);
      pieces.push({ primitive, where, mode, triangles: triangleCount(mode, n), drawn: d });
    });
  }
  if (skipped > 0) notes.push(`${skipped} glTF primitives made of points or lines were ignored: only triangles make the surface.`);

  const vertexLimit = vertexBudget(maxFaces);
  let vertexTotal = 0;
  const positionBlocks: Float64Array[] = [];
  const corners = new Uint32Array(3 * triangles);
  // glTF puts the UV origin at the top left; 1 − v puts it at the bottom left, as OBJ and USD have.
  const cornerUvs = pieces.some((piece) => (piece.primitive.attributes as Json).TEXCOORD_0 !== undefined) ? new Float64Array(6 * triangles).fill(Number.NaN) : undefined;
  let t = 0;
  for (const piece of pieces) {
    const attributes = piece.primitive.attributes as Json;
    const local = readAccessor(doc, attributes.POSITION as number, 'VEC3', vertexLimit);
    const n = local.length / 3;
    const m = piece.drawn.skinned ? identity() : piece.drawn.matrix;
    const world = new Float64Array(local.length);
    for (let v = 0; v < n; v++) {
      const x = local[3 * v], y = local[3 * v + 1], z = local[3 * v + 2];
      world[3 * v] = m[0] * x + m[4] * y + m[8] * z + m[12];
      world[3 * v + 1] = m[1] * x + m[5] * y + m[9] * z + m[13];
      world[3 * v + 2] = m[2] * x + m[6] * y + m[10] * z + m[14];
    }
    positionBlocks.push(world);

    let indices: Float64Array | undefined;
    if (piece.primitive.indices !== undefined) {
      const index = piece.primitive.indices as number;
      const type = entry(doc.json.accessors, index, 'accessor').componentType;
      if (type !== 5121 && type !== 5123 && type !== 5125) throw bad(`the indices of ${piece.where} are not unsigned integers`);
      indices = readAccessor(doc, index, 'SCALAR', vertexLimit);
    }
    const corner = (i: number): number => {
      const v = indices ? indices[i] : i;
      if (v >= n) throw new FieldError('vertex-out-of-range', `In the glTF ${piece.where}, an index refers to vertex ${v}, but the primitive has ${n} vertices.`);
      return vertexTotal + v;
    };
    const mirrored = determinant3(m) < 0;
    const uvs = cornerUvs && attributes.TEXCOORD_0 !== undefined ? readAccessor(doc, attributes.TEXCOORD_0 as number, 'VEC2', vertexLimit) : undefined;
    if (uvs && uvs.length !== 2 * n) throw bad(`the TEXCOORD_0 of ${piece.where} has ${uvs.length / 2} values for ${n} vertices`);
    const t0 = t;
    for (let k = 0; k < piece.triangles; k++) {
      let a: number, b: number, c: number;
      if (piece.mode === MODE_TRIANGLES) [a, b, c] = [3 * k, 3 * k + 1, 3 * k + 2];
      else if (piece.mode === MODE_TRIANGLE_STRIP) [a, b, c] = k % 2 === 0 ? [k, k + 1, k + 2] : [k + 1, k, k + 2];
      else [a, b, c] = [k + 1, k + 2, 0];
      corners[3 * t] = corner(a);
      corners[3 * t + 1] = corner(mirrored ? c : b);
      corners[3 * t + 2] = corner(mirrored ? b : c);
      t++;
    }
    for (let i = 3 * t0; uvs && i < 3 * t; i++) {
      cornerUvs![2 * i] = uvs[2 * (corners[i] - vertexTotal)];
      cornerUvs![2 * i + 1] = 1 - uvs[2 * (corners[i] - vertexTotal) + 1];
    }
    vertexTotal += n;
    if (vertexTotal > vertexLimit) throw bad(`the scene draws more than ${vertexLimit} vertices for at most ${maxFaces} triangles`);
  }

  const positions = new Float64Array(3 * vertexTotal);
  let at = 0;
  for (const block of positionBlocks) {
    positions.set(block, at);
    at += block.length;
  }
  return { positions, polygonStart: triangleStarts(triangles), corners, firstVertexNumber: 0, notes, ...(cornerUvs ? { cornerUvs } : {}) };
}
