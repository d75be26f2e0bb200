// Every area's jobs, in the one list that the job-worker process and its children share.
import type { AreaJobs, JobKind } from '../../lib/platform/jobs';
import { STUDIO_JOBS } from '../../lib/studio/workers';
import { MARKET_JOBS } from '../../lib/market/workers';

export const AREAS: AreaJobs[] = [STUDIO_JOBS, MARKET_JOBS];

export function jobKind(queue: string): JobKind | undefined {
  return AREAS.flatMap((area) => area.kinds).find((kind) => kind.queue === queue);
}
