// The package's README explains the files the package holds and no others, and promises only
// what Whorlwind does (fitting from the library, not the studio, which is a groomer's).
import { describe, expect, it } from 'vitest';
import { packageReadme, type ReadmeFacts } from '@/lib/market/package-readme';

const FACTS: ReadmeFacts = {
  title: 'Loop plush nap',
  description: 'Short plush pile for a ring toy.',
  sellerName: 'A seller',
  groomName: 'Loop',
  versionNumber: 2,
  versionName: 'plush',
  priceCents: 2000,
  currency: 'eur',
  licenceTitle: 'A licence',
  guideCount: 1234,
  taxNote: 'A tax note.',
};

/** Every file a package can hold, as lib/market/assets.ts names them. */
const ALL = ['guides.usda', 'guides-bspline.usda', 'guides.gltf', 'guides.glb', 'guides.obj', 'groom-spec.json', 'field.ply'];
/** Every name or extension of an export file the README could mention. */
const MENTION = /[\w-]*\.(usda|gltf|glb|obj|json|ply)\b/g;

function subsets<T>(items: readonly T[]): T[][] {
  return Array.from({ length: 1 << items.length }, (_, mask) => items.filter((_, i) => mask & (1 << i)));
}

describe('the package README', () => {
  it('mentions exactly the files of the package, for every choice of formats', () => {
    for (const files of subsets(ALL).filter((set) => set.length > 0)) {
      const text = packageReadme(FACTS, files);
      const mentioned = new Set(text.match(MENTION) ?? []);
      expect([...mentioned].sort(), files.join(', ')).toEqual([...files].sort());
      for (const file of files) expect(text).toMatch(new RegExp(`^- ${file.replace('.', '\\.')} — `, 'm'));
    }
  });

  it('no longer explains .obj and field.ply when the package has only USD and the spec (the case a buyer tripped over)', () => {
    const text = packageReadme(FACTS, ['guides.usda', 'groom-spec.json']);
    expect(text).not.toMatch(/\.obj|field\.ply|\.gltf|\.glb/);
  });

  it('says the buyer fits the preset from their library, and does not send them to the studio', () => {
    const text = packageReadme(FACTS, ['guides.usda', 'groom-spec.json']);
    expect(text).toContain('From your library, you can fit this preset to a surface of your own');
    expect(text).not.toMatch(/studio/i);
  });

  it('names a file it has no words for without inventing any', () => {
    const text = packageReadme(FACTS, ['guides.usda', 'surface.bin']);
    expect(text).toMatch(/^- surface\.bin$/m);
  });
});
