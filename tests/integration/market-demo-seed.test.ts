// The demo market, as a buyer browsing it sees it: each demo preset's coat-length tag agrees with
// the coat its title names ("short velvet" is short, "shaggy pile" long), which the seed used to
// contradict.
import { afterAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '@/db/demo-scenario';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import { closeDb, db } from '@/lib/platform/db';

afterAll(closeDb);

/** The coat length a title's words name (common grooming words), if any. */
function lengthNamed(title: string): string | undefined {
  if (/\b(short|velvet|close)\b/i.test(title)) return 'short';
  if (/\b(long|shaggy)\b/i.test(title)) return 'long';
  return undefined;
}

describe('the demo market', () => {
  it('tags each demo preset with the coat length its title names', async () => {
    const groomer = DEMO_ACCOUNTS.find((account) => account.roles.includes('groomer'))!;
    const seller = await db()('users').where({ email: groomer.email }).first('id');
    const listings = await db()('listings').where({ seller_id: seller.id, state: 'published' }).select('title', 'coat_length', 'description');
    const titled = DEMO_GROOMS.map((demo) => demo.spec.name!).filter((name) => lengthNamed(name));
    expect(titled.length).toBeGreaterThanOrEqual(2);
    for (const name of titled) {
      const listing = listings.find((row) => row.title === name);
      expect(listing, name).toBeDefined();
      expect(listing!.coat_length, name).toBe(lengthNamed(name));
      // The description does not say the opposite.
      expect(listing!.description.toLowerCase(), name).not.toContain(lengthNamed(name) === 'short' ? 'long-haired' : 'short plush');
    }
  });
});
