// The studio's jobs as a job-worker process (services/jobs-worker.ts) runs them: surface checks,
// exports, thumbnails and moves of grooms between surfaces are heavy (each in a child process with a time and memory budget, one at a time per
// queue and worker), the hourly sweep of abandoned uploads and transfers is light.
import type { AreaJobs, JobKind } from '../platform/jobs';
import { db } from '../platform/db';
import type { ExportJobData, SurfaceCheckJobData, SurfaceMoveJobData, ThumbnailJobData } from './jobs';
import { EXPORT_BUDGET, EXPORT_QUEUE, studioBoss, SURFACE_CHECK_BUDGET, SURFACE_CHECK_QUEUE, SURFACE_MOVE_BUDGET, SURFACE_MOVE_QUEUE, THUMBNAIL_BUDGET, THUMBNAIL_QUEUE, UPLOAD_SWEEP_CRON, UPLOAD_SWEEP_QUEUE } from './jobs';
import { runExport } from './exports';
import { sweepAbandonedUploads } from './surfaces';
import { renderGroomThumbnail } from './thumbnails';
import { checkRegisteredSurface, refuseSurface } from './surface-check';
import { failSurfaceMove, runSurfaceMove, sweepStaleSurfaceMoves } from './surface-change';

const surfaceCheckKind: JobKind<SurfaceCheckJobData> = {
  queue: SURFACE_CHECK_QUEUE,
  what: 'The check of the surface',
  lighter: 'A surface with fewer faces (decimated) is lighter to check.',
  pollingSeconds: 1,
  budget: SURFACE_CHECK_BUDGET,
  run: checkRegisteredSurface,
  fail: ({ surfaceId }, message) => refuseSurface(surfaceId, [{ code: 'check-stopped', severity: 'error', message, count: 1, examples: [], where: 'file' }]),
};

const exportKind: JobKind<ExportJobData> = {
  queue: EXPORT_QUEUE,
  what: 'The export',
  lighter: 'Fewer guides or fewer points per guide make it lighter.',
  pollingSeconds: 1,
  budget: EXPORT_BUDGET,
  run: runExport,
  // Only an export still under way is marked: one that finished before the stop keeps its file.
  fail: async ({ exportId }, message) => {
    await db()('groom_exports')
      .where({ id: exportId })
      .whereIn('status', ['queued', 'running'])
      .update({ status: 'failed', stage: 'failed', error: message, updated_at: db().fn.now() });
  },
};

const surfaceMoveKind: JobKind<SurfaceMoveJobData> = {
  queue: SURFACE_MOVE_QUEUE,
  what: 'Carrying the groom over',
  lighter: 'Surfaces with fewer faces are lighter to carry a groom between.',
  pollingSeconds: 1,
  budget: SURFACE_MOVE_BUDGET,
  run: runSurfaceMove,
  fail: failSurfaceMove,
};

// A thumbnail has no row of its own to mark: the groom keeps its previous picture.
const thumbnailKind: JobKind<ThumbnailJobData> = {
  queue: THUMBNAIL_QUEUE,
  what: 'The thumbnail',
  lighter: 'Fewer guides or fewer points per guide make it lighter.',
  pollingSeconds: 1,
  budget: THUMBNAIL_BUDGET,
  run: renderGroomThumbnail,
};

const sweepKind: JobKind<unknown> = {
  queue: UPLOAD_SWEEP_QUEUE,
  what: 'The sweep of abandoned uploads and transfers',
  pollingSeconds: 60,
  run: async () => {
    const swept = await sweepAbandonedUploads();
    if (swept > 0) console.log(`[studio] removed ${swept} upload(s) that were never registered`);
    const moves = await sweepStaleSurfaceMoves();
    if (moves > 0) console.log(`[studio] removed ${moves} transfer(s) of grooms that nobody took`);
  },
};

export const STUDIO_JOBS: AreaJobs = {
  area: 'studio',
  boss: studioBoss,
  kinds: [surfaceCheckKind, exportKind, thumbnailKind, surfaceMoveKind, sweepKind],
  // One schedule for all processes: pg-boss keeps it by queue name and sends each slot once.
  onStart: async (boss) => {
    await boss.schedule(UPLOAD_SWEEP_QUEUE, UPLOAD_SWEEP_CRON);
  },
};
