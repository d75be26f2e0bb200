import type { Metadata } from 'next';
import { PracticeEditor } from '@/components/studio/editor/PracticeEditor';
import { requireArea } from '@/lib/accounts/session';

export const metadata: Metadata = { title: 'Practice groom' };

export default async function PracticeGroomPage({ params }: { params: Promise<{ demoId: string }> }) {
  await requireArea('studio');
  const { demoId } = await params;
  return <PracticeEditor demoId={demoId} />;
}
