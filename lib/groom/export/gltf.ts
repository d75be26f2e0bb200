import type { Guides } from '../grow/guides';
import { guidesOfSet } from '../grow/guide-sets';
import { CENTIMETRES_PER_UNIT } from '../spec/spec';
import { firstCornerByPolygonOrder, type BindingExportOptions } from './binding-data';

/** The tuft number of a guide in no tuft (glTF accessors have no signed 32-bit type). */
export const NO_TUFT = 0xffffffff;

/**
 * The guides as glTF 2.0: one mesh with one `LINES` primitive (mode 1) whose index pairs join
 * consecutive points of each guide, a `POSITION` attribute and a `_WIDTH` attribute (per point,
 * metres). glTF fixes metres and +Y up, so points are scaled from the surface's units and, for a
 * Z-up surface, turned so that its up becomes +Y.
 *
 * The binding travels as accessors of one value per guide, named in the mesh's
 * `extras.whorlwind.binding` (guideId, rootFace, rootTriangle, rootCorners, rootBarycentric,
 * rootUv when the surface has UVs, length, then the shaping data tuft and innerTuft (`NO_TUFT`
 * for none), rootWidth and tipWidth in metres; with the surface also surfaceTriangle); with
 * `surface`, a second node "Surface" draws the growth surface as triangles, three vertices each
 * (with TEXCOORD_0 when it has UVs, v turned back to glTF's top-left origin), each triangle's
 * corners in rising polygon-corner order, so a root's weights apply to its surfaceTriangle's
 * vertices in order. Provenance goes in `asset.extras.whorlwind`. With guide sets, each set (with
 * guides) is its own node and mesh named by the set, with its own accessors and binding (and
 * `extras.whorlwind.guideSet`, the set's name); the surface's node and mesh come after them.
 *
 * Guarantees: `.glb` bytes (`binary: true`) or `.gltf` JSON bytes with the buffer embedded as a
 * base64 data URI; POSITION has count × pointsPerGuide entries with exact float32 min/max; the
 * index buffer has 2 · (pointsPerGuide − 1) entries per guide, and no index pair joins two guides.
 */
export function guidesToGltf(guides: Guides, options: { binary: boolean } & BindingExportOptions): Uint8Array {
  const n = guides.pointsPerGuide;
  const total = guides.count * n;
  const metres = CENTIMETRES_PER_UNIT[guides.units] / 100;
  const zUp = guides.upAxis === 'z';
  const toGltf = (x: number, y: number, z: number, out: Float32Array, at: number) => {
    out[at] = x * metres;
    out[at + 1] = (zUp ? z : y) * metres;
    out[at + 2] = (zUp ? -y : z) * metres;
  };
  // With guide sets, each set is its own mesh and node, named by the set; else one, "Guides".
  const parts = guides.sets ? guides.sets.map((set) => ({ name: set.name, guides: guidesOfSet(guides, set) })).filter((part) => part.guides.count > 0) : [{ name: 'Guides', guides }];
  const meshes = parts.map((part) => guideMesh(part.guides, toGltf, metres, options.surface !== undefined));
  const surfaceParts: Float32Array[] = [];
  if (options.surface) {
    const mesh = options.surface;
    const nF = mesh.triangles.length / 3;
    const first = firstCornerByPolygonOrder(mesh);
    const corner = new Float32Array(9 * nF);
    const uvs = mesh.cornerUvs ? new Float32Array(6 * nF) : undefined;
    for (let f = 0; f < nF; f++) {
      for (let k = 0; k < 3; k++) {
        const h = 3 * f + ((first[f] + k) % 3);
        const v = 3 * mesh.triangles[h];
        toGltf(mesh.positions[v], mesh.positions[v + 1], mesh.positions[v + 2], corner, 3 * (3 * f + k));
        if (uvs) {
          uvs[2 * (3 * f + k)] = mesh.cornerUvs![2 * h];
          uvs[2 * (3 * f + k) + 1] = 1 - mesh.cornerUvs![2 * h + 1];
        }
      }
    }
    surfaceParts.push(corner);
    if (uvs) surfaceParts.push(uvs);
  }
  const arrays: (Float32Array | Uint32Array)[] = [];
  const views: object[] = [];
  const accessors: object[] = [];
  let offset = 0;
  const view = (array: Float32Array | Uint32Array, target?: number): number => {
    arrays.push(array);
    views.push({ buffer: 0, byteOffset: offset, byteLength: array.byteLength, ...(target ? { target } : {}) });
    offset += array.byteLength;
    return views.length - 1;
  };
  const meshJson = meshes.map((m, i) => {
    const position = accessors.push({ bufferView: view(m.positions, 34962), componentType: 5126, count: m.positions.length / 3, type: 'VEC3', min: m.min, max: m.max }) - 1;
    const width = accessors.push({ bufferView: view(m.widths, 34962), componentType: 5126, count: m.widths.length, type: 'SCALAR' }) - 1;
    const index = accessors.push({ bufferView: view(m.indices, 34963), componentType: 5125, count: m.indices.length, type: 'SCALAR' }) - 1;
    // Only the drawn attributes and indices are GPU buffers; the per-guide arrays are data.
    const binding = Object.fromEntries(
      m.perGuide.map(([name, type, componentType, values]) => [name, accessors.push({ name: `whorlwind:${name}`, bufferView: view(values), componentType, count: m.count, type }) - 1]),
    );
    const part = parts[i];
    return {
      name: part.name,
      primitives: [{ attributes: { POSITION: position, _WIDTH: width }, indices: index, mode: 1 }],
      extras: { guideCount: m.count, pointsPerGuide: n, hairsPerGuide: part.guides.hairsPerGuide, whorlwind: { binding, ...(guides.sets ? { guideSet: part.name } : {}) } },
    };
  });
  if (options.surface) {
    const corner = surfaceParts[0];
    const smin = [Infinity, Infinity, Infinity], smax = [-Infinity, -Infinity, -Infinity];
    for (let i = 0; i < corner.length; i++) {
      smin[i % 3] = Math.min(smin[i % 3], corner[i]);
      smax[i % 3] = Math.max(smax[i % 3], corner[i]);
    }
    const attributes: Record<string, number> = { POSITION: accessors.push({ bufferView: view(corner, 34962), componentType: 5126, count: corner.length / 3, type: 'VEC3', min: smin, max: smax }) - 1 };
    if (surfaceParts[1]) attributes.TEXCOORD_0 = accessors.push({ bufferView: view(surfaceParts[1], 34962), componentType: 5126, count: surfaceParts[1].length / 2, type: 'VEC2' }) - 1;
    meshJson.push({ name: 'Surface', primitives: [{ attributes, mode: 4 }] } as (typeof meshJson)[number]);
  }
  const byteLength = offset;
  const binary = new Uint8Array(byteLength);
  arrays.reduce((at, array) => (binary.set(new Uint8Array(array.buffer, array.byteOffset, array.byteLength), at), at + array.byteLength), 0);
  const json: Record<string, unknown> = {
    asset: { version: '2.0', generator: 'Whorlwind', ...(options.provenance ? { extras: { whorlwind: options.provenance } } : {}) },
    scene: 0,
    scenes: [{ nodes: meshJson.map((_m, i) => i) }],
    nodes: meshJson.map((m, i) => ({ name: m.name, mesh: i })),
    meshes: meshJson,
    accessors,
    bufferViews: views,
    buffers: [{ byteLength }],
  };
  // glTF forbids zero-length buffers and accessors of count 0.
  if (total === 0 || meshes.every((m) => m.indices.length === 0)) {
    json.accessors = [];
    json.bufferViews = [];
    json.buffers = [];
    json.meshes = [];
    json.nodes = [{ name: 'Guides' }];
    return options.binary ? glb(JSON.stringify(json), new Uint8Array(0)) : new TextEncoder().encode(JSON.stringify(json));
  }
  if (options.binary) return glb(JSON.stringify(json), binary);
  // The buffer is spliced in as bytes: a JSON string of tens of megabytes would cost far more.
  const marker = 'WHORLWIND_BUFFER';
  (json.buffers as { uri?: string }[])[0].uri = marker;
  const [before, after] = JSON.stringify(json).split(marker);
  const head = new TextEncoder().encode(`${before}data:application/octet-stream;base64,`);
  const tail = new TextEncoder().encode(after);
  const encoded = base64(binary);
  const out = new Uint8Array(head.length + encoded.length + tail.length);
  out.set(head, 0);
  out.set(encoded, head.length);
  out.set(tail, head.length + encoded.length);
  return out;
}

/** One guide mesh's arrays: points in metres and glTF's axes, widths per point, line indices, and the per-guide data. */
function guideMesh(guides: Guides, toGltf: (x: number, y: number, z: number, out: Float32Array, at: number) => void, metres: number, withSurface: boolean) {
  const n = guides.pointsPerGuide;
  const total = guides.count * n;
  const positions = new Float32Array(3 * total);
  for (let i = 0; i < total; i++) toGltf(guides.points[3 * i], guides.points[3 * i + 1], guides.points[3 * i + 2], positions, 3 * i);
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i++) {
    const k = i % 3;
    if (positions[i] < min[k]) min[k] = positions[i];
    if (positions[i] > max[k]) max[k] = positions[i];
  }
  const widths = new Float32Array(total);
  for (let i = 0; i < total; i++) {
    const t = n > 1 ? (i % n) / (n - 1) : 0;
    const g = Math.floor(i / n), root = guides.guideRootWidth[g];
    widths[i] = (root + (guides.guideTipWidth[g] - root) * t) * metres;
  }
  const b = guides.binding;
  // Per-guide arrays, each an accessor named in extras (type, component type, values).
  const perGuide: [string, string, number, Uint32Array | Float32Array][] = [
    ['guideId', 'SCALAR', 5125, guides.guideId],
    ['rootFace', 'SCALAR', 5125, b.polygon],
    ['rootTriangle', 'SCALAR', 5125, b.triangle],
    ['rootCorners', 'VEC3', 5125, b.corners],
    ['rootBarycentric', 'VEC3', 5126, Float32Array.from(b.weights)],
    ...(b.uv ? [['rootUv', 'VEC2', 5126, Float32Array.from(b.uv, (x, i) => (i % 2 === 1 ? 1 - x : x))] as [string, string, number, Float32Array]] : []),
    ['length', 'SCALAR', 5126, Float32Array.from(guides.length, (x) => x * metres)],
    // glTF has no signed 32-bit accessors: a guide in no tuft is 2³² − 1 there.
    ['tuft', 'SCALAR', 5125, Uint32Array.from(guides.tuft, (x) => (x < 0 ? NO_TUFT : x))],
    ['innerTuft', 'SCALAR', 5125, Uint32Array.from(guides.innerTuft, (x) => (x < 0 ? NO_TUFT : x))],
    ['rootWidth', 'SCALAR', 5126, Float32Array.from(guides.guideRootWidth, (x) => x * metres)],
    ['tipWidth', 'SCALAR', 5126, Float32Array.from(guides.guideTipWidth, (x) => x * metres)],
    ...(withSurface ? [['surfaceTriangle', 'SCALAR', 5125, guides.rootFace] as [string, string, number, Uint32Array]] : []),
  ];
  return { count: guides.count, positions, min: total ? min : [0, 0, 0], max: total ? max : [0, 0, 0], widths, indices: guideLineIndices(guides.count, n), perGuide };
}

/** Index pairs of a `LINES` primitive joining consecutive points of each guide, never two guides. */
export function guideLineIndices(count: number, pointsPerGuide: number): Uint32Array {
  const n = pointsPerGuide;
  const indices = new Uint32Array(2 * (n - 1) * count);
  let k = 0;
  for (let g = 0; g < count; g++) {
    for (let j = 0; j + 1 < n; j++) {
      indices[k++] = g * n + j;
      indices[k++] = g * n + j + 1;
    }
  }
  return indices;
}

/** The GLB container: 12-byte header, a JSON chunk padded with spaces, a BIN chunk padded with zeros. */
export function glb(jsonText: string, binary: Uint8Array): Uint8Array {
  const jsonBytes = new TextEncoder().encode(jsonText);
  const jsonLength = Math.ceil(jsonBytes.length / 4) * 4;
  const binLength = Math.ceil(binary.length / 4) * 4;
  const total = 12 + 8 + jsonLength + (binary.length > 0 ? 8 + binLength : 0);
  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  view.setUint32(0, 0x46546c67, true);
  view.setUint32(4, 2, true);
  view.setUint32(8, total, true);
  view.setUint32(12, jsonLength, true);
  view.setUint32(16, 0x4e4f534a, true);
  out.set(jsonBytes, 20);
  out.fill(0x20, 20 + jsonBytes.length, 20 + jsonLength);
  if (binary.length > 0) {
    view.setUint32(20 + jsonLength, binLength, true);
    view.setUint32(24 + jsonLength, 0x004e4942, true);
    out.set(binary, 28 + jsonLength);
  }
  return out;
}

const BASE64 = new TextEncoder().encode('ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/');
const PAD = '='.charCodeAt(0);

/** Standard base64 with padding (RFC 4648 §4) as ASCII bytes, without Node's Buffer so it runs in a worker. */
function base64(bytes: Uint8Array): Uint8Array {
  const out = new Uint8Array(4 * Math.ceil(bytes.length / 3));
  let o = 0;
  for (let i = 0; i < bytes.length; i += 3) {
    const a = bytes[i], b = i + 1 < bytes.length ? bytes[i + 1] : 0, c = i + 2 < bytes.length ? bytes[i + 2] : 0;
    const triple = (a << 16) | (b << 8) | c;
    out[o++] = BASE64[(triple >> 18) & 63];
    out[o++] = BASE64[(triple >> 12) & 63];
    out[o++] = i + 1 < bytes.length ? BASE64[(triple >> 6) & 63] : PAD;
    out[o++] = i + 2 < bytes.length ? BASE64[triple & 63] : PAD;
  }
  return out;
}
