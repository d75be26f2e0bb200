// A public look at a groom that is no use as the groom: a share of its guides, each cut down to a
// few points, as bare glTF lines — no widths, no binding, no per-guide data. The market shows it
// on a listing to anyone; the guides themselves leave only in the paid package.
import type { Guides } from '../grow/guides';
import type { Unit } from '../spec/spec';
import { CENTIMETRES_PER_UNIT } from '../spec/spec';
import { glb, guideLineIndices } from './gltf';

/** The reduced guides: the first `count` guides of the fixed root order, `pointsPerGuide` points each. */
export interface PreviewGuides {
  readonly count: number;
  readonly pointsPerGuide: number;
  /** x, y, z of every point, guide after guide, in surface units. */
  readonly points: Float64Array;
  readonly units: Unit;
  readonly upAxis: 'y' | 'z';
  /** How many guides the groom has, of which these are the first. */
  readonly ofCount: number;
}

export interface PreviewLimits {
  /** The largest share of the guides shown (0 < share ≤ 1). */
  readonly share: number;
  /** Points kept per guide (at least 2). */
  readonly pointsPerGuide: number;
  /** The most guides shown, whatever the share (a page need not draw more). */
  readonly maxGuides: number;
}

/**
 * The market's public preview: a tenth of the guides at most, four points each, at most 5,000
 * guides. Our choice: enough to see the flow and the whorls on a listing's page, too sparse and
 * too coarse to stand in for the groom.
 */
export const PUBLIC_PREVIEW: PreviewLimits = { share: 0.1, pointsPerGuide: 4, maxGuides: 5000 };

/**
 * The first k guides, k = ⌊share · count⌋ (capped at `maxGuides`), each cut to `pointsPerGuide`
 * of its own points: the root, the tip and points evenly spaced by index between them.
 *
 * Guarantees: count ≤ share · guides.count and ≤ maxGuides; pointsPerGuide ≤ min(limits,
 * guides.pointsPerGuide); every point is one of the guide's own points (nothing is invented);
 * the guides kept are those of the lowest ids — by the fixed root order of lib/groom a spread-out
 * subset of the surface (a sparser set of the same groom), not a patch of it. With guide sets, the
 * share is taken of each set (its lowest ids), scaled down alike when over `maxGuides`.
 */
export function previewGuides(guides: Guides, limits: PreviewLimits = PUBLIC_PREVIEW): PreviewGuides {
  if (!(limits.share > 0 && limits.share <= 1)) throw new Error(`a preview's share must be above 0 and at most 1, not ${limits.share}`);
  if (!(limits.pointsPerGuide >= 2)) throw new Error(`a preview keeps at least 2 points per guide, not ${limits.pointsPerGuide}`);
  // A small epsilon keeps 0.1 · 30 from rounding down to 2 in floating point.
  const cap = Math.max(0, Math.floor(limits.maxGuides));
  // With guide sets, the lowest ids of each set (ids are each set's own), so every set shows.
  const runs = (guides.sets ?? [{ first: 0, count: guides.count }]).map((set) => ({ first: set.first, take: Math.floor(limits.share * set.count + 1e-9) }));
  const asked = runs.reduce((sum, r) => sum + r.take, 0);
  if (asked > cap) for (const r of runs) r.take = Math.floor((r.take * cap) / asked);
  const chosen = runs.flatMap((r) => Array.from({ length: r.take }, (_x, k) => r.first + k));
  const count = chosen.length;
  const n = guides.pointsPerGuide;
  const kept = Math.min(Math.floor(limits.pointsPerGuide), n);
  const points = new Float64Array(3 * kept * count);
  // Guides are stored in id order (set after set), so each run's first are its lowest ids.
  for (let c = 0; c < count; c++) {
    const g = chosen[c];
    for (let j = 0; j < kept; j++) {
      const from = 3 * (g * n + Math.round((j * (n - 1)) / Math.max(1, kept - 1)));
      const to = 3 * (c * kept + j);
      points[to] = guides.points[from];
      points[to + 1] = guides.points[from + 1];
      points[to + 2] = guides.points[from + 2];
    }
  }
  return { count, pointsPerGuide: kept, points, units: guides.units, upAxis: guides.upAxis, ofCount: guides.count };
}

/**
 * The preview as a .glb: one node "Guides" with one `LINES` primitive (index pairs within each
 * guide) and a `POSITION` attribute in metres, +Y up (Z-up surfaces turned), as guidesToGltf
 * writes them.
 *
 * Guarantees: no other attribute, accessor or extras than these (no widths, no guide ids, no
 * root faces or weights, no lengths); `asset.extras.whorlwind.preview` says how many guides of
 * how many it holds; a preview of no guides is a valid file with an empty node.
 */
export function previewToGlb(preview: PreviewGuides): Uint8Array {
  const n = preview.pointsPerGuide;
  const total = preview.count * n;
  const metres = CENTIMETRES_PER_UNIT[preview.units] / 100;
  const zUp = preview.upAxis === 'z';
  const positions = new Float32Array(3 * total);
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < total; i++) {
    const x = preview.points[3 * i], y = preview.points[3 * i + 1], z = preview.points[3 * i + 2];
    positions[3 * i] = x * metres;
    positions[3 * i + 1] = (zUp ? z : y) * metres;
    positions[3 * i + 2] = (zUp ? -y : z) * metres;
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k], positions[3 * i + k]);
      max[k] = Math.max(max[k], positions[3 * i + k]);
    }
  }
  const indices = guideLineIndices(preview.count, n);
  const asset = { version: '2.0', generator: 'Whorlwind', extras: { whorlwind: { preview: { guides: preview.count, of: preview.ofCount, pointsPerGuide: n } } } };
  // glTF forbids zero-length buffers and accessors of count 0.
  if (indices.length === 0) return glb(JSON.stringify({ asset, scene: 0, scenes: [{ nodes: [0] }], nodes: [{ name: 'Guides' }] }), new Uint8Array(0));
  const binary = new Uint8Array(positions.byteLength + indices.byteLength);
  binary.set(new Uint8Array(positions.buffer), 0);
  binary.set(new Uint8Array(indices.buffer), positions.byteLength);
  const json = {
    asset,
    scene: 0,
    scenes: [{ nodes: [0] }],
    nodes: [{ name: 'Guides', mesh: 0 }],
    meshes: [{ name: 'Guides', primitives: [{ attributes: { POSITION: 0 }, indices: 1, mode: 1 }] }],
    accessors: [
      { bufferView: 0, componentType: 5126, count: total, type: 'VEC3', min, max },
      { bufferView: 1, componentType: 5125, count: indices.length, type: 'SCALAR' },
    ],
    bufferViews: [
      { buffer: 0, byteOffset: 0, byteLength: positions.byteLength, target: 34962 },
      { buffer: 0, byteOffset: positions.byteLength, byteLength: indices.byteLength, target: 34963 },
    ],
    buffers: [{ byteLength: binary.byteLength }],
  };
  return glb(JSON.stringify(json), binary);
}
