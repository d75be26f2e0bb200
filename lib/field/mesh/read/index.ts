/**
 * One entry for every surface file a groomer may upload: the format named by the file's extension
 * is checked against the bytes, read by its reader, then triangulated and welded the same way.
 */
import { FieldError } from '../errors';
import type { TriangleMesh } from '../mesh';
import { readGltf } from './gltf';
import { readObj } from './obj';
import { readPly } from './ply';
import { assembleSurface, type PolygonSoup, type UvPresence } from './soup';

export type { UvPresence } from './soup';
import { hasBinaryStlSize, readAsciiStl, readBinaryStl } from './stl';

export { DEFAULT_WELD_FRACTION } from './weld';

/** Faces (triangles, after splitting polygons) a surface may have unless the caller says otherwise. */
export const DEFAULT_MAX_FACES = 2_000_000;

export type SurfaceFormat = 'obj' | 'ply' | 'stl' | 'gltf' | 'glb';

export interface ReadSurfaceOptions {
  /**
   * Vertices closer than this (in the file's units) become one vertex. Default: 1e-6 × the
   * diagonal of the bounding box of the file's vertices (`DEFAULT_WELD_FRACTION`). 0 merges only
   * exactly equal positions.
   */
  readonly weldTolerance?: number;
  /** Most triangles accepted; more is a FieldError `too-many-faces`. Default `DEFAULT_MAX_FACES`. */
  readonly maxFaces?: number;
}

export interface SurfaceReadResult {
  readonly mesh: TriangleMesh;
  readonly format: SurfaceFormat;
  readonly encoding: 'text' | 'binary-little-endian' | 'binary-big-endian';
  /** Vertices as the file lists them (glTF: of every drawn primitive, concatenated). */
  readonly sourceVertexCount: number;
  /** Faces as the file lists them: polygons for OBJ and PLY, triangles for STL and glTF. */
  readonly sourceFaceCount: number;
  readonly weldedVertexCount: number;
  /** The weld distance that was used, in the file's units. */
  readonly weldTolerance: number;
  /** File faces with more than three corners, split into triangles. */
  readonly splitFaceCount: number;
  /**
   * Triangles left out because two of their corners became the same vertex (in the file, or
   * after welding); `examples` are the first few file faces (numbered from 0) they came from.
   */
  readonly collapsedTriangles: { readonly count: number; readonly examples: readonly number[] };
  /** Texture coordinates on every corner (kept as `mesh.cornerUvs`), on some (left out), or none. */
  readonly uvs: UvPresence;
  /** Plain-words remarks on what was ignored or assumed, for the upload report. */
  readonly notes: readonly string[];
}

/** What a file's bytes look like, regardless of its name. */
export type ContentKind = 'empty' | 'obj' | 'ply' | 'stl-ascii' | 'stl-binary' | 'gltf-json' | 'glb' | 'text' | 'binary';

const KIND_NAMES: Record<ContentKind, string> = {
  empty: 'an empty file',
  obj: 'an OBJ file',
  ply: 'a PLY file',
  'stl-ascii': 'an ASCII STL file',
  'stl-binary': 'a binary STL file',
  'gltf-json': 'a glTF (.gltf) or other JSON file',
  glb: 'a binary glTF (.glb) file',
  text: 'a text file of an unknown kind',
  binary: 'binary data of an unknown kind',
};

const EXTENSIONS: Record<string, { format: SurfaceFormat; accepts: ContentKind[] }> = {
  obj: { format: 'obj', accepts: ['obj', 'text'] },
  ply: { format: 'ply', accepts: ['ply'] },
  stl: { format: 'stl', accepts: ['stl-ascii', 'stl-binary', 'binary'] },
  gltf: { format: 'gltf', accepts: ['gltf-json'] },
  glb: { format: 'glb', accepts: ['glb'] },
};

const OBJ_KEYWORDS = new Set(['v', 'vt', 'vn', 'vp', 'f', 'fo', 'g', 'o', 's', 'l', 'p', 'mtllib', 'usemtl', 'usemap', 'maplib', 'cstype', 'deg', 'curv', 'curv2', 'surf', 'mg']);
const SAMPLE_BYTES = 4096;

function startsWithText(bytes: Uint8Array, text: string, from = 0): boolean {
  if (bytes.length < from + text.length) return false;
  for (let i = 0; i < text.length; i++) if (bytes[from + i] !== text.charCodeAt(i)) return false;
  return true;
}

function isSpace(b: number): boolean {
  return b === 0x20 || b === 0x09 || b === 0x0a || b === 0x0d || b === 0x0b || b === 0x0c;
}

/**
 * Guesses what a file is from its bytes alone. Binary STL is recognised by its size being exactly
 * 84 + 50 × (the triangle count in its header), never by a “solid” at the start, which many
 * binary STL writers put in their header too.
 *
 * Guarantees: total (any bytes give an answer); looks at most at the first few kilobytes, except
 * that an all-whitespace file is scanned to its end to call it empty.
 */
export function sniffContent(bytes: Uint8Array): ContentKind {
  let first = 0;
  while (first < bytes.length && isSpace(bytes[first])) first++;
  if (first === bytes.length) return 'empty';
  if (startsWithText(bytes, 'glTF')) return 'glb';
  if (startsWithText(bytes, 'ply\n') || startsWithText(bytes, 'ply\r\n')) return 'ply';
  if (hasBinaryStlSize(bytes)) return 'stl-binary';

  const sample = bytes.subarray(0, SAMPLE_BYTES);
  let control = 0;
  for (const b of sample) {
    if (b === 0) return 'binary';
    if (b < 0x20 && !isSpace(b)) control++;
  }
  if (control > sample.length / 100) return 'binary';

  if (bytes[first] === 0x7b /* { */ || startsWithText(bytes, '\u00ef\u00bb\u00bf{')) return 'gltf-json';
  const text = new TextDecoder('utf-8').decode(sample);
  if (/^\s*solid\b/i.test(text)) return 'stl-ascii';
  const lines = text.split('\n').slice(0, -1).map((l) => l.trim()).filter((l) => l !== '');
  const objLines = lines.filter((l) => l.startsWith('#') || OBJ_KEYWORDS.has(l.split(/\s+/)[0]));
  if (lines.length > 0 && objLines.length === lines.length && objLines.some((l) => /^[vf]\s/.test(l))) return 'obj';
  return 'text';
}

/** The extension of a file name, lower case, without the dot ('' when there is none). */
function extensionOf(fileName: string): string {
  const base = fileName.slice(Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\')) + 1);
  const dot = base.lastIndexOf('.');
  return dot <= 0 ? '' : base.slice(dot + 1).toLowerCase();
}

/**
 * Reads a growth surface from a file's bytes: OBJ, PLY (ASCII, binary little or big endian),
 * STL (ASCII, binary), glTF 2.0 (.gltf with embedded data, .glb). The format comes from the file
 * name's extension and is then checked against the content.
 *
 * Guarantees: returns a welded triangle mesh (see `SurfaceReadResult`) whose `fileVertexToVertex`
 * maps every file vertex, numbered from 0 as the file lists them, to its welded vertex; faces
 * keep the file's winding; OBJ groups become face groups. Otherwise throws a FieldError whose code
 * says why — `empty-file`, `unsupported-format` (extension), `wrong-format` (content does not
 * match the extension; the message says what it looks like), `truncated-file`, `malformed-file`,
 * `vertex-out-of-range`, `external-resource`, `too-many-faces` — and never any other exception,
 * for any bytes. Time and memory are linear in the file size (bounded by `maxFaces`). The mesh
 * may still be unusable for a field (non-manifold, degenerate, …): that is `checkSurface`'s job.
 */
export function readSurface(bytes: Uint8Array, fileName: string, options: ReadSurfaceOptions = {}): SurfaceReadResult {
  const maxFaces = options.maxFaces ?? DEFAULT_MAX_FACES;
  const extension = extensionOf(fileName);
  const expected = EXTENSIONS[extension];
  const kind = sniffContent(bytes);
  if (!expected) {
    const hint = kind === 'empty' || kind === 'text' || kind === 'binary' ? '' : ` Its content looks like ${KIND_NAMES[kind]}; rename it accordingly.`;
    throw new FieldError(
      'unsupported-format',
      `“${fileName}” is not a surface format Whorlwind reads. Upload an OBJ, PLY, STL, glTF or GLB file.${hint}`,
    );
  }
  if (kind === 'empty') throw new FieldError('empty-file', `“${fileName}” is empty.`);
  if (!expected.accepts.includes(kind)) {
    throw new FieldError('wrong-format', `“${fileName}” is named like a ${extension.toUpperCase()} file, but its content looks like ${KIND_NAMES[kind]}.`);
  }

  let soup: PolygonSoup;
  let encoding: SurfaceReadResult['encoding'] = 'text';
  switch (expected.format) {
    case 'obj':
      soup = readObj(bytes, maxFaces);
      break;
    case 'ply': {
      const ply = readPly(bytes, maxFaces);
      soup = ply.soup;
      encoding = ply.encoding;
      break;
    }
    case 'stl':
      if (kind === 'stl-ascii') {
        soup = readAsciiStl(bytes, maxFaces);
      } else {
        soup = readBinaryStl(bytes, maxFaces);
        encoding = 'binary-little-endian';
      }
      break;
    case 'gltf':
    case 'glb':
      soup = readGltf(bytes, expected.format === 'glb', maxFaces);
      if (expected.format === 'glb') encoding = 'binary-little-endian';
      break;
  }
  const assembled = assembleSurface(soup, { weldTolerance: options.weldTolerance, maxFaces });
  return { format: expected.format, encoding, ...assembled };
}
