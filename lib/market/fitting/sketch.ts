// The reduced guides a trial shows (plain TypeScript on typed arrays, no storage): a small share
// of the guides with few points each, written as a glTF 2.0 binary of bare lines. It carries no
// widths, no binding (root faces, weights, UVs, ids) and no surface, so it is a look at the coat,
// not a file that can stand in for the package's guides.
import { CENTIMETRES_PER_UNIT, type Guides } from '../../groom';

/** The share of the listing's guides a trial may show (issue 14: at most 5 %). */
export const TRIAL_GUIDE_SHARE = 0.05;
/** The most points per guide a trial shows. */
export const TRIAL_POINTS_PER_GUIDE = 8;

export type Sketch = { count: number; pointsPerGuide: number; units: Guides['units']; upAxis: Guides['upAxis']; points: Float64Array };

/**
 * At most ⌊share · wholeCount⌋ guides (and never more than grown), each with at most
 * `maxPoints` points. Guides are stored in root order, where a sparser set is the first part of a
 * denser one (lib/groom/grow/roots.ts), so the first guides are spread over the whole surface.
 * Each kept guide keeps its root and tip and points evenly spaced by index between them.
 */
export function sketchGuides(guides: Guides, wholeCount: number, share = TRIAL_GUIDE_SHARE, maxPoints = TRIAL_POINTS_PER_GUIDE): Sketch {
  const count = Math.min(guides.count, Math.floor(share * Math.min(wholeCount, guides.count)));
  const n = guides.pointsPerGuide;
  const pointsPerGuide = Math.min(n, maxPoints);
  const points = new Float64Array(3 * count * pointsPerGuide);
  for (let g = 0; g < count; g++) {
    for (let j = 0; j < pointsPerGuide; j++) {
      const source = pointsPerGuide > 1 ? Math.round((j * (n - 1)) / (pointsPerGuide - 1)) : 0;
      for (let k = 0; k < 3; k++) points[3 * (g * pointsPerGuide + j) + k] = guides.points[3 * (g * n + source) + k];
    }
  }
  return { count, pointsPerGuide, units: guides.units, upAxis: guides.upAxis, points };
}

/**
 * The sketch as a .glb (glTF 2.0 §4.4, binary container): one LINES primitive (mode 1) with
 * POSITION only (metres, +Y up, as glTF fixes them; a Z-up surface is turned) and uint32 index
 * pairs that never join two guides. POSITION's min and max are exact (the spec requires them).
 */
export function sketchToGlb(sketch: Sketch): Uint8Array {
  const total = sketch.count * sketch.pointsPerGuide;
  const metres = CENTIMETRES_PER_UNIT[sketch.units] / 100;
  const zUp = sketch.upAxis === 'z';
  const positions = new Float32Array(3 * total);
  for (let i = 0; i < total; i++) {
    const x = sketch.points[3 * i], y = sketch.points[3 * i + 1], z = sketch.points[3 * i + 2];
    positions[3 * i] = x * metres;
    positions[3 * i + 1] = (zUp ? z : y) * metres;
    positions[3 * i + 2] = (zUp ? -y : z) * metres;
  }
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i++) {
    min[i % 3] = Math.min(min[i % 3], positions[i]);
    max[i % 3] = Math.max(max[i % 3], positions[i]);
  }
  const segments = sketch.pointsPerGuide - 1;
  const indices = new Uint32Array(2 * segments * sketch.count);
  let k = 0;
  for (let g = 0; g < sketch.count; g++) {
    for (let j = 0; j < segments; j++) {
      indices[k++] = g * sketch.pointsPerGuide + j;
      indices[k++] = g * sketch.pointsPerGuide + j + 1;
    }
  }
  const asset = { version: '2.0', generator: 'Whorlwind trial preview' };
  if (total === 0 || indices.length === 0) return container(JSON.stringify({ asset }), new Uint8Array(0));
  const binary = new Uint8Array(positions.byteLength + indices.byteLength);
  binary.set(new Uint8Array(positions.buffer), 0);
  binary.set(new Uint8Array(indices.buffer), positions.byteLength);
  const json = {
    asset,
    scene: 0,
    scenes: [{ nodes: [0] }],
    nodes: [{ name: 'Trial guides', mesh: 0 }],
    meshes: [{ name: 'Trial guides', primitives: [{ attributes: { POSITION: 0 }, indices: 1, mode: 1 }] }],
    buffers: [{ byteLength: binary.byteLength }],
    bufferViews: [
      { buffer: 0, byteOffset: 0, byteLength: positions.byteLength, target: 34962 },
      { buffer: 0, byteOffset: positions.byteLength, byteLength: indices.byteLength, target: 34963 },
    ],
    accessors: [
      { bufferView: 0, componentType: 5126, count: total, type: 'VEC3', min, max },
      { bufferView: 1, componentType: 5125, count: indices.length, type: 'SCALAR' },
    ],
  };
  return container(JSON.stringify(json), binary);
}

/** The GLB container (glTF 2.0 §4.4): 12-byte header, a JSON chunk padded with spaces, a BIN chunk padded with zeros. */
function container(jsonText: string, binary: Uint8Array): Uint8Array {
  const jsonBytes = new TextEncoder().encode(jsonText);
  const jsonLength = Math.ceil(jsonBytes.length / 4) * 4;
  const binLength = Math.ceil(binary.length / 4) * 4;
  const total = 12 + 8 + jsonLength + (binary.length > 0 ? 8 + binLength : 0);
  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  view.setUint32(0, 0x46546c67, true); // "glTF"
  view.setUint32(4, 2, true);
  view.setUint32(8, total, true);
  view.setUint32(12, jsonLength, true);
  view.setUint32(16, 0x4e4f534a, true); // "JSON"
  out.set(jsonBytes, 20);
  out.fill(0x20, 20 + jsonBytes.length, 20 + jsonLength);
  if (binary.length > 0) {
    view.setUint32(20 + jsonLength, binLength, true);
    view.setUint32(24 + jsonLength, 0x004e4942, true); // "BIN\0"
    out.set(binary, 28 + jsonLength);
  }
  return out;
}
