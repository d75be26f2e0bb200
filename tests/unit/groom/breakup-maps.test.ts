import { describe, expect, it } from 'vitest';
import { gridPlane } from '@/tests/fixtures/shapes';
import { encodeMap } from '@/lib/groom/place/maps';
import type { GroomSpecInput, MapAttribute } from '@/lib/groom/spec/spec';
import { groomOn } from './support';

// The breakup's own maps (lib/groom/README.md, "Painted maps"): where tuft and inner-tuft centres
// fall, the inner tufts' gather, the gather's rise, the loners' share, the waver's waves and the
// tip's width, each painted per surface vertex like the density or length map.

const PLANE = { specVersion: 3 as const, units: 'cm' as const, upAxis: 'z' as const, field: { referenceDirection: [1, 0.3, 0] as [number, number, number] } };
const NEW_ATTRIBUTES: readonly MapAttribute[] = ['tuftDensity', 'innerTuftDensity', 'innerGather', 'gatherRise', 'loners', 'waves', 'tipWidth'];

/** A 2 cm square of 40 × 40 cells, and per-vertex values: `right` where x ≥ 0, `left` elsewhere. */
const mesh = gridPlane(40, 40, 2, 2);
const halves = (left: number, right: number) => Float64Array.from({ length: mesh.positions.length / 3 }, (_x, v) => (mesh.positions[3 * v] >= 0 ? right : left));

/** Faces wholly in x ≤ −0.05 carry the left half's value exactly, faces wholly in x ≥ 0 the right half's; the strip between is blended. */
function sideOfFace(f: number): 'left' | 'right' | 'strip' {
  const xs = [0, 1, 2].map((k) => mesh.positions[3 * mesh.triangles[3 * f + k]]);
  return Math.max(...xs) <= -0.05 + 1e-9 ? 'left' : Math.min(...xs) >= -1e-9 ? 'right' : 'strip';
}

/** Every breakup setting a map may drive switched on: two tuft levels, loners, a waver. */
const SHAPED: GroomSpecInput = {
  ...PLANE,
  guides: { density: 150, length: 0.2, jitter: 0.3, tufts: { density: 20, gather: { root: 0.1, tip: 0.7, rise: 1.5 }, inner: { density: 60, gather: { root: 0.2, tip: 0.9, rise: 2 } }, loners: 0.2 }, waver: { amplitude: 0.02, waves: 2.5 } },
};

const bytes = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe('maps of the breakup settings', () => {
  it('grows exactly the guides of no map from a map of all ones, attribute by attribute; a map of 2× changes them', () => {
    const plain = groomOn(mesh, SHAPED);
    const ones = halves(1, 1), varied = halves(1, 2);
    for (const attribute of NEW_ATTRIBUTES) {
      const same = groomOn(mesh, { ...SHAPED, maps: [encodeMap(attribute, ones, mesh, 8)] });
      expect(bytes(same.guides.points).equals(bytes(plain.guides.points)), attribute).toBe(true);
      expect(same.guides.guideRootWidth, attribute).toEqual(plain.guides.guideRootWidth);
      expect(same.guides.guideTipWidth, attribute).toEqual(plain.guides.guideTipWidth);
      expect(same.guides.tuft, attribute).toEqual(plain.guides.tuft);
      expect(same.guides.innerTuft, attribute).toEqual(plain.guides.innerTuft);
      // The same attribute painted 2× on one half does reach the guides (the check above can fail).
      const other = groomOn(mesh, { ...SHAPED, maps: [encodeMap(attribute, varied, mesh, 8)] }).guides;
      const changed =
        !bytes(other.points).equals(bytes(plain.guides.points)) || !bytes(other.guideTipWidth).equals(bytes(plain.guides.guideTipWidth));
      expect(changed, attribute).toBe(true);
    }
  });

  it('multiplies the setting at the root: a constant map grows the guides of the setting times it', () => {
    // A constant map decodes exactly to its value (low = high, README "Painted maps"), but the
    // barycentric blend at a root sums three weights that may miss 1 by a rounding, so the factor
    // can be off by an ulp: points are compared to 1e-9 cm (a 2 cm square; a real change moves them
    // by millimetres, checked beside each).
    const constant = (x: number) => halves(x, x);
    const grow = (guides: Record<string, unknown>, maps: ReturnType<typeof encodeMap>[] = []) =>
      groomOn(mesh, { ...PLANE, guides: { density: 150, length: 0.2, jitter: 0.3, ...guides }, ...(maps.length ? { maps } : {}) }).guides.points;
    const apart = (a: Float64Array, b: Float64Array) => a.reduce((m, x, i) => Math.max(m, Math.abs(x - b[i])), 0);
    const tufts = (rise: number, outer = { root: 0.1, tip: 0.7 }) => ({ density: 20, gather: { ...outer, rise }, inner: { density: 60, gather: { root: 0.2, tip: 0.9, rise } } });
    // gatherRise: the rise of the draw the guides are drawn with (the inner level's here), 1.5 × 2 = 3.
    const risen = grow({ tufts: tufts(1.5) }, [encodeMap('gatherRise', constant(2), mesh, 8)]);
    expect(apart(risen, grow({ tufts: { ...tufts(1.5), inner: tufts(3).inner } }))).toBeLessThan(1e-9);
    expect(apart(risen, grow({ tufts: tufts(1.5) }))).toBeGreaterThan(1e-4);
    // waves: 3 × 0.5 = 1.5 waves along every guide.
    const waved = grow({ waver: { amplitude: 0.03, waves: 3 } }, [encodeMap('waves', constant(0.5), mesh, 8)]);
    expect(apart(waved, grow({ waver: { amplitude: 0.03, waves: 1.5 } }))).toBeLessThan(1e-9);
    expect(apart(waved, grow({ waver: { amplitude: 0.03, waves: 3 } }))).toBeGreaterThan(1e-4);
    // innerGather: 0 leaves the inner curves undrawn, as an outer gather of 0 does.
    const loose = grow({ tufts: tufts(1) }, [encodeMap('innerGather', constant(0), mesh, 8)]);
    expect(apart(loose, grow({ tufts: tufts(1, { root: 0, tip: 0 }) }))).toBeLessThan(1e-9);
    expect(apart(loose, grow({ tufts: tufts(1) }))).toBeGreaterThan(1e-4);
    // loners: 0.4 × 0.5 = 0.2 of the guides.
    const lonely = { density: 20, gather: { root: 0.2, tip: 1 }, loners: 0.4 };
    const fewer = grow({ tufts: lonely }, [encodeMap('loners', constant(0.5), mesh, 8)]);
    expect(apart(fewer, grow({ tufts: { ...lonely, loners: 0.2 } }))).toBeLessThan(1e-9);
    expect(apart(fewer, grow({ tufts: lonely }))).toBeGreaterThan(1e-4);
  });

  it('spreads tuft centres by a tuft-density map: half the square at 1×, half at 3×', () => {
    // Statistical tolerance (our choice, as for the density map's test in maps.test.ts): each
    // half's count within 3·√N of the expected N, three standard deviations of a Poisson count; the
    // blue-noise sampler's counts vary less, so the bound is conservative. A sampler ignoring the map
    // would put 1.9/4 of the centres on the left instead of 1.9/8.1: about 19 σ off at these counts.
    const density = 100;
    const { tufts } = groomOn(mesh, { ...PLANE, guides: { density: 600, length: 0.05, tufts: { density } }, maps: [encodeMap('tuftDensity', halves(1, 3), mesh, 8)] });
    // Weighted area (cm²): 0.95 × 2 at 1×, the blended strip 0.05 × 2 at a mean of 2×, 1 × 2 at 3×.
    const weighted = 0.95 * 2 * 1 + 0.05 * 2 * 2 + 1 * 2 * 3;
    expect(tufts!.centres).toBe(Math.round(density * weighted));
    const n = tufts!.curves.length / (3 * tufts!.centres);
    let left = 0, right = 0;
    for (let c = 0; c < tufts!.centres; c++) {
      const x = tufts!.curves[3 * n * c];
      if (x < -0.05) left++;
      else if (x > 0) right++;
    }
    const expectLeft = (tufts!.centres * 0.95 * 2) / weighted, expectRight = (tufts!.centres * 1 * 2 * 3) / weighted;
    expect(Math.abs(left - expectLeft)).toBeLessThanOrEqual(3 * Math.sqrt(expectLeft));
    expect(Math.abs(right - expectRight)).toBeLessThanOrEqual(3 * Math.sqrt(expectRight));
    // Per area the 3× half holds three times the centres of the 1× half, within the same tolerance.
    expect(Math.abs(right / 2 / (left / 1.9) - 3)).toBeLessThan(3 * (3 * Math.sqrt(1 / expectLeft + 1 / expectRight)));
  });

  it('counts inner tuft centres by the inner-tuft-density map over the weighted area', () => {
    const { tufts } = groomOn(mesh, { ...PLANE, guides: { density: 600, length: 0.05, tufts: { density: 20, inner: { density: 80 } } }, maps: [encodeMap('innerTuftDensity', halves(1, 3), mesh, 8)] });
    expect(tufts!.centres).toBe(80);
    expect(tufts!.innerCentres).toBe(Math.round(80 * (0.95 * 2 + 0.05 * 2 * 2 + 2 * 3)));
  });

  it('grows no tufts, and finite guides, where a tuft-density map of 0 leaves the outer level no centre', () => {
    const spec: GroomSpecInput = { ...PLANE, guides: { density: 300, length: 0.1, tufts: { density: 20, inner: { density: 60 } } }, maps: [encodeMap('tuftDensity', halves(0, 0), mesh, 8)] };
    const { guides, tufts } = groomOn(mesh, spec);
    expect(tufts!.centres).toBe(0);
    expect(tufts!.innerCentres).toBe(0);
    expect(guides.tuft.every((t) => t === -1)).toBe(true);
    expect(guides.innerTuft.every((t) => t === -1)).toBe(true);
    expect(guides.points.every(Number.isFinite)).toBe(true);
  });

  it('leaves no loner where the loners map is 0, keeps the spec’s share where it is 1×, and caps the share at 1', () => {
    const spec: GroomSpecInput = { ...PLANE, guides: { density: 300, length: 0.05, tufts: { density: 20, loners: 0.4 } } };
    const count = (map: Float64Array) => {
      const grown = groomOn(mesh, { ...spec, maps: [encodeMap('loners', map, mesh, 8)] }).guides;
      const out = { left: 0, leftLoners: 0, right: 0, rightLoners: 0 };
      for (let g = 0; g < grown.count; g++) {
        const side = sideOfFace(grown.rootFace[g]);
        if (side === 'strip') continue;
        out[side]++;
        if (grown.tuft[g] < 0) out[side === 'left' ? 'leftLoners' : 'rightLoners']++;
      }
      return out;
    };
    const zeroLeft = count(halves(0, 1));
    expect(zeroLeft.left).toBeGreaterThan(100);
    expect(zeroLeft.leftLoners).toBe(0);
    // At 1× the share is the spec's 0.4: 3 standard deviations of a binomial count (our tolerance).
    const sd = Math.sqrt(zeroLeft.right * 0.4 * 0.6);
    expect(Math.abs(zeroLeft.rightLoners - 0.4 * zeroLeft.right)).toBeLessThanOrEqual(3 * sd);
    // 0.4 × 5 is capped at a share of 1: every guide there is a loner.
    const capped = count(halves(1, 5));
    expect(capped.rightLoners).toBe(capped.right);
  });

  it('changes tip widths only with a tip-width map: root widths and points as before, tips × the map at the root', () => {
    const spec: GroomSpecInput = { ...PLANE, guides: { count: 300, length: 0.1, width: 0.01, tipWidth: 0.004 } };
    const values = halves(0.5, 2.5);
    const plain = groomOn(mesh, spec).guides;
    const mapped = groomOn(mesh, { ...spec, maps: [encodeMap('tipWidth', values, mesh, 16)] }).guides;
    expect(mapped.guideRootWidth).toEqual(plain.guideRootWidth);
    expect(bytes(mapped.points).equals(bytes(plain.points))).toBe(true);
    for (let g = 0; g < mapped.count; g++) {
      const f = mapped.rootFace[g];
      const factor = [0, 1, 2].reduce((s, k) => s + mapped.rootBarycentric[3 * g + k] * values[mesh.triangles[3 * f + k]], 0);
      expect(mapped.guideTipWidth[g]).toBeCloseTo(0.004 * factor, 12);
    }
  });

  it('stops the inner tufts closing into their tuft where the inner-gather map is 0', () => {
    // With the outer gather at 1 at the tip, an inner centre curve's tip lies on its tuft's curve;
    // at an inner gather of 0 it stays where it grew. Guides are drawn fully onto their inner
    // curve (inner gather tip 1), so the guides' tips show where the inner curves end.
    const spec: GroomSpecInput = { ...PLANE, guides: { density: 300, length: 0.2, jitter: 0.5, tufts: { density: 10, gather: { root: 0, tip: 1 }, inner: { density: 40, gather: { root: 0, tip: 1 } } } } };
    const plain = groomOn(mesh, spec).guides;
    const loose = groomOn(mesh, { ...spec, maps: [encodeMap('innerGather', halves(0, 1), mesh, 8)] }).guides;
    const n = plain.pointsPerGuide;
    const tipMoved = (g: number) => Math.hypot(...[0, 1, 2].map((k) => loose.points[3 * (g * n + n - 1) + k] - plain.points[3 * (g * n + n - 1) + k]));
    let leftMoved = 0, rightMoved = 0;
    for (let g = 0; g < plain.count; g++) {
      const side = sideOfFace(plain.rootFace[g]);
      if (side === 'left' && tipMoved(g) > 1e-9) leftMoved++;
      if (side === 'right' && tipMoved(g) > 1e-9) rightMoved++;
    }
    expect(leftMoved).toBeGreaterThan(0);
    // Right of the middle the map is 1× at every inner centre whose face lies there; only guides of
    // inner tufts rooted on the left (or in the strip) can move.
    expect(rightMoved).toBeLessThan(leftMoved);
  });
});
