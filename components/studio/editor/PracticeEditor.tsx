'use client';
// The editor on one of lib/groom's demo characters, built in the browser's field worker: for
// trying things out; nothing is saved.
import { useMemo } from 'react';
import { Notice } from '@/components/ui/Notice';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import type { SurfaceSource } from '@/lib/studio/client/protocol';
import { Workspace } from './Workspace';

/** The editor on one of the demo characters, built in the browser: for trying things out, nothing saved. */
export function PracticeEditor({ demoId }: { demoId: string }) {
  const demo = DEMO_GROOMS.find((d) => d.id === demoId);
  const source = useMemo<SurfaceSource>(() => ({ kind: 'demo', demoId }), [demoId]);
  const spec = useMemo(() => (demo ? parseGroomSpec(demo.spec) : null), [demo]);
  if (!demo || !spec) {
    return <Notice tone="error">There is no practice character called “{demoId}”.</Notice>;
  }
  return <Workspace title={`Practice: ${demo.character}`} subtitle={demo.description} source={source} initialSpec={spec} persistence={null} />;
}
