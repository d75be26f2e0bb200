import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { GroomEditor } from '@/components/studio/editor/GroomEditor';
import { requireArea } from '@/lib/accounts/session';
import { StudioError } from '@/lib/studio/errors';
import { getGroom } from '@/lib/studio/grooms';
import { pathId } from '@/lib/studio/http';

export const metadata: Metadata = { title: 'Groom editor' };

export default async function GroomEditorPage({ params }: { params: Promise<{ groomId: string }> }) {
  const session = await requireArea('studio');
  try {
    const groom = await getGroom({ userId: session!.user.id }, await pathId(params, 'groomId', 'groom'));
    return <GroomEditor groom={groom} />;
  } catch (error) {
    // Another groomer's groom, or an address that cannot be a groom, is as unknown as a missing one.
    if (error instanceof StudioError && error.status === 404) notFound();
    throw error;
  }
}
