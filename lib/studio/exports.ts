// Exports: each format of lib/groom made by a background job from the spec as it was saved when
// the export was asked for, stored in object storage and downloaded through a short-lived
// presigned URL. The job reports its stage and progress on the export's row.
import { FieldError } from '../field';
import packageJson from '../../package.json';
import { EXPORT_FORMAT_FACTS, GroomError, parseGroomSpec, writeExport, type GroomSpec } from '../groom';
import { db } from '../platform/db';
import { fileSlug } from '../platform/file-names';
import { putObject } from '../platform/storage';
import type { ExportFormat, ExportJob, ExportStatus } from './types';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import type { Groomer } from '../accounts/actor';
import { enqueueExport, type ExportJobData } from './jobs';
import { growStoredSpec, solveStoredSpec, type StageReport } from './grow';
import { presignDownload } from '../platform/storage';
import { deleteOrphanedObjects, STUDIO_URL_SECONDS } from './storage';
import { preparedSurface, surfaceMesh, type StoredSurfaceFile } from './surface-cache';

type ExportRow = {
  id: string;
  groom_id: string;
  format: ExportFormat;
  status: ExportStatus;
  progress: number;
  stage: string;
  error: string | null;
  spec: unknown;
  spec_revision: number;
  with_surface: boolean;
  file_name: string;
  object_key: string | null;
  created_at: Date;
};

/** The studio's file names say what an .obj or .ply file holds, as either extension could hold a mesh too. */
const FILE_CONTENT: Partial<Record<ExportFormat, string>> = { obj: 'guides', ply: 'field' };

const QUEUED = { stage: 'waiting in the queue', progress: 0 };
const WRITING = { stage: 'writing', progress: 0.85 };
const STORING = { stage: 'storing the file', progress: 0.95 };
const SERVER_FAILURE = 'The export could not be made because of a problem on the server. Try again; if it keeps failing, tell us.';

/**
 * "Bramble — autumn coat", revision 12, B-spline USD → "bramble-autumn-coat-r12-bspline.usda":
 * a file name any system accepts.
 */
function exportFileName(groomName: string, revision: number, format: ExportFormat): string {
  const { variant, extension } = EXPORT_FORMAT_FACTS[format];
  const words = [fileSlug(groomName, 80, 'groom'), `r${revision}`, variant ?? FILE_CONTENT[format]].filter(Boolean);
  return words.join('-') + extension;
}

async function exportJob(row: ExportRow): Promise<ExportJob> {
  return {
    id: row.id,
    groomId: row.groom_id,
    format: row.format,
    status: row.status,
    progress: row.progress,
    stage: row.stage,
    error: row.error,
    fileName: row.file_name,
    downloadUrl: row.status === 'done' && row.object_key ? await presignDownload(row.object_key, STUDIO_URL_SECONDS, row.file_name) : null,
    specRevision: row.spec_revision,
    withSurface: row.with_surface,
    createdAt: row.created_at.toISOString(),
  };
}

/**
 * Queues an export of the groom's saved spec; the copy taken now is what the file is made from.
 * `withSurface` writes the growth surface beside the guides where the format has guides.
 */
export async function requestExport(groomer: Groomer, groomId: string, format: ExportFormat, options: { withSurface?: boolean } = {}): Promise<ExportJob> {
  const groom = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).first('name', 'spec', 'revision');
  if (!groom) throw notFound('groom');
  const [row]: ExportRow[] = await db()('groom_exports')
    .insert({
      groom_id: groomId,
      format,
      status: 'queued',
      progress: QUEUED.progress,
      stage: QUEUED.stage,
      spec: JSON.stringify(groom.spec),
      spec_revision: groom.revision,
      with_surface: options.withSurface === true && EXPORT_FORMAT_FACTS[format].source === 'guides',
      file_name: exportFileName(groom.name, groom.revision, format),
    })
    .returning('*');
  try {
    await enqueueExport({ exportId: row.id });
  } catch (error) {
    console.error(`[studio] export ${row.id} not queued: ${(error as Error).message}`);
    await db()('groom_exports').where({ id: row.id }).delete();
    throw new HttpError(503, 'service-unavailable', 'The export could not be queued: the job queue is not reachable. Try again in a moment.');
  }
  return exportJob(row);
}

export async function getExport(groomer: Groomer, exportId: string): Promise<ExportJob> {
  const row: ExportRow | undefined = await db()('groom_exports as e')
    .join('grooms as g', 'g.id', 'e.groom_id')
    .where({ 'e.id': exportId, 'g.owner_id': groomer.userId })
    .first('e.*');
  if (!row) throw notFound('export');
  return exportJob(row);
}

/** Where a studio export came from, written into the file. */
type ExportOrigin = {
  groomId: string;
  specRevision: number;
  withSurface: boolean;
  /** The earlier sculpt the guides' roots are sampled on (see grooms.roots_surface_id), or null. */
  roots: StoredSurfaceFile | null;
};

async function specOnSurface(spec: GroomSpec, surface: StoredSurfaceFile) {
  return { spec, surface: await preparedSurface(surface, spec.field.boundary) };
}

/** The bytes of one format, from the spec saved on the export (solving and tracing only as far as the format needs). */
async function exportFile(format: ExportFormat, storedSpec: unknown, surface: StoredSurfaceFile, report: StageReport, origin: ExportOrigin): Promise<Uint8Array | string> {
  const { source } = EXPORT_FORMAT_FACTS[format];
  const made =
    // The spec is written with each place's position on the surface, so the job prepares it too.
    source === 'spec' ? await specOnSurface(parseGroomSpec(storedSpec), surface)
    : source === 'field' ? await solveStoredSpec(storedSpec, surface, report)
    : await growStoredSpec(storedSpec, surface, report, origin.roots ? { rootsFrom: await surfaceMesh(origin.roots) } : {});
  await report(WRITING);
  const provenance = { groomId: origin.groomId, specRevision: origin.specRevision, whorlwindVersion: packageJson.version };
  return writeExport(format, made, { withSurface: origin.withSurface, provenance });
}

/**
 * The export job. Makes the file, stores it and marks the export done; a spec that cannot be
 * solved marks it failed with lib/field's or lib/groom's words. An export whose groom was deleted
 * meanwhile is dropped, file and all.
 */
export async function runExport({ exportId }: ExportJobData): Promise<void> {
  const row = await db()('groom_exports as e')
    .join('grooms as g', 'g.id', 'e.groom_id')
    .join('growth_surfaces as s', 's.id', 'g.surface_id')
    .leftJoin('growth_surfaces as r', 'r.id', 'g.roots_surface_id')
    .where('e.id', exportId)
    .first('e.id', 'e.groom_id', 'e.format', 'e.status', 'e.spec', 'e.spec_revision', 'e.with_surface', 'e.file_name', 's.id as surface_id', 's.object_key', 's.file_name as surface_file_name', 'r.id as roots_id', 'r.object_key as roots_key', 'r.file_name as roots_file_name');
  if (!row || row.status === 'done') return;
  const update = (values: Record<string, unknown>) => db()('groom_exports').where({ id: exportId }).update({ ...values, updated_at: db().fn.now() });
  const report: StageReport = async ({ stage, progress }) => {
    await update({ status: 'running', stage, progress, error: null });
  };
  await report({ stage: 'starting', progress: 0.01 });
  try {
    const surface = { id: row.surface_id, objectKey: row.object_key, fileName: row.surface_file_name };
    const roots = row.roots_id ? { id: row.roots_id, objectKey: row.roots_key, fileName: row.roots_file_name } : null;
    const bytes = await exportFile(row.format, row.spec, surface, report, { groomId: row.groom_id, specRevision: row.spec_revision, withSurface: row.with_surface, roots });
    await report(STORING);
    const key = `exports/${row.groom_id}/${exportId}/${row.file_name}`;
    await putObject(key, bytes, EXPORT_FORMAT_FACTS[row.format as ExportFormat].mediaType);
    const stored = await update({ status: 'done', stage: 'done', progress: 1, object_key: key });
    if (stored === 0) await deleteOrphanedObjects([key]);
  } catch (error) {
    const known = error instanceof FieldError || error instanceof GroomError;
    if (!known) console.error(`[studio] export ${exportId} failed:`, error);
    await update({ status: 'failed', stage: 'failed', error: known ? (error as Error).message : SERVER_FAILURE });
  }
}
