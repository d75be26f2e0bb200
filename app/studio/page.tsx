import type { Metadata } from 'next';
import { AreaIntro } from '@/components/areas/AreaIntro';
import { accountSummary } from '@/lib/accounts';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Studio' };

export default async function StudioPage() {
  const session = await requireArea('studio');
  const account = session && (await accountSummary(session.user.id));
  return (
    <AreaIntro
      areaId="studio"
      upcoming={[
        'Upload a growth surface (OBJ, PLY, STL, glTF) and see what needs fixing before the field can be solved.',
        'Place whorls, saddles, partings, crests and flow strokes, with the index budget in view.',
        'Trace, shape and preview guides in 3D; export USD curves, glTF, OBJ and the groom spec.',
      ]}
    >
      <p className="rounded-2xl bg-lichen-pale px-5 py-4">
        {account?.studioName ? (
          <>
            Grooming for <strong>{account.studioName}</strong>.
          </>
        ) : (
          'Grooming on your own account.'
        )}
      </p>
    </AreaIntro>
  );
}
