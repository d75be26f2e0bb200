import type { Metadata } from 'next';
import { GroomEditor } from '@/components/studio/editor/GroomEditor';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Groom editor' };

export default async function GroomEditorPage({ params }: { params: Promise<{ groomId: string }> }) {
  await requireArea('studio');
  const { groomId } = await params;
  return <GroomEditor groomId={groomId} />;
}
