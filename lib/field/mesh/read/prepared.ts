/**
 * The prepared form of a checked surface: what `readSurface` made of the artist's file (the welded
 * mesh with its file numbering, polygons, UVs and groups, and the reading's facts), written as
 * typed arrays one after the other, so that reading it back is a copy instead of a parse and a weld.
 *
 * Layout (little-endian): the 8 bytes "WWSURF01"; a uint32 with the byte length of a UTF-8 JSON
 * header; the header (the format version, the reading's facts, the group names, and for each
 * array its name, element type and length); zero padding to a multiple of 8; then each array,
 * each starting at a multiple of 8 bytes.
 *
 * Versions: 1 (no `version` in the header) holds the reading; 2 may add what the writer worked
 * out beyond it (`PreparedGroundwork`: a mark that the surface passed the check, and the ring
 * system's orderings as arrays `ringOrderingFree` / `ringOrderingHeld`). A version 1 file reads
 * as before, without groundwork; a reader of version 1 ignores the arrays it does not know, so it
 * still reads a version 2 file's reading.
 */
import { FieldError } from '../errors';
import type { TriangleMesh } from '../mesh';
import { readSurface, type SurfaceReadResult } from './index';

const MAGIC = 'WWSURF01';
/** The newest format version this code writes and reads (see the file's comment). */
const VERSION = 2;

/**
 * Fill-reducing orderings of the field's vertex-ring system (lib/field/connection/ring-solver.ts),
 * by the rows they order: `free` for a free boundary, `held` for a held one (tangent or normal).
 * perm[k] = the row of the k-th pivot.
 */
export interface RingOrderings {
  readonly free?: Int32Array;
  readonly held?: Int32Array;
}

/**
 * What the writer of a prepared form worked out beyond the reading, so that its reader need not
 * (format version 2). `checked`: the writer vouches that this mesh passed `checkSurface` without
 * errors. `ringOrderings`: see RingOrderings; a reader validates them before use.
 */
export interface PreparedGroundwork {
  readonly checked: boolean;
  readonly ringOrderings: RingOrderings;
}

/** A reading from a prepared form, with the groundwork when the form carries any. */
export type PreparedSurfaceRead = SurfaceReadResult & { readonly groundwork?: PreparedGroundwork };

type ArrayName = 'positions' | 'triangles' | 'fileVertexToVertex' | 'facePolygon' | 'faceCorners' | 'cornerUvs' | 'groupOfFace' | 'polygonStart' | 'polygonCorners' | 'polygonUvs' | 'ringOrderingFree' | 'ringOrderingHeld';
type ElementType = 'f64' | 'f32' | 'u32' | 'u16';
type Typed = Float64Array | Float32Array | Uint32Array | Uint16Array;

const CONSTRUCTORS: Record<ElementType, { new (buffer: ArrayBuffer, offset: number, length: number): Typed; BYTES_PER_ELEMENT: number }> = {
  f64: Float64Array,
  f32: Float32Array,
  u32: Uint32Array,
  u16: Uint16Array,
};

type Header = {
  /** Absent in version 1. */
  version?: number;
  /** Version 2: the writer vouches the mesh passed the check. */
  checked?: boolean;
  facts: Omit<SurfaceReadResult, 'mesh'>;
  groupNames: string[] | null;
  arrays: { name: ArrayName; type: ElementType; length: number }[];
};

const typeOf = (array: Typed): ElementType =>
  array instanceof Float64Array ? 'f64' : array instanceof Float32Array ? 'f32' : array instanceof Uint32Array ? 'u32' : 'u16';

const padTo8 = (n: number) => (n + 7) & ~7;

/**
 * The prepared form of a reading (see the file's comment), with what the writer worked out beyond
 * it when given (`checked` only when the writer ran `checkSurface` on this mesh and it passed).
 * Guarantees: `readPreparedSurface` gives back an equal result, and the groundwork when given.
 */
export function writePreparedSurface(read: SurfaceReadResult, groundwork?: Partial<PreparedGroundwork>): Uint8Array {
  const { mesh, ...rest } = read;
  // A reading that came from a prepared form carries its groundwork: only what is given here is written.
  const { groundwork: _carried, ...facts } = rest as typeof rest & { groundwork?: unknown };
  const asStored = (ordering: Int32Array | undefined) => ordering && new Uint32Array(ordering.buffer, ordering.byteOffset, ordering.length);
  const arrays: [ArrayName, Typed | undefined][] = [
    ['positions', mesh.positions],
    ['triangles', mesh.triangles],
    ['fileVertexToVertex', mesh.fileVertexToVertex],
    ['facePolygon', mesh.facePolygon],
    ['faceCorners', mesh.faceCorners],
    ['cornerUvs', mesh.cornerUvs],
    ['groupOfFace', mesh.groups?.groupOfFace],
    ['polygonStart', mesh.polygons?.start],
    ['polygonCorners', mesh.polygons?.corners],
    ['polygonUvs', mesh.polygons?.uvs],
    ['ringOrderingFree', asStored(groundwork?.ringOrderings?.free)],
    ['ringOrderingHeld', asStored(groundwork?.ringOrderings?.held)],
  ];
  const present = arrays.filter((entry): entry is [ArrayName, Typed] => entry[1] !== undefined);
  const header: Header = {
    version: VERSION,
    ...(groundwork?.checked ? { checked: true } : {}),
    facts,
    groupNames: mesh.groups ? [...mesh.groups.names] : null,
    arrays: present.map(([name, array]) => ({ name, type: typeOf(array), length: array.length })),
  };
  const json = new TextEncoder().encode(JSON.stringify(header));
  const start = padTo8(MAGIC.length + 4 + json.length);
  let size = start;
  for (const [, array] of present) size = padTo8(size + array.byteLength);
  const out = new Uint8Array(size);
  for (let i = 0; i < MAGIC.length; i++) out[i] = MAGIC.charCodeAt(i);
  new DataView(out.buffer).setUint32(MAGIC.length, json.length, true);
  out.set(json, MAGIC.length + 4);
  let at = start;
  for (const [, array] of present) {
    out.set(new Uint8Array(array.buffer, array.byteOffset, array.byteLength), at);
    at = padTo8(at + array.byteLength);
  }
  return out;
}

const broken = (why: string) => new FieldError('malformed-file', `The prepared surface cannot be read: ${why}.`);

/**
 * Reads a prepared surface back, of format version 1 or 2. Guarantees: the same reading
 * `writePreparedSurface` was given (typed arrays equal element by element), with `groundwork` when
 * the form carries a check mark or orderings (never for version 1); for any other bytes a
 * FieldError `malformed-file` (wrong start, a header that is not ours or of a newer version,
 * arrays past the end, indices out of range) and never any other exception. The orderings are
 * handed on as stored: `prepareSurface` checks them before use. Linear in the size; nothing is
 * parsed but the header.
 */
export function readPreparedSurface(bytes: Uint8Array): PreparedSurfaceRead {
  if (bytes.length < MAGIC.length + 4 || String.fromCharCode(...bytes.subarray(0, MAGIC.length)) !== MAGIC) throw broken('it does not start as one');
  const jsonLength = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(MAGIC.length, true);
  if (MAGIC.length + 4 + jsonLength > bytes.length) throw broken('its header runs past its end');
  let header: Header;
  try {
    header = JSON.parse(new TextDecoder().decode(bytes.subarray(MAGIC.length + 4, MAGIC.length + 4 + jsonLength)));
  } catch {
    throw broken('its header is not JSON');
  }
  if (!header || typeof header !== 'object' || !Array.isArray(header.arrays) || !header.facts) throw broken('its header is not ours');
  const version = header.version ?? 1;
  if (version !== 1 && version !== VERSION) throw broken(`it is of format version ${String(version)}, and this reader knows versions 1 to ${VERSION}`);
  // One aligned copy, so every array can be a view on it.
  const copy = new ArrayBuffer(bytes.length);
  new Uint8Array(copy).set(bytes);
  const found = new Map<ArrayName, Typed>();
  let at = padTo8(MAGIC.length + 4 + jsonLength);
  for (const entry of header.arrays) {
    const type = CONSTRUCTORS[entry?.type];
    if (!type || !Number.isSafeInteger(entry.length) || entry.length < 0) throw broken(`the array “${String(entry?.name)}” is not described properly`);
    const end = at + entry.length * type.BYTES_PER_ELEMENT;
    if (end > bytes.length) throw broken(`the array “${entry.name}” runs past its end`);
    found.set(entry.name, new type(copy, at, entry.length));
    at = padTo8(end);
  }
  const positions = found.get('positions');
  const triangles = found.get('triangles');
  if (!(positions instanceof Float64Array) || !(triangles instanceof Uint32Array) || positions.length % 3 !== 0 || triangles.length % 3 !== 0) throw broken('it has no mesh');
  const vertexCount = positions.length / 3;
  for (let i = 0; i < triangles.length; i++) if (triangles[i] >= vertexCount) throw broken('a face names a vertex it does not have');
  const fileVertices = found.get('fileVertexToVertex');
  if (fileVertices) for (let i = 0; i < fileVertices.length; i++) if (fileVertices[i] >= vertexCount) throw broken('a file vertex maps to a vertex it does not have');
  for (const name of ['facePolygon', 'groupOfFace'] as const) {
    const perFace = found.get(name);
    if (perFace && perFace.length !== triangles.length / 3) throw broken(`“${name}” does not have one entry per face`);
  }
  for (const [name, per] of [['faceCorners', 3], ['cornerUvs', 6]] as const) {
    const perCorner = found.get(name);
    if (perCorner && perCorner.length !== per * (triangles.length / 3)) throw broken(`“${name}” does not fit the faces`);
  }
  const groupOfFace = found.get('groupOfFace');
  const polygonStart = found.get('polygonStart'), polygonCorners = found.get('polygonCorners');
  // Parts the reading did not have stay absent (no keys holding undefined).
  const part = <K extends keyof TriangleMesh>(key: K, value: TriangleMesh[K] | undefined): Partial<TriangleMesh> => (value === undefined ? {} : { [key]: value });
  const mesh: TriangleMesh = {
    positions,
    triangles,
    ...part('fileVertexToVertex', found.get('fileVertexToVertex') as Uint32Array | undefined),
    ...part('groups', header.groupNames && groupOfFace ? { names: header.groupNames, groupOfFace: groupOfFace as Uint16Array } : undefined),
    ...part('facePolygon', found.get('facePolygon') as Uint32Array | undefined),
    ...part('faceCorners', found.get('faceCorners') as Uint32Array | undefined),
    ...part('cornerUvs', found.get('cornerUvs') as Float32Array | undefined),
    ...part(
      'polygons',
      polygonStart && polygonCorners
        ? { start: polygonStart as Uint32Array, corners: polygonCorners as Uint32Array, ...(found.has('polygonUvs') ? { uvs: found.get('polygonUvs') as Float32Array } : {}) }
        : undefined,
    ),
  };
  // Stored as unsigned; an entry past 2³¹ reads negative and is refused where it is checked.
  const ordering = (name: 'ringOrderingFree' | 'ringOrderingHeld') => {
    const stored = found.get(name);
    if (stored && !(stored instanceof Uint32Array)) throw broken(`the array “${name}” is not of unsigned integers`);
    return stored ? { [name === 'ringOrderingFree' ? 'free' : 'held']: new Int32Array(stored.buffer, stored.byteOffset, stored.length) } : {};
  };
  const ringOrderings: RingOrderings = version === 1 ? {} : { ...ordering('ringOrderingFree'), ...ordering('ringOrderingHeld') };
  const checked = version !== 1 && header.checked === true;
  const groundwork = checked || ringOrderings.free || ringOrderings.held ? { groundwork: { checked, ringOrderings } } : {};
  return { ...header.facts, mesh, ...groundwork };
}

/** The file name extension a prepared surface is known by. */
export const PREPARED_EXTENSION = 'wwsurf';

/** Reads a surface file, or a prepared surface when the name ends with `.wwsurf` (see `readSurface` and `readPreparedSurface` for the guarantees). */
export function readSurfaceOrPrepared(bytes: Uint8Array, fileName: string): PreparedSurfaceRead {
  return fileName.toLowerCase().endsWith(`.${PREPARED_EXTENSION}`) ? readPreparedSurface(bytes) : readSurface(bytes, fileName);
}
