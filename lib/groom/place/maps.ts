import type { TriangleMesh } from '../../field';
import { GroomError } from '../errors';
import { MAP_ATTRIBUTES, type GroomSpec, type MapAttribute, type MapSpec, type MaskSpec } from '../spec/spec';
import type { PinnedFactors } from './pins';

/** Per-vertex factors of each painted (or pinned) attribute; an attribute with neither is absent (factor 1). */
export type AttributeFactors = Partial<Record<MapAttribute, Float64Array>>;

/**
 * The surface a map belongs to: vertex and face counts and a 32-bit FNV-1a hash of the triangles'
 * vertex numbers (the welded mesh's). Only the connectivity counts, not the positions, so a sculpt
 * pass (same triangles, moved vertices) keeps its maps, while a remesh or another file does not.
 */
export function surfaceSignature(mesh: TriangleMesh): { vertices: number; faces: number; signature: string } {
  const tri = mesh.triangles;
  let h = 0x811c9dc5;
  for (let i = 0; i < tri.length; i++) {
    let x = tri[i];
    for (let b = 0; b < 4; b++) {
      h = Math.imul(h ^ (x & 0xff), 0x01000193);
      x >>>= 8;
    }
  }
  return { vertices: mesh.positions.length / 3, faces: tri.length / 3, signature: (h >>> 0).toString(16).padStart(8, '0') };
}

/**
 * A map of `values` (one factor per vertex of `mesh`, each in [0, 10]) in the spec's compact form.
 *
 * Guarantees: the map decodes (`decodeMap`) to each value within (high − low) / (2 · (2^bits − 1))
 * of it, the smallest and largest value exactly, so a constant map (all ones) decodes exactly to
 * that constant. With `range` (a map's own low and high) values are coded between those instead,
 * clamped into them: values decoded from a map of that range are coded back to their very codes.
 * Throws a RangeError for a wrong length or a value outside [0, 10].
 */
export function encodeMap(attribute: MapAttribute, values: ArrayLike<number>, mesh: TriangleMesh, bits: 8 | 16 = 16, range?: { low: number; high: number }): MapSpec {
  const id = surfaceSignature(mesh);
  if (values.length !== id.vertices) throw new RangeError(`A map needs one value per surface vertex (${id.vertices}), not ${values.length}.`);
  let low = Infinity, high = -Infinity;
  for (let v = 0; v < values.length; v++) {
    const x = values[v];
    if (!(x >= 0 && x <= 10)) throw new RangeError(`A map's values are factors from 0 to 10; vertex ${v} has ${x}.`);
    low = Math.min(low, x); high = Math.max(high, x);
  }
  if (range) ({ low, high } = range);
  const top = 2 ** bits - 1;
  const bytes = new Uint8Array(values.length * (bits / 8));
  for (let v = 0; v < values.length; v++) {
    const code = high > low ? Math.round(((Math.min(high, Math.max(low, values[v])) - low) / (high - low)) * top) : 0;
    if (bits === 8) bytes[v] = code;
    else { bytes[2 * v] = code & 0xff; bytes[2 * v + 1] = code >>> 8; }
  }
  return { attribute, ...id, bits, low, high, data: toBase64(bytes) };
}

/**
 * The factor per vertex of one map on `mesh`.
 *
 * Guarantees: refuses (GroomError `map-surface-mismatch`, with the spec path) a map painted on a
 * surface of other vertices or triangles, saying both surfaces' counts; code 0 is exactly `low`
 * and the top code exactly `high`.
 */
export function decodeMap(map: MapSpec, mesh: TriangleMesh, path = 'maps'): Float64Array {
  return decodeCoded(map, mesh, path, `the ${map.attribute} map`);
}

/**
 * A mask in the spec's compact form: `values` (one share per vertex of `mesh`, each in [0, 1])
 * coded as `encodeMap` codes a map's factors. Guarantees as `encodeMap`'s; a mask of one value
 * everywhere decodes exactly to it.
 */
export function encodeMask(name: string, values: ArrayLike<number>, mesh: TriangleMesh, bits: 8 | 16 = 8): MaskSpec {
  for (let v = 0; v < values.length; v++) {
    if (!(values[v] >= 0 && values[v] <= 1)) throw new RangeError(`A mask's values are shares from 0 to 1; vertex ${v} has ${values[v]}.`);
  }
  const { attribute: _attribute, ...coded } = encodeMap('density', values, mesh, bits);
  return { name, ...coded };
}

/** The share per vertex of one mask on `mesh`; refused as `decodeMap` says for a mask painted on another surface. */
export function decodeMask(mask: MaskSpec, mesh: TriangleMesh, path = 'masks'): Float64Array {
  return decodeCoded(mask, mesh, path, `the mask ${JSON.stringify(mask.name)}`);
}

function decodeCoded(map: Omit<MapSpec, 'attribute'>, mesh: TriangleMesh, path: string, what: string): Float64Array {
  const id = surfaceSignature(mesh);
  if (map.vertices !== id.vertices || map.faces !== id.faces || map.signature !== id.signature) {
    throw new GroomError(
      'map-surface-mismatch',
      `${path}: ${what} was painted on a surface of ${map.vertices} vertices and ${map.faces} triangles (signature ${map.signature}); ` +
        `this surface has ${id.vertices} vertices and ${id.faces} triangles (signature ${id.signature}). Carry the groom onto this surface (transfer) or repaint it.`,
      path,
    );
  }
  const bytes = fromBase64(map.data);
  const top = 2 ** map.bits - 1;
  const out = new Float64Array(map.vertices);
  for (let v = 0; v < map.vertices; v++) {
    const code = map.bits === 8 ? bytes[v] : bytes[2 * v] | (bytes[2 * v + 1] << 8);
    out[v] = code === 0 ? map.low : code === top ? map.high : map.low + ((map.high - map.low) * code) / top;
  }
  return out;
}

/**
 * Each attribute's factor per vertex: its map times its pins' blend (`blendPins`), vertex by vertex.
 *
 * Guarantees: an attribute with neither map nor pins is absent, and so is one whose product is
 * exactly 1 at every vertex — a map of all ones grows exactly the guides of no map; a map on
 * another surface is refused as `decodeMap` says.
 */
export function attributeFactors(spec: GroomSpec, mesh: TriangleMesh, pins: PinnedFactors): AttributeFactors {
  const out: AttributeFactors = {};
  for (const attribute of MAP_ATTRIBUTES) {
    const pinned = (pins as AttributeFactors)[attribute];
    const index = spec.maps?.findIndex((m) => m.attribute === attribute) ?? -1;
    if (index < 0) {
      if (pinned) out[attribute] = pinned;
      continue;
    }
    const painted = decodeMap(spec.maps![index], mesh, `maps[${index}]`);
    if (pinned) for (let v = 0; v < painted.length; v++) painted[v] *= pinned[v];
    if (painted.some((x) => x !== 1)) out[attribute] = painted;
  }
  return out;
}

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const CODE = new Uint8Array(128);
for (let i = 0; i < 64; i++) CODE[ALPHABET.charCodeAt(i)] = i;

/** Standard base64 (RFC 4648 §4, with padding); written out so the library needs no Node Buffer in a Worker. */
function toBase64(bytes: Uint8Array): string {
  const parts: string[] = [];
  let line = '';
  for (let i = 0; i < bytes.length; i += 3) {
    const a = bytes[i], b = i + 1 < bytes.length ? bytes[i + 1] : 0, c = i + 2 < bytes.length ? bytes[i + 2] : 0;
    line += ALPHABET[a >> 2] + ALPHABET[((a & 3) << 4) | (b >> 4)];
    line += i + 1 < bytes.length ? ALPHABET[((b & 15) << 2) | (c >> 6)] : '=';
    line += i + 2 < bytes.length ? ALPHABET[c & 63] : '=';
    if (line.length >= 4096) { parts.push(line); line = ''; }
  }
  parts.push(line);
  return parts.join('');
}

function fromBase64(text: string): Uint8Array {
  const pad = text.endsWith('==') ? 2 : text.endsWith('=') ? 1 : 0;
  const out = new Uint8Array((text.length / 4) * 3 - pad);
  for (let i = 0, o = 0; i < text.length; i += 4) {
    const n = (CODE[text.charCodeAt(i)] << 18) | (CODE[text.charCodeAt(i + 1)] << 12) | (CODE[text.charCodeAt(i + 2)] << 6) | CODE[text.charCodeAt(i + 3)];
    if (o < out.length) out[o++] = n >> 16;
    if (o < out.length) out[o++] = (n >> 8) & 0xff;
    if (o < out.length) out[o++] = n & 0xff;
  }
  return out;
}
