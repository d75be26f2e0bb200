// The surface check job: reads a registered surface's own copy, checks it with lib/field, and makes
// the row ready (facts, warnings, thumbnail, the spec a new groom starts from) or refused (the
// problems found; the file is removed, the row stays so the groomer sees why). Each step is
// written on the row with its progress for the studio's list.
import { randomUUID } from 'node:crypto';
import { checkSurfaceFile, PREPARED_EXTENSION, ringOrderings, writePreparedSurface, type Problem, type RingOrderings, type SurfaceReadResult } from '../field';
import { CENTIMETRES_PER_UNIT, renderThumbnail } from '../groom';
import { encodeImage } from '../groom/render/encode-image';
import { db } from '../platform/db';
import { getObjectBytes, putObject } from '../platform/storage';
import type { SurfaceCheckJobData } from './jobs';
import { startingSpec } from './starting-spec';
import { deleteOrphanedObjects } from './storage';
import type { SurfaceRow } from './surfaces';

/** Edge length of the stored surface thumbnail, in pixels. */
const SURFACE_THUMBNAIL_SIZE = 512;

const STEPS = {
  reading: { stage: 'reading the file', progress: 0.1 },
  checking: { stage: 'checking the mesh (manifold, orientation, faces)', progress: 0.3 },
  drawing: { stage: 'drawing the thumbnail', progress: 0.7 },
  done: { stage: 'checked', progress: 1 },
} as const;

/** Writes on the row while it is still being checked; false when it is not (deleted, or ended meanwhile). */
async function step(surfaceId: string, values: Record<string, unknown>): Promise<boolean> {
  return (await db()('growth_surfaces').where({ id: surfaceId, state: 'checking' }).update(values)) > 0;
}

/** Ends a check as refused with these problems, removing the file (nothing will read it). */
export async function refuseSurface(surfaceId: string, problems: readonly Problem[]): Promise<void> {
  const row: Pick<SurfaceRow, 'object_key'> | undefined = await db()('growth_surfaces').where({ id: surfaceId }).first('object_key');
  const ended = await step(surfaceId, { state: 'refused', problems: JSON.stringify(problems), check_stage: STEPS.done.stage, check_progress: 1 });
  if (ended && row) await deleteOrphanedObjects([row.object_key]);
}

/**
 * Stores the reading in its prepared form beside the file, with what the editor would otherwise
 * work out again: the mark that it passed this check, and the field's ring orderings (about 0.7 s
 * each at a million faces, here once instead of at every opening). Only a speed-up for the
 * editor: when it cannot be stored the surface is ready all the same (null), and the editor reads
 * the file; when the orderings cannot be worked out the form is stored without them.
 *
 * Forms written before these parts (version 1) are not rewritten: the editor opens them as before
 * (checking and ordering in the browser), their URL is served as immutable for a year so a browser
 * holding one would not fetch a new one anyway, and the saving is a speed-up of the opening only.
 */
async function writePrepared(row: SurfaceRow, read: SurfaceReadResult): Promise<string | null> {
  const key = `${row.object_key.slice(0, row.object_key.lastIndexOf('/'))}/prepared-${randomUUID()}.${PREPARED_EXTENSION}`;
  let orderings: RingOrderings = {};
  try {
    orderings = ringOrderings(read.mesh);
  } catch (error) {
    console.error(`[studio] the field's orderings of surface ${row.id} were not worked out (the editor works them out): ${(error as Error).message}`);
  }
  try {
    // Only surfaces that passed the check get here: the mark is this job's word for it.
    await putObject(key, writePreparedSurface(read, { checked: true, ringOrderings: orderings }), 'application/octet-stream');
    return key;
  } catch (error) {
    console.error(`[studio] the prepared form of surface ${row.id} was not stored (the editor reads its file): ${(error as Error).message}`);
    return null;
  }
}

/** The job: checks one registered surface (a surface no longer `checking` is left as it is). */
export async function checkRegisteredSurface({ surfaceId }: SurfaceCheckJobData): Promise<void> {
  const row: SurfaceRow | undefined = await db()('growth_surfaces').where({ id: surfaceId }).first();
  if (!row || row.state !== 'checking') return;
  if (!(await step(surfaceId, { check_stage: STEPS.reading.stage, check_progress: STEPS.reading.progress }))) return;
  const bytes = await getObjectBytes(row.object_key);
  if (!(await step(surfaceId, { check_stage: STEPS.checking.stage, check_progress: STEPS.checking.progress }))) return;
  const { read, report } = checkSurfaceFile(bytes, row.file_name);
  if (!report.ok || !read || !report.facts?.components) {
    // Errors first, so the first problem is the reason.
    await refuseSurface(surfaceId, [...report.problems].sort((a, b) => Number(b.severity === 'error') - Number(a.severity === 'error')));
    return;
  }
  if (!(await step(surfaceId, { check_stage: STEPS.drawing.stage, check_progress: STEPS.drawing.progress }))) return;
  const image = renderThumbnail(read.mesh, null, { size: SURFACE_THUMBNAIL_SIZE, view: 'front', upAxis: 'y' });
  const thumbnailKey = `${row.object_key.slice(0, row.object_key.lastIndexOf('/'))}/thumbnail-${randomUUID()}.webp`;
  await putObject(thumbnailKey, await encodeImage(image, 'webp'), 'image/webp');
  const preparedKey = await writePrepared(row, read);
  const facts = report.facts;
  const areaCm2 = facts.surfaceArea * CENTIMETRES_PER_UNIT[row.units] ** 2;
  const ready = await step(surfaceId, {
    state: 'ready',
    check_stage: STEPS.done.stage,
    check_progress: STEPS.done.progress,
    format: read.format,
    vertex_count: facts.vertexCount,
    face_count: facts.faceCount,
    component_count: facts.componentCount,
    boundary_loop_count: facts.boundaryLoopCount ?? 0,
    genus: facts.genus ?? 0,
    euler_characteristic: facts.eulerCharacteristic,
    area_cm2: areaCm2,
    groups: JSON.stringify(read.mesh.groups?.names ?? []),
    components: JSON.stringify(facts.components),
    has_uvs: facts.uvs.present,
    uv_overlap_fraction: facts.uvs.overlapFraction,
    warnings: JSON.stringify(report.problems),
    thumbnail_key: thumbnailKey,
    prepared_key: preparedKey,
    // Worked out here, once, so that creating a groom never reads the file again.
    starting_spec: JSON.stringify(startingSpec(read.mesh, row.units, areaCm2)),
  });
  if (!ready) await deleteOrphanedObjects([thumbnailKey, preparedKey]);
}
