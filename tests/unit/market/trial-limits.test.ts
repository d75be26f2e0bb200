// The reduced guides of a trial (lib/market/fitting/trial-limits.ts with lib/groom's previewGuides): the share and the points it keeps,
// and its .glb checked by the Khronos glTF validator (gltf-validator) and read back by hand from
// the container layout of glTF 2.0 §4.4.
import { validateBytes } from 'gltf-validator';
import { describe, expect, it } from 'vitest';
import type { Guides } from '@/lib/groom';
import { previewGuides, previewToGlb } from '@/lib/groom';
import { trialLimits, TRIAL_GUIDE_SHARE, TRIAL_POINTS_PER_GUIDE } from '@/lib/market/fitting/trial-limits';

const sketchGuides = (guides: Guides, listingGuideCount: number) => previewGuides(guides, trialLimits(listingGuideCount));

/** Straight guides: guide g's point j at (g, j, 0) in the given units. */
function straightGuides(count: number, pointsPerGuide: number, units: Guides['units'] = 'cm', upAxis: Guides['upAxis'] = 'y'): Guides {
  const points = new Float64Array(3 * count * pointsPerGuide);
  for (let g = 0; g < count; g++) for (let j = 0; j < pointsPerGuide; j++) points.set([g, j, 0], 3 * (g * pointsPerGuide + j));
  return { count, pointsPerGuide, points, units, upAxis } as unknown as Guides;
}

function readGlb(bytes: Uint8Array) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const jsonLength = view.getUint32(12, true);
  const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
  const bin = bytes.slice(28 + jsonLength);
  return { json, positions: new Float32Array(bin.buffer, 0, 3 * json.accessors[0].count), indices: new Uint32Array(bin.buffer, 12 * json.accessors[0].count, json.accessors[1].count) };
}

describe('a trial’s sketch of the guides', () => {
  it('keeps at most the share of the whole count, the first guides, with at most 8 points from root to tip', () => {
    const sketch = sketchGuides(straightGuides(1000, 33), 1277);
    expect(sketch.count).toBe(Math.floor(TRIAL_GUIDE_SHARE * 1000)); // the share of the guides grown, fewer than the listing's 1277
    expect(sketchGuides(straightGuides(1000, 33), 400).count).toBe(20);
    expect(sketch.pointsPerGuide).toBe(TRIAL_POINTS_PER_GUIDE);
    for (let g = 0; g < sketch.count; g++) {
      const at = (j: number) => Array.from(sketch.points.subarray(3 * (g * 8 + j), 3 * (g * 8 + j) + 3));
      expect(at(0)).toEqual([g, 0, 0]);
      expect(at(7)).toEqual([g, 32, 0]);
    }
    expect(sketchGuides(straightGuides(100, 5), 100).pointsPerGuide).toBe(5);
    expect(sketchGuides(straightGuides(10, 5), 10).count).toBe(0);
  });

  it('writes a valid glTF 2.0 binary of bare lines: POSITION in metres with +Y up, index pairs within a guide, nothing else', async () => {
    const sketch = sketchGuides(straightGuides(200, 12, 'mm', 'z'), 200);
    const bytes = previewToGlb(sketch);
    const report = await validateBytes(bytes, { format: 'glb', maxIssues: 0 });
    expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    const { json, positions, indices } = readGlb(bytes);
    expect(json.meshes[0].primitives).toEqual([{ attributes: { POSITION: 0 }, indices: 1, mode: 1 }]);
    expect(json.meshes[0].extras).toBeUndefined();
    // The asset says only what it is a reduction of (no ids, no binding).
    expect(Object.keys(json.asset.extras?.whorlwind ?? {})).toEqual(['preview']);
    // Z-up millimetres: (x, y, z) → (x, z, −y) / 1000; point 9 is guide 1's second kept point, source point round(1 · 11 / 7) = 2.
    expect(Array.from(positions.subarray(3 * 9, 3 * 9 + 3))).toEqual([Math.fround(1 / 1000), 0, Math.fround(-2 / 1000)]);
    for (let k = 0; k < indices.length; k += 2) {
      expect(Math.floor(indices[k] / sketch.pointsPerGuide)).toBe(Math.floor(indices[k + 1] / sketch.pointsPerGuide));
      expect(indices[k + 1]).toBe(indices[k] + 1);
    }
    expect(new Set(indices).size - indices.length / 2).toBe(sketch.count);
  });

  it('writes an empty scene when there is nothing to show, still valid', async () => {
    const report = await validateBytes(previewToGlb(sketchGuides(straightGuides(10, 5), 10)), { format: 'glb', maxIssues: 0 });
    expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
  });
});
