// The market's public preview (lib/groom/export/preview.ts), read back with readers that are not
// ours: three.js's GLTFLoader (what a visitor's browser runs) and the Khronos glTF Validator.
import { validateBytes } from 'gltf-validator';
import { beforeAll, describe, expect, it } from 'vitest';
import { readSurface } from '@/lib/field';
import { guidesToGltf } from '@/lib/groom/export/gltf';
import { previewGuides, previewToGlb, PUBLIC_PREVIEW } from '@/lib/groom/export/preview';
import type { Guides } from '@/lib/groom/grow/guides';
import { loadGltf as load, linesOf as curvesOf } from '@/tests/fixtures/gltf-lines';
import { quadSphere } from '@/tests/fixtures/quad-sphere';
import { groomOn } from './support';

let guides: Guides;

beforeAll(() => {
  const sphere = quadSphere(10, 16, { radius: 3 });
  ({ guides } = groomOn(readSurface(new TextEncoder().encode(sphere.obj), 'sphere.obj').mesh, {
    specVersion: 2,
    units: 'cm',
    upAxis: 'z',
    field: { singularities: [{ point: [0, 3, 0], index: 1 }, { point: [0, -3, 0], index: 1 }] },
    guides: { count: 437, length: 0.8, pointsPerGuide: 12, seed: 4 },
  }));
});

describe('the public preview', () => {
  it('holds a tenth of the guides at most, four points each, as three.js reads it', async () => {
    const bytes = previewToGlb(previewGuides(guides));
    const preview = curvesOf((await load(bytes)).scene);
    const full = curvesOf((await load(guidesToGltf(guides, { binary: true }))).scene);
    expect(full.curves).toBe(437);
    // ⌊0.1 · 437⌋ = 43 curves of 4 points.
    expect(preview.curves).toBe(43);
    expect(preview.points).toBe(43 * 4);
    expect(preview.curves).toBeLessThanOrEqual(PUBLIC_PREVIEW.share * full.curves);
    expect(preview.attributes).toEqual(['position']);
    expect(full.attributes).toContain('_width');
  });

  it('shows the first guides of the fixed order: their roots are the full export’s first roots', async () => {
    const preview = curvesOf((await load(previewToGlb(previewGuides(guides)))).scene);
    const full = curvesOf((await load(guidesToGltf(guides, { binary: true }))).scene);
    expect(preview.roots).toEqual(full.roots.slice(0, preview.roots.length));
  });

  it('carries no widths, binding or per-guide data, and the Khronos validator finds no error or warning', async () => {
    const bytes = previewToGlb(previewGuides(guides));
    const report = await validateBytes(bytes, { format: 'glb', maxIssues: 0 });
    expect(report.issues.messages.filter((m) => m.severity <= 1)).toEqual([]);
    const gltf = await load(bytes);
    const json = gltf.parser.json as { accessors: { name?: string }[]; meshes: { extras?: unknown; primitives: { attributes: object }[] }[] };
    expect(json.accessors).toHaveLength(2);
    expect(json.accessors.some((a) => a.name)).toBe(false);
    expect(json.meshes[0].extras).toBeUndefined();
    expect(Object.keys(json.meshes[0].primitives[0].attributes)).toEqual(['POSITION']);
    expect(JSON.stringify(json)).not.toMatch(/guideId|rootFace|rootBarycentric|_WIDTH|binding/);
    expect(gltf.asset.extras).toEqual({ whorlwind: { preview: { guides: 43, of: 437, pointsPerGuide: 4 } } });
  });

  it('keeps each guide’s own root and tip, never a point of its own making', () => {
    const preview = previewGuides(guides);
    const n = guides.pointsPerGuide;
    for (let g = 0; g < preview.count; g++) {
      const root = Array.from(preview.points.subarray(3 * 4 * g, 3 * 4 * g + 3));
      const tip = Array.from(preview.points.subarray(3 * (4 * g + 3), 3 * (4 * g + 3) + 3));
      expect(root).toEqual(Array.from(guides.points.subarray(3 * n * g, 3 * n * g + 3)));
      expect(tip).toEqual(Array.from(guides.points.subarray(3 * (n * g + n - 1), 3 * (n * g + n - 1) + 3)));
    }
  });

  it('caps the guides shown, and writes a valid empty file when the share rounds to none', async () => {
    expect(previewGuides(guides, { share: 0.5, pointsPerGuide: 3, maxGuides: 20 }).count).toBe(20);
    const none = previewGuides(guides, { share: 0.001, pointsPerGuide: 4, maxGuides: 100 });
    expect(none.count).toBe(0);
    const report = await validateBytes(previewToGlb(none), { format: 'glb', maxIssues: 0 });
    expect(report.issues.numErrors).toBe(0);
    expect(() => previewGuides(guides, { share: 0, pointsPerGuide: 4, maxGuides: 10 })).toThrow(/share/);
  });
});
