import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { GroomEditor } from '@/components/studio/editor/GroomEditor';
import { requireArea } from '@/lib/auth';
import { StudioError } from '@/lib/studio/errors';
import { getGroom } from '@/lib/studio/grooms';

export const metadata: Metadata = { title: 'Groom editor' };

export default async function GroomEditorPage({ params }: { params: Promise<{ groomId: string }> }) {
  const session = await requireArea('studio');
  const { groomId } = await params;
  // Another groomer's groom is as unknown as a missing one.
  if (!z.uuid().safeParse(groomId).success) notFound();
  try {
    const groom = await getGroom({ userId: session!.user.id }, groomId.toLowerCase());
    return <GroomEditor groom={groom} />;
  } catch (error) {
    if (error instanceof StudioError && error.status === 404) notFound();
    throw error;
  }
}
