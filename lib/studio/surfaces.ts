// Growth surfaces: a presigned upload straight to object storage, then registration — the file is
// copied to a key of its own (no upload URL names it, so a still-valid upload URL cannot swap the
// checked file), its size checked, and a surface row made in the state `checking`; the check by
// lib/field (reading, measuring, the thumbnail) is a job (surface-check.ts) that makes the row
// `ready` or `refused` with its problems. A groomer only ever sees their own surfaces.
import { randomUUID } from 'node:crypto';
import { PREPARED_EXTENSION, type ComponentFacts, type Problem } from '../field';
import { db } from '../platform/db';
import { env } from '../platform/env';
import { copyObject, getObjectBytes } from '../platform/storage';
import type { SurfaceDetail, SurfaceFileFormat, SurfaceState, SurfaceSummary, SurfaceUnits, UncheckedSurface, UploadTicket } from './types';
import { SURFACE_FORMATS } from './types';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import type { Groomer } from '../accounts/actor';
import { presignDownload } from '../platform/storage';
import { deleteOrphanedObjects, deleteStoredObjects, presignSurfaceUpload, storedObjectSize, STUDIO_URL_SECONDS } from './storage';
import { enqueueSurfaceCheck } from './jobs';

export type SurfaceRow = {
  id: string;
  owner_id: string;
  name: string;
  file_name: string;
  format: SurfaceFileFormat;
  units: SurfaceUnits;
  object_key: string;
  byte_size: string;
  state: SurfaceState;
  check_stage: string;
  check_progress: number;
  problems: Problem[];
  starting_spec: unknown;
  // The facts are null until the check has made the surface ready.
  vertex_count: number | null;
  face_count: number | null;
  component_count: number | null;
  boundary_loop_count: number | null;
  genus: number | null;
  euler_characteristic: number | null;
  area_cm2: number | null;
  groups: string[];
  components: ComponentFacts[] | null;
  /** Null on surfaces checked before UVs were read. */
  has_uvs: boolean | null;
  uv_overlap_fraction: number | null;
  warnings: Problem[];
  thumbnail_key: string | null;
  /** The surface's prepared form (lib/field's writePreparedSurface), written by the check; null before it existed or when writing it failed. */
  prepared_key: string | null;
  created_at: Date;
};

type UploadRow = { id: string; owner_id: string; file_name: string; format: SurfaceFileFormat; byte_size: string; object_key: string };

/** "200 MB", "1.5 kB" (decimal units, as file managers and the studio's pages show sizes). */
function describeBytes(bytes: number): string {
  const units = ['bytes', 'kB', 'MB', 'GB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit++;
  }
  return `${unit === 0 ? value : Number(value.toFixed(1))} ${units[unit]}`;
}

/** A size and the limit it exceeds, in bytes where rounding would make them read the same. */
function tooLarge(size: number, limit: number): string {
  const [sizeWords, limitWords] = describeBytes(size) === describeBytes(limit)
    ? [`${size.toLocaleString('en-US')} bytes`, `${limit.toLocaleString('en-US')} bytes`]
    : [describeBytes(size), describeBytes(limit)];
  return `The file is ${sizeWords}; growth surfaces may be at most ${limitWords}.`;
}

function formatOf(fileName: string): SurfaceFileFormat | null {
  const extension = fileName.slice(fileName.lastIndexOf('.') + 1).toLowerCase();
  return fileName.includes('.') && (SURFACE_FORMATS as readonly string[]).includes(extension) ? (extension as SurfaceFileFormat) : null;
}

/** A file name safe inside an object key: letters, digits, dot, dash and underscore. */
function keySafe(fileName: string): string {
  return fileName.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[.-]+/, '') || 'surface';
}

/** Hands out a presigned PUT for one surface file, after checking its name and size. */
export async function createSurfaceUpload(groomer: Groomer, input: { fileName: string; byteSize: number }): Promise<UploadTicket> {
  const format = formatOf(input.fileName);
  if (!format) {
    throw new HttpError(400, 'invalid-input', 'This kind of file cannot be a growth surface.', {
      fields: { fileName: `Upload an OBJ, PLY, STL, glTF or GLB file (.${SURFACE_FORMATS.join(', .')}).` },
    });
  }
  const maxBytes = env().SURFACE_MAX_BYTES;
  if (input.byteSize > maxBytes) {
    throw new HttpError(400, 'invalid-input', 'The file is too large.', {
      fields: { byteSize: `${tooLarge(input.byteSize, maxBytes)} Decimate it before uploading.` },
    });
  }
  const uploadId = randomUUID();
  const objectKey = `surfaces/${groomer.userId}/${uploadId}/${keySafe(input.fileName)}`;
  const expiresAt = new Date(Date.now() + STUDIO_URL_SECONDS * 1000);
  await db()('surface_uploads').insert({
    id: uploadId,
    owner_id: groomer.userId,
    file_name: input.fileName,
    format,
    byte_size: input.byteSize,
    object_key: objectKey,
    expires_at: expiresAt,
  });
  const url = await presignSurfaceUpload(objectKey, input.byteSize);
  return { uploadId, url, method: 'PUT', expiresAt: expiresAt.toISOString(), maxBytes };
}

/** How long after its URL expired an upload may still be registered before it is swept away. */
const ABANDONED_UPLOAD_GRACE_HOURS = 24;

/**
 * Removes uploads nobody registered (the page was closed mid-way): their objects, then their
 * records. Run periodically by the job queue. Returns how many were removed.
 */
export async function sweepAbandonedUploads(): Promise<number> {
  const abandoned: UploadRow[] = await db()('surface_uploads').where(
    'expires_at',
    '<',
    db().raw(`now() - make_interval(hours => ?)`, [ABANDONED_UPLOAD_GRACE_HOURS]),
  );
  for (const upload of abandoned) await discardUpload(upload);
  return abandoned.length;
}

/** Removes an upload that will not become a surface: its object first, then its record. */
async function discardUpload(upload: UploadRow): Promise<void> {
  await deleteStoredObjects([upload.object_key]);
  await db()('surface_uploads').where({ id: upload.id }).delete();
}

function rejection(fileName: string, problems: readonly Problem[]): HttpError {
  const errors = problems.filter((problem) => problem.severity === 'error');
  const message = `${fileName} cannot be used as a growth surface: ${errors.map((problem) => problem.message).join(' ')}`;
  return new HttpError(422, 'surface-rejected', message, { details: { problems } });
}

/** The stage a registered surface waits in. */
export const CHECK_QUEUED = { stage: 'waiting for its check', progress: 0 };

/**
 * Turns an upload into a growth surface being checked: the file is copied to the surface's own
 * key, its size held to the one declared and to the limit (a 422 with the problem, file removed),
 * and the check queued. The surface is answered in the state `checking`.
 */
export async function registerSurface(groomer: Groomer, input: { uploadId: string; name: string; units: SurfaceUnits }): Promise<SurfaceSummary> {
  const upload: UploadRow | undefined = await db()('surface_uploads').where({ id: input.uploadId, owner_id: groomer.userId }).first();
  if (!upload) throw notFound('upload');

  if ((await storedObjectSize(upload.object_key)) === null) {
    throw new HttpError(409, 'upload-missing', `Nothing has been uploaded for ${upload.file_name} yet: send the file to its upload URL first.`);
  }
  // From here on only the copy is read: whatever is PUT to the upload URL later is never used.
  const surfaceId = randomUUID();
  const objectKey = `surfaces/${groomer.userId}/${surfaceId}/${keySafe(upload.file_name)}`;
  await copyObject(upload.object_key, objectKey);
  const refuse = async (problem: Pick<Problem, 'code' | 'message'>) => {
    await deleteOrphanedObjects([objectKey]);
    await discardUpload(upload);
    return rejection(upload.file_name, [{ ...problem, severity: 'error', count: 1, examples: [], where: 'file' }]);
  };
  const storedSize = (await storedObjectSize(objectKey)) ?? 0;
  const maxBytes = env().SURFACE_MAX_BYTES;
  if (storedSize > maxBytes) throw await refuse({ code: 'file-too-large', message: tooLarge(storedSize, maxBytes) });
  // The upload URL signs the declared length, which a store that checks signatures (S3) enforces;
  // this check holds with any store (the local stand-in does not verify signed headers).
  const declared = Number(upload.byte_size);
  if (storedSize !== declared) {
    throw await refuse({
      code: 'size-mismatch',
      message: `The stored file is ${storedSize.toLocaleString('en-US')} bytes, but ${declared.toLocaleString('en-US')} were declared when the upload began. Upload the file again.`,
    });
  }

  let stored: SurfaceRow;
  try {
    stored = await db().transaction(async (trx) => {
      // Deleting the upload first makes a second, concurrent registration of it find nothing.
      const consumed = await trx('surface_uploads').where({ id: upload.id }).delete();
      if (consumed === 0) throw notFound('upload');
      const [inserted] = await trx('growth_surfaces')
        .insert({
          id: surfaceId,
          owner_id: groomer.userId,
          name: input.name,
          file_name: upload.file_name,
          format: upload.format,
          units: input.units,
          object_key: objectKey,
          byte_size: storedSize,
          state: 'checking',
          check_stage: CHECK_QUEUED.stage,
          check_progress: CHECK_QUEUED.progress,
        })
        .returning('*');
      return inserted;
    });
  } catch (error) {
    await deleteOrphanedObjects([objectKey]);
    throw error;
  }
  // Queued after the commit, so that the job always finds the row; a queue that cannot be reached
  // takes the surface back out rather than leaving one that is never checked.
  try {
    await enqueueSurfaceCheck({ surfaceId });
  } catch (error) {
    console.error(`[studio] check of surface ${surfaceId} not queued: ${(error as Error).message}`);
    await db()('growth_surfaces').where({ id: surfaceId }).delete();
    await deleteOrphanedObjects([objectKey, upload.object_key]);
    throw new HttpError(503, 'service-unavailable', 'The surface could not be queued for its check: the job queue is not reachable. Upload it again in a moment.');
  }
  // The upload's own object is not needed any more (a later PUT to its URL makes an object no
  // row names, which is all it can do).
  await deleteOrphanedObjects([upload.object_key]);
  return surfaceSummary(stored);
}

export async function surfaceSummary(row: SurfaceRow): Promise<SurfaceSummary> {
  const base = {
    id: row.id,
    name: row.name,
    fileName: row.file_name,
    format: row.format,
    units: row.units,
    thumbnailUrl: row.thumbnail_key ? await presignDownload(row.thumbnail_key, STUDIO_URL_SECONDS) : null,
    createdAt: row.created_at.toISOString(),
    check: { stage: row.check_stage, progress: row.check_progress },
  };
  if (row.state !== 'ready') return { ...base, state: row.state, problems: row.problems };
  return {
    ...base,
    state: 'ready',
    vertexCount: row.vertex_count ?? 0,
    faceCount: row.face_count ?? 0,
    componentCount: row.component_count ?? 0,
    boundaryLoopCount: row.boundary_loop_count ?? 0,
    genus: row.genus ?? 0,
    eulerCharacteristic: row.euler_characteristic ?? 0,
    areaCm2: row.area_cm2 ?? 0,
    groups: row.groups,
    uvs: row.has_uvs === null ? null : { present: row.has_uvs, overlapFraction: row.uv_overlap_fraction ?? 0 },
    warnings: row.warnings,
  };
}

/** A ready surface with its file and pieces; a surface still checking (or refused) as it is. */
export async function surfaceDetail(row: SurfaceRow): Promise<SurfaceDetail | UncheckedSurface> {
  const summary = await surfaceSummary(row);
  if (summary.state !== 'ready') return summary;
  return {
    ...summary,
    fileUrl: await presignDownload(row.object_key, STUDIO_URL_SECONDS, row.file_name),
    prepared: row.prepared_key ? { url: `/api/studio/surfaces/${row.id}/prepared`, fileName: `${row.id}.${PREPARED_EXTENSION}` } : null,
    byteSize: Number(row.byte_size),
    components: row.components ?? [],
  };
}

/** The groomer's surface row, or a 404. */
export async function ownSurfaceRow(groomer: Groomer, surfaceId: string): Promise<SurfaceRow> {
  const row: SurfaceRow | undefined = await db()('growth_surfaces').where({ id: surfaceId, owner_id: groomer.userId }).first();
  if (!row) throw notFound('surface');
  return row;
}

export async function listSurfaces(groomer: Groomer): Promise<SurfaceSummary[]> {
  const rows: SurfaceRow[] = await db()('growth_surfaces').where({ owner_id: groomer.userId }).orderBy([
    { column: 'created_at', order: 'desc' },
    { column: 'id', order: 'desc' },
  ]);
  return Promise.all(rows.map(surfaceSummary));
}

/**
 * The bytes of the groomer's surface in its prepared form (see SurfaceRow.prepared_key), or a 404
 * when it has none (the editor then reads the file). Immutable, like the surface.
 */
export async function preparedSurfaceBytes(groomer: Groomer, surfaceId: string): Promise<Uint8Array> {
  const row = await ownSurfaceRow(groomer, surfaceId);
  if (!row.prepared_key) throw notFound('surface');
  return getObjectBytes(row.prepared_key);
}

export async function getSurface(groomer: Groomer, surfaceId: string): Promise<SurfaceDetail | UncheckedSurface> {
  return surfaceDetail(await ownSurfaceRow(groomer, surfaceId));
}

/** Deletes a surface no groom uses, with its file and thumbnail (a surface still being checked too: its check then finds nothing). */
export async function deleteSurface(groomer: Groomer, surfaceId: string): Promise<void> {
  const removed = await db().transaction(async (trx) => {
    const row: SurfaceRow | undefined = await trx('growth_surfaces').where({ id: surfaceId, owner_id: groomer.userId }).forUpdate().first();
    if (!row) throw notFound('surface');
    const grooms: string[] = await trx('grooms').where({ surface_id: surfaceId }).orderBy('name').pluck('name');
    if (grooms.length > 0) {
      const names = grooms.slice(0, 3).map((name) => `“${name}”`).join(', ') + (grooms.length > 3 ? ` and ${grooms.length - 3} more` : '');
      throw new HttpError(
        409,
        'surface-in-use',
        `${grooms.length === 1 ? 'A groom grows' : `${grooms.length} grooms grow`} on this surface (${names}); delete ${grooms.length === 1 ? 'it' : 'them'} first.`,
      );
    }
    const kept: string[] = await trx('groom_versions as v').join('grooms as g', 'g.id', 'v.groom_id').where('v.surface_id', surfaceId).distinct('g.name').orderBy('g.name').pluck('g.name');
    if (kept.length > 0) {
      throw new HttpError(
        409,
        'surface-in-use',
        `Versions of ${kept.slice(0, 3).map((name) => `“${name}”`).join(', ')}${kept.length > 3 ? ` and ${kept.length - 3} more grooms` : ''} were made on this surface and open on it; delete those grooms first.`,
      );
    }
    await trx('growth_surfaces').where({ id: surfaceId }).delete();
    return row;
  });
  await deleteOrphanedObjects([removed.object_key, removed.thumbnail_key, removed.prepared_key]);
}
