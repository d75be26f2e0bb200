// The studio's guide sets: the colours they are drawn in, the name and settings a new one starts
// with, and each guide's colour on the stage.
import type { GroomSpec, GuideSetSpec } from '@/lib/groom/spec/spec';
import type { GrownGuides } from './protocol';

/**
 * Whorlwind's own palette for guide sets, root colour and tip colour each (our choice: hues far
 * enough apart to tell six sets apart on the pale surface, each darker at the root so the flow
 * still reads). Sets past the sixth take the colours again.
 */
export const GUIDE_SET_PALETTE: readonly { readonly name: string; readonly root: string; readonly tip: string }[] = [
  { name: 'Tarn', root: '#21474c', tip: '#9fd0c8' },
  { name: 'Bracken', root: '#7a3516', tip: '#f0a878' },
  { name: 'Gorse', root: '#6b5208', tip: '#f2d36b' },
  { name: 'Heather', root: '#4f2a5e', tip: '#d4a6e6' },
  { name: 'Moss', root: '#3a5220', tip: '#bfdc8f' },
  { name: 'Slate', root: '#2b3650', tip: '#a9b9e0' },
];

export function guideSetColour(index: number): (typeof GUIDE_SET_PALETTE)[number] {
  return GUIDE_SET_PALETTE[index % GUIDE_SET_PALETTE.length];
}

/**
 * The set the "Add a guide set" button makes: named "Set n" (the first n no set has), growing on
 * the whole surface with the settings of the set shown (or the groom's one block), so a new set
 * looks like its neighbour until it is changed.
 */
export function newGuideSet(spec: GroomSpec, like?: number): GuideSetSpec {
  const names = new Set(spec.guideSets?.map((set) => set.name) ?? []);
  let n = (spec.guideSets?.length ?? 1) + 1;
  while (names.has(`Set ${n}`)) n++;
  const model = spec.guideSets?.[like ?? 0]?.guides ?? { ...spec.guides, regions: [] };
  return { name: `Set ${n}`, region: { groups: [] }, guides: { ...model, regions: [] } };
}

/**
 * Each end point's colour (r, g, b in 0–1) for the guides' segments as `guideSegments` lays them
 * out: a set's root colour at the root shading to its tip colour at the tip. Null without sets
 * (the stage keeps its usual guide colours).
 */
export function guideSetColours(guides: Pick<GrownGuides, 'count' | 'pointsPerGuide' | 'sets'>): Float32Array | null {
  if (!guides.sets) return null;
  const n = guides.pointsPerGuide;
  const out = new Float32Array(6 * guides.count * (n - 1));
  let s = 0;
  guides.sets.forEach((set, i) => {
    const { root, tip } = guideSetColour(i);
    const a = rgb(root), b = rgb(tip);
    for (let g = 0; g < set.count; g++) {
      for (let k = 0; k + 1 < n; k++, s++) {
        for (const [end, t] of [[0, k / (n - 1)], [1, (k + 1) / (n - 1)]]) {
          for (let c = 0; c < 3; c++) out[6 * s + 3 * end + c] = a[c] + (b[c] - a[c]) * t;
        }
      }
    }
  });
  return out;
}

/** '#rrggbb' as linear r, g, b in 0–1, as three's Color reads a hex colour (the sRGB transfer function, IEC 61966-2-1), so set colours match the stage's others. */
function rgb(hex: string): [number, number, number] {
  const v = Number.parseInt(hex.slice(1), 16);
  const linear = (c: number) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
  return [linear(((v >> 16) & 255) / 255), linear(((v >> 8) & 255) / 255), linear((v & 255) / 255)];
}
