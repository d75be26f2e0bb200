// The studio's background work on the process's job queue (lib/platform/jobs.ts): surface checks,
// exports, thumbnails, moves of grooms between surfaces, and the hourly sweep of abandoned uploads; its workers are in lib/studio/workers.ts.
import type PgBoss from 'pg-boss';
import { expiryOf, jobQueue, type JobBudget } from '../platform/jobs';

export const EXPORT_QUEUE = 'studio-export';
export const THUMBNAIL_QUEUE = 'studio-thumbnail';
export const UPLOAD_SWEEP_QUEUE = 'studio-upload-sweep';
export const SURFACE_CHECK_QUEUE = 'studio-surface-check';
export const SURFACE_MOVE_QUEUE = 'studio-surface-move';
/** When abandoned uploads are swept: hourly. */
export const UPLOAD_SWEEP_CRON = '23 * * * *';

export type ExportJobData = { exportId: string };
export type SurfaceCheckJobData = { surfaceId: string };
export type SurfaceMoveJobData = { moveId: string };
/** Without `versionId`, the groom's saved spec is rendered; with it, that version's spec. */
export type ThumbnailJobData = { groomId: string; versionId?: string };

/**
 * Time and memory each heavy job may use (the worker runs it in a child process and stops it
 * past either). The heaviest spec the groom spec allows (lib/groom/README.md, "Budgets") grows
 * and writes in well under both on one core; the memory is what that spec's typed arrays, the
 * surface and the written file need, with Node's own ~100 MB on top.
 */
export const EXPORT_BUDGET: JobBudget = { seconds: 10 * 60, memoryMb: 1536 };
/**
 * A thumbnail grows a bounded sample of guides, but solves the whole field first: on a surface at
 * the face limit that is most of its memory (a 1,000,000-face sphere peaks at about 1 GB in Node).
 */
export const THUMBNAIL_BUDGET: JobBudget = { seconds: 3 * 60, memoryMb: 2048 };
/** Two surfaces read and prepared (each up to the face limit) and a spec carried from one to the other. */
export const SURFACE_MOVE_BUDGET: JobBudget = { seconds: 5 * 60, memoryMb: 2048 };
/** Reading and checking a surface of up to 200 MB and 2,000,000 faces, with its thumbnail and starting spec. */
export const SURFACE_CHECK_BUDGET: JobBudget = { seconds: 5 * 60, memoryMb: 1536 };

// A job is only tried again when its worker vanished (the job expired): the handlers record every
// failure they meet on the export itself and end the job.
const STUDIO_QUEUES: PgBoss.Queue[] = [
  { name: EXPORT_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: expiryOf(EXPORT_BUDGET) },
  { name: THUMBNAIL_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: expiryOf(THUMBNAIL_BUDGET) },
  { name: UPLOAD_SWEEP_QUEUE, retryLimit: 0, expireInSeconds: 10 * 60 },
  { name: SURFACE_CHECK_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: expiryOf(SURFACE_CHECK_BUDGET) },
  { name: SURFACE_MOVE_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: expiryOf(SURFACE_MOVE_BUDGET) },
];

/** The job queue of this process, with the studio's queues made. */
export function studioBoss(): Promise<PgBoss> {
  return jobQueue('studio', STUDIO_QUEUES);
}

export async function enqueueExport(data: ExportJobData): Promise<void> {
  await (await studioBoss()).send(EXPORT_QUEUE, data);
}

/** Queues the working out of a groom's move onto another surface. */
export async function enqueueSurfaceMove(data: SurfaceMoveJobData): Promise<void> {
  await (await studioBoss()).send(SURFACE_MOVE_QUEUE, data);
}

/** Queues the check of a registered surface. */
export async function enqueueSurfaceCheck(data: SurfaceCheckJobData): Promise<void> {
  await (await studioBoss()).send(SURFACE_CHECK_QUEUE, data);
}

/**
 * Queues a thumbnail. A thumbnail is a picture of work already saved, so a queue that cannot be
 * reached is logged rather than failing the save that asked for it.
 */
export async function enqueueThumbnail(data: ThumbnailJobData): Promise<void> {
  try {
    await (await studioBoss()).send(THUMBNAIL_QUEUE, data);
  } catch (error) {
    console.error(`[studio] thumbnail of groom ${data.groomId} not queued: ${(error as Error).message}`);
  }
}
