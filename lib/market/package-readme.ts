// The README.txt of a listing's package. It explains the files the package holds and no others (a
// package carries only the formats the seller chose), and promises only what Whorlwind does: the
// buyer fits the preset to a surface of their own from their library; the studio is a groomer's.
import { formatPrice } from './vocabulary';

export type ReadmeFacts = {
  title: string;
  description: string;
  sellerName: string;
  groomName: string;
  versionNumber: number | null;
  versionName: string | null;
  priceCents: number;
  currency: string;
  licenceTitle: string;
  guideCount: number;
  taxNote: string;
};

/** What a file of a package is, by its name; a name not known here is listed without words. */
const EXPLANATIONS: readonly (readonly [test: (name: string) => boolean, words: string])[] = [
  [(name) => name.startsWith('surface/'), 'the seller’s growth surface, as uploaded (shipped because the seller ticked that they may publish it); the guides’ files carry it too, as /Groom/Surface in USD, with each guide’s root polygon and barycentric position on it.'],
  [(name) => name === 'guides-bspline.usda', 'the guides as one OpenUSD BasisCurves prim at /Groom/Guides, cubic B-spline, with widths; the stage’s metersPerUnit and upAxis follow the spec.'],
  [(name) => name.endsWith('.usda'), 'the guides as one OpenUSD BasisCurves prim at /Groom/Guides, linear, with widths; the stage’s metersPerUnit and upAxis follow the spec.'],
  [(name) => name.endsWith('.gltf') || name.endsWith('.glb'), 'the guides as glTF 2.0 line strips, positions in metres, +Y up.'],
  [(name) => name.endsWith('.obj'), 'one polyline per guide, in the spec’s units.'],
  [(name) => name === 'groom-spec.json', 'the Whorlwind groom spec: the field’s features, guide settings and pins. Its places are points in space, snapped to the nearest vertex of the surface it is used on.'],
  [(name) => name.endsWith('.ply'), 'the direction field on the seller’s growth surface: per-face and per-vertex unit directions (dx dy dz).'],
];

function explain(name: string): string {
  const found = EXPLANATIONS.find(([test]) => test(name));
  return found ? `- ${name} — ${found[1]}` : `- ${name}`;
}

/**
 * The README of a package holding `files` (besides LICENCE.txt and README.txt, which it always
 * names). Guarantees: every file it explains is in `files`, in that order; it mentions no file
 * name that is not there.
 */
export function packageReadme(facts: ReadmeFacts, files: readonly string[]): string {
  const version = facts.versionNumber ? `version ${facts.versionNumber}${facts.versionName ? ` (“${facts.versionName}”)` : ''}` : 'a saved version';
  const hasSpec = files.includes('groom-spec.json');
  return `${facts.title}
${'='.repeat(Math.min(facts.title.length, 72))}

A Whorlwind preset by ${facts.sellerName}, made from ${version} of the groom “${facts.groomName}”.
Price when bought: ${formatPrice(facts.priceCents, facts.currency)}.

${facts.description}

What is in this package
${files.map(explain).join('\n')}
- LICENCE.txt — ${facts.licenceTitle}, in full: what you may and may not do with these files.
- README.txt — this file.

${facts.guideCount.toLocaleString('en-GB')} guide curves, grown from the groom spec on the seller's growth surface.

On your own character
From your library, you can fit this preset to a surface of your own${hasSpec ? '; the spec in this package is what it is fitted from' : ''}.

${facts.taxNote}
`;
}
