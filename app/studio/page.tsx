import type { Metadata } from 'next';
import { StudioHome } from '@/components/studio/home/StudioHome';
import { accountSummary } from '@/lib/accounts/users';
import { requireArea } from '@/lib/accounts/session';
import { env } from '@/lib/platform/env';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { area } from '@/lib/accounts/roles';
import { listGrooms } from '@/lib/studio/grooms';
import { listSurfaces } from '@/lib/studio/surfaces';

export const metadata: Metadata = { title: 'Studio' };

export default async function StudioPage() {
  const session = await requireArea('studio');
  const groomer = { userId: session!.user.id };
  const [account, grooms, surfaces] = await Promise.all([accountSummary(groomer.userId), listGrooms(groomer), listSurfaces(groomer)]);
  return (
    <div className="flex flex-col gap-10">
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">Studio</h1>
        <p className="max-w-2xl text-lg text-loam-soft">
          {area('studio').summary} {account?.studioName ? `Grooming for ${account.studioName}.` : ''}
        </p>
      </div>
      <StudioHome
        maxBytes={env().SURFACE_MAX_BYTES}
        initialGrooms={{ grooms }}
        initialSurfaces={{ surfaces }}
        practice={DEMO_GROOMS.map(({ id, character, description }) => ({ id, character, description }))}
      />
    </div>
  );
}
