// A listing's facts in words, for its page and its tile: units written out, numbers rounded as a
// reader compares them (three significant digits, whole numbers from 100 up).
import type { ListingFacts } from '@/lib/market/types';

export const UNIT_NAMES: Record<ListingFacts['units'], string> = { mm: 'millimetres', cm: 'centimetres', m: 'metres', in: 'inches' };

/** 2.2 → "2.2", 0.45678 → "0.457", 1234.5 → "1,235". */
export function amount(value: number): string {
  if (Math.abs(value) >= 100) return Math.round(value).toLocaleString('en-GB');
  return String(Number(value.toPrecision(3)));
}

const plural = (count: number, one: string, many: string) => `${count.toLocaleString('en-GB')} ${count === 1 ? one : many}`;
const names = (list: readonly string[]) => list.map((name) => `“${name}”`).join(', ');

/** "1.6–2.4 cm", or "2 cm" when every guide is as long. */
export function lengthRange(facts: ListingFacts): string {
  const { shortest, longest } = facts.length;
  const [low, high] = [amount(shortest), amount(longest)];
  return `${low === high ? low : `${low}–${high}`} ${facts.units}`;
}

/** The listing's facts as term and value, in the order the page shows them. */
export function factRows(facts: ListingFacts): { term: string; value: string }[] {
  const { surface, regions, transfer } = facts;
  const surfaceRegions = regions.surface.length > 0 ? `the seller’s surface has ${names(regions.surface)}` : 'the seller’s surface names no regions';
  return [
    { term: 'Units', value: `${UNIT_NAMES[facts.units]} (${facts.units})` },
    { term: 'Up axis', value: `+${facts.upAxis.toUpperCase()} up` },
    {
      term: 'Density',
      value: `${amount(facts.guidesPerCm2)} guides per cm², ${plural(facts.hairsPerGuide, 'hair', 'hairs')} per guide (${amount(facts.hairsPerCm2)} hairs per cm²)`,
    },
    { term: 'Guide lengths', value: `${lengthRange(facts)}, typically ${amount(facts.length.median)} ${facts.units} (combed length ${amount(facts.length.combed)} ${facts.units})` },
    { term: 'Points per guide', value: facts.pointsPerGuide.toLocaleString('en-GB') },
    {
      term: 'Grows on',
      value: regions.expected.length > 0 ? `the regions ${names(regions.expected)} (${surfaceRegions})` : `the whole surface (${surfaceRegions})`,
    },
    {
      term: 'Seller’s surface',
      value: [
        plural(surface.faces, 'triangle', 'triangles'),
        surface.genus === null ? 'genus not defined' : `genus ${surface.genus}`,
        surface.openings === null ? 'openings not defined' : surface.openings === 0 ? 'closed, no openings' : plural(surface.openings, 'opening', 'openings'),
        plural(surface.pieces, 'piece', 'pieces'),
        !surface.uvs ? 'no UVs' : surface.uvOverlappingFaces > 0 ? `UVs, ${plural(surface.uvOverlappingFaces, 'triangle overlaps', 'triangles overlap')}` : 'UVs',
      ].join(' · '),
    },
    {
      term: 'Onto your character',
      value: transfer.uv
        ? 'by UV (your surface needs UVs that do not overlap) or by alignment of the two surfaces'
        : `by alignment of the two surfaces (not by UV: the seller’s surface has ${surface.uvs ? 'overlapping UVs' : 'no UVs'})`,
    },
    { term: '3D preview', value: `${plural(facts.preview.guides, 'guide', 'guides')}, ${facts.preview.pointsPerGuide} points each` },
  ];
}
