import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { EarlyFieldStart } from '@/components/studio/editor/EarlyFieldStart';
import { GroomEditor } from '@/components/studio/editor/GroomEditor';
import { actorOf } from '@/lib/accounts/actor';
import { requireArea } from '@/lib/accounts/session';
import { HttpError } from '@/lib/http/errors';
import { pathId } from '@/lib/http/server';
import { getGroom } from '@/lib/studio/grooms';
import { groomSurfaceSource } from '@/lib/studio/client/field-start';
import { env } from '@/lib/platform/env';
import { notFound as noSuch } from '@/lib/studio/errors';

export const metadata: Metadata = { title: 'Groom editor' };

export default async function GroomEditorPage({ params }: { params: Promise<{ groomId: string }> }) {
  const session = await requireArea('studio');
  try {
    const groom = await getGroom(actorOf(session!), await pathId(params, 'groomId', noSuch('groom')));
    return (
      <>
        <EarlyFieldStart source={groomSurfaceSource(groom)} boundary={groom.spec.field.boundary} />
        <GroomEditor groom={groom} maxUploadBytes={env().SURFACE_MAX_BYTES} />
      </>
    );
  } catch (error) {
    // Another groomer's groom, or an address that cannot be a groom, is as unknown as a missing one.
    if (error instanceof HttpError && error.status === 404) notFound();
    throw error;
  }
}
