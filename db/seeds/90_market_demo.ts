// The market's licence texts (upserted by slug) and the demo's published presets: one listing per
// groom of the demo groomer (Wren at Quillmoor), from the groom's latest saved version.
// Runs after the accounts and studio seeds (its name sorts after theirs). With no studio grooms
// yet, it says so and seeds only the licences. Idempotent: a groom version already listed is left
// as it is. Pictures and packages are made by the market's job workers when the app first serves
// the market (the seed has no object storage at hand).
import type { Knex } from 'knex';
import { DEMO_ACCOUNTS } from '../demo-scenario';
import { LICENCE_TEXTS } from '../../lib/market/licences';

type DemoOffer = { match: RegExp; animal: string; coatLength: string; style: string; bodyRegion: string; priceCents: number; licence: string; description: string };

// What Quillmoor asks for its three characters' coats (matched on the groom's name).
const OFFERS: DemoOffer[] = [
  {
    match: /bramble|fox/i,
    animal: 'fox',
    coatLength: 'medium',
    style: 'stylised',
    bodyRegion: 'head',
    priceCents: 2400,
    licence: 'pelt',
    description:
      'Autumn fox head coat: fur streams back from the nose, over a clockwise cowlick on the crown, to an inflow whorl at the nape; long tufts on the ears. Balanced index budget, guides on muzzle, ears and crown.',
  },
  {
    match: /brisquette|cat/i,
    animal: 'cat',
    coatLength: 'short',
    style: 'natural',
    bodyRegion: 'full-body',
    priceCents: 3900,
    licence: 'pelt',
    description:
      'A short velvet cat coat (about 1.2 cm) for a long-bodied cat: a parting runs down the spine so the nap lies away on both flanks, meeting crosswise at a saddle on the chest. A close, sleek look.',
  },
  {
    match: /loop|ring|plush/i,
    animal: 'toy',
    coatLength: 'long',
    style: 'plush',
    bodyRegion: 'full-body',
    priceCents: 900,
    licence: 'tuft',
    description:
      'Long shaggy pile (about 14 mm on an 18 mm tube) for a ring-shaped toy (genus 1): one whorl and one saddle, the minimum a torus allows, with a loose curl wrapping round the tube. A good starting point for stuffed-toy characters.',
  },
];
const FALLBACK: Omit<DemoOffer, 'match'> = {
  animal: 'creature',
  coatLength: 'medium',
  style: 'natural',
  bodyRegion: 'full-body',
  priceCents: 1500,
  licence: 'tuft',
  description: 'A complete creature coat from the Quillmoor studio: direction field, guides and groom spec.',
};

export async function seed(knex: Knex) {
  await knex.transaction(async (trx) => {
    for (const licence of LICENCE_TEXTS) {
      await trx('licences').insert(licence).onConflict('slug').merge(['title', 'summary', 'body', 'position']);
    }
  });

  const studioReady = (await knex.raw(`SELECT to_regclass('public.groom_versions') IS NOT NULL AS present`)).rows[0]?.present;
  const groomer = DEMO_ACCOUNTS.find((account) => account.roles.includes('groomer'));
  if (!studioReady || !groomer) {
    console.log('[market seed] no studio tables yet: seeded the licences, no demo listings.');
    return;
  }
  const seller = await knex('users').where({ email: groomer.email }).first('id');
  const versions = await knex('grooms as g')
    .join('growth_surfaces as s', 's.id', 'g.surface_id')
    .join(
      knex('groom_versions').distinctOn('groom_id').orderBy([{ column: 'groom_id' }, { column: 'number', order: 'desc' }]).select('*').as('v'),
      'v.groom_id',
      'g.id',
    )
    .where('g.owner_id', seller?.id ?? null)
    .select('g.id as groom_id', 'g.name as groom_name', 'v.id as version_id', 'v.number', 'v.name as version_name', 'v.spec', 's.object_key', 's.file_name');
  if (versions.length === 0) {
    console.log(`[market seed] ${groomer.email} has no saved groom versions yet: seeded the licences, no demo listings.`);
    return;
  }
  const licences = new Map<string, string>((await knex('licences').select('slug', 'id')).map((row) => [row.slug, row.id]));
  let added = 0;
  await knex.transaction(async (trx) => {
    for (const version of versions) {
      const listed = await trx('listings').where({ groom_version_id: version.version_id }).first('id');
      if (listed) continue;
      const offer = OFFERS.find((candidate) => candidate.match.test(version.groom_name)) ?? FALLBACK;
      await trx('listings').insert({
        seller_id: seller.id,
        groom_id: version.groom_id,
        groom_version_id: version.version_id,
        groom_name: version.groom_name,
        version_number: version.number,
        version_name: version.version_name,
        spec: JSON.stringify(version.spec),
        // The studio's object; the first job run copies it under the listing's own prefix.
        surface_key: version.object_key,
        surface_file_name: version.file_name,
        title: version.groom_name,
        description: offer.description,
        animal: offer.animal,
        coat_length: offer.coatLength,
        style: offer.style,
        body_region: offer.bodyRegion,
        price_cents: offer.priceCents,
        currency: 'eur',
        licence_id: licences.get(offer.licence),
        formats: ['usda', 'glb', 'obj', 'json'],
        state: 'published',
        submitted_at: trx.fn.now(),
        decided_at: trx.fn.now(),
        published_at: trx.fn.now(),
      });
      added += 1;
    }
  });
  console.log(`[market seed] ${added} demo listing(s) published from ${groomer.email}'s grooms (${versions.length - added} already listed).`);
}
