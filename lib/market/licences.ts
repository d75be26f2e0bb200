// The market's own licence texts. A seller picks one for each listing; the buyer sees it in full
// before paying, and the package carries it as LICENCE.txt. Seeded by db/seeds/*market* (upsert
// by slug), read from the database by everything else. The three levels are named after how much
// of an animal the fur covers — a tuft (one person), a pelt (one studio), a herd (a whole company) —
// Whorlwind's own names rather than the tiers other asset stores use.
import { db } from '../platform/db';
import type { Licence } from './types';

export type LicenceText = { slug: string; title: string; summary: string; body: string; position: number };

const NOT_LEGAL_ADVICE =
  'This licence is written in plain words by Whorlwind for its market. It is not legal advice. ' +
  'The law of the place where the buyer lives or works governs it; where a term here cannot apply ' +
  'under that law, the rest still does. If the work matters a lot, ask a lawyer where you are.';

const COMMON_TERMS = `What every Whorlwind licence says

- "The preset" is what the package holds: the groom spec, the guide curves and field files made from it, and its pictures.
- "Your work" is anything you make with the preset: renders, films, games, characters, grooms you change or build on it.
- You may change the preset as much as you like, and use it on your own growth surfaces.
- You may not sell, share or give away the preset itself, or a copy of it changed only a little, as a preset, an asset pack or files others can download and reuse. That holds for the files as they are and for anything that would let someone rebuild them (for example the spec, the guides or the field, exported again).
- Guide curves, hair and fur in your finished work — baked into a render, a film, a shipped game, an interactive character whose files are not offered for reuse — are your work and need no further permission.
- The seller keeps the copyright of the preset. Buying it gives you the right to use it as this licence says, not ownership.
- The preset comes as it is. The seller and Whorlwind promise that it is what the listing shows, and nothing about fitness for a purpose beyond that. A purchase refunded by Whorlwind ends this licence: stop using the preset in new work.
- The licence lasts for ever for work made while it held.`;

export const LICENCE_TEXTS: readonly LicenceText[] = [
  {
    slug: 'tuft',
    title: 'Tuft licence',
    position: 1,
    summary: 'One person, for their own projects, portfolio and learning — including paid freelance work they do alone.',
    body: `Tuft licence

Who: the one person who bought the preset.

What you may do
- Use the preset in your own projects, your portfolio, showreels, courses you take and tutorials you make (show it, do not hand out the files).
- Use it in paid work you do alone as a freelancer, for any number of clients.
- Install it on the computers you use yourself.

What you may not do
- Let other people use the files: colleagues, a team, a studio, a client's artists. Each of them needs their own licence, or your employer needs a Pelt or Herd licence.

${COMMON_TERMS}

${NOT_LEGAL_ADVICE}`,
  },
  {
    slug: 'pelt',
    title: 'Pelt licence',
    position: 2,
    summary: 'One company or studio, up to 20 people, any number of productions.',
    body: `Pelt licence

Who: one company, studio or school (one legal entity) and up to 20 people working for it at the same time, employed or contracted.

What you may do
- Use the preset in any number of productions of that company: films, series, games, commercials, client work.
- Share the files on the company's own systems among those people, and with contractors while they work on the company's productions.

What you may not do
- Pass the files to another company, including a client or a co-producer, unless they buy their own licence. Sending them your finished work is fine.
- Use it with more than 20 people at a time: for more, buy the Herd licence.

${COMMON_TERMS}

${NOT_LEGAL_ADVICE}`,
  },
  {
    slug: 'herd',
    title: 'Herd licence',
    position: 3,
    summary: 'One company and all its people and sites, any number of productions, including the groom inside shipped interactive work.',
    body: `Herd licence

Who: one company or group of companies under the same ownership, all its people and sites, and the contractors working on its productions.

What you may do
- Everything the Pelt licence allows, with no limit on people or sites.
- Ship the preset's guide curves inside an interactive product (a game, an app, a real-time character) in the product's own packed format, as long as they are not offered to its users as reusable files.
- Give the files to outside companies that work with you on a production, for use in that production only.

What you may not do
- Sell or give away the preset as a preset or an asset, on its own or in a pack.

${COMMON_TERMS}

${NOT_LEGAL_ADVICE}`,
  },
];

/** The licences a listing can carry, in the order they are offered. */
export async function listLicences(): Promise<Licence[]> {
  return db()('licences').select('id', 'slug', 'title', 'summary', 'body').orderBy('position');
}
