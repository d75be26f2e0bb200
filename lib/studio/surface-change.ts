// Moving a groom onto another surface (a new version of the character, or another of the
// groomer's surfaces): the spec is carried over by lib/groom's transfer, the report is shown
// before anything changes, and accepting it keeps the groom as it was as a version on its old
// surface, then switches surface and spec in one transaction. Starting a new groom from a groom
// on another surface uses the same transfer. The transfer itself is a job (runSurfaceMove).
import { GroomError, identityOfMesh, transferSpec, type GroomSpec, type TransferReport } from '../groom';
import { FieldError } from '../field';
import type { Groomer } from '../accounts/actor';
import { db } from '../platform/db';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import { enqueueSurfaceMove, enqueueThumbnail, SURFACE_MOVE_BUDGET, type SurfaceMoveJobData } from './jobs';
import { getGroom, GROOM_NAME_MAX, type GroomRow } from './grooms';
import { preparedSurface } from './surface-cache';
import { ownSurfaceRow, type SurfaceRow } from './surfaces';
import type { GroomDetail, SurfaceMoveInput, SurfaceMovePreview } from './types';

function fileOf(row: SurfaceRow) {
  return { id: row.id, objectKey: row.object_key, fileName: row.file_name };
}

async function readyTarget(groomer: Groomer, surfaceId: string): Promise<SurfaceRow> {
  const row = await ownSurfaceRow(groomer, surfaceId);
  if (row.state !== 'ready') {
    throw new HttpError(409, 'surface-not-ready', row.state === 'checking' ? `${row.name} is still being checked; move the groom once it is ready.` : `${row.name} was refused by its check and cannot carry a groom.`);
  }
  return row;
}

type MoveRow = { id: string; groom_id: string; target_surface_id: string; input: SurfaceMoveInput; status: 'queued' | 'running' | 'done' | 'failed'; revision: number | null; spec: GroomSpec | null; report: TransferReport | null; error: string | null };

/** How often a request waiting for its move looks at the row. */
const MOVE_POLL_MS = 150;
/** How long a request waits for a job worker to take and finish the move: its budget, and a queue's wait on top. */
const MOVE_WAIT_MS = (SURFACE_MOVE_BUDGET.seconds + 60) * 1000;

/** What decides a transfer's result besides the groom's spec: a preview is taken only for the same. */
function carryKey(input: SurfaceMoveInput): string {
  const regionMap = Object.entries(input.regionMap ?? {}).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return JSON.stringify([input.surfaceId, input.landmarks ?? [], regionMap, input.method ?? 'auto']);
}

/** A previewed transfer of this groom with the same input, taken (deleted) once; null when there is none. */
async function takePreviewed(groomId: string, input: SurfaceMoveInput): Promise<Pick<MoveRow, 'spec' | 'report' | 'revision'> | null> {
  if (!input.moveId) return null;
  const [row]: MoveRow[] = await db()('groom_surface_moves').where({ id: input.moveId, groom_id: groomId, status: 'done' }).delete().returning('*');
  return row && carryKey(row.input) === carryKey(input) ? row : null;
}

type Carried = { spec: GroomSpec; report: TransferReport; revision: number; from: SurfaceRow; to: SurfaceRow; moveId: string | null };

/**
 * The transfer of a groom's saved spec onto one of the groomer's ready surfaces, worked out by a
 * job worker (reading and preparing two surfaces is heavy work, never done on the web server);
 * the request waits for the job's row, without holding the server's event loop. A preview `keep`s
 * its row (and says its `moveId`), so that accepting takes the same transfer instead of carrying
 * the groom over again; otherwise nothing is written but that row, which is gone again when this
 * returns. Kept rows nobody takes are swept (sweepStaleSurfaceMoves).
 */
async function carry(groomer: Groomer, groom: GroomRow, input: SurfaceMoveInput, keep = false): Promise<Carried> {
  const from: SurfaceRow = await db()('growth_surfaces').where({ id: groom.surface_id }).first();
  const to = await readyTarget(groomer, input.surfaceId);
  const previewed = await takePreviewed(groom.id, input);
  if (previewed) return { spec: previewed.spec!, report: previewed.report!, revision: previewed.revision!, from, to, moveId: null };
  const stored = { surfaceId: input.surfaceId, landmarks: input.landmarks, regionMap: input.regionMap, method: input.method };
  const [{ id }] = await db()('groom_surface_moves').insert({ groom_id: groom.id, target_surface_id: to.id, input: JSON.stringify(stored) }).returning('id');
  let kept = false;
  try {
    await enqueueSurfaceMove({ moveId: id });
    const deadline = Date.now() + MOVE_WAIT_MS;
    for (;;) {
      const row: MoveRow | undefined = await db()('groom_surface_moves').where({ id }).first();
      if (!row) throw notFound('groom');
      if (row.status === 'done') {
        kept = keep;
        return { spec: row.spec!, report: row.report!, revision: row.revision!, from, to, moveId: keep ? id : null };
      }
      if (row.status === 'failed') throw new HttpError(422, 'transfer-refused', row.error!);
      if (Date.now() > deadline) throw new HttpError(503, 'service-unavailable', 'Carrying the groom over took too long (no job worker took it, or it is still busy); try again in a moment.');
      await new Promise((resolve) => setTimeout(resolve, MOVE_POLL_MS));
    }
  } finally {
    if (!kept) await db()('groom_surface_moves').where({ id }).delete();
  }
}

/** How long a previewed transfer waits to be accepted, and the longest a request waits for one, before the sweep. */
export const STALE_MOVE_MS = Math.max(60 * 60 * 1000, 2 * MOVE_WAIT_MS);

/**
 * Deletes the rows of transfers nobody will take: previews not accepted within STALE_MOVE_MS, and
 * rows of requests whose web process stopped while they waited. Returns how many.
 */
export async function sweepStaleSurfaceMoves(now = new Date()): Promise<number> {
  return db()('groom_surface_moves').where('updated_at', '<', new Date(now.getTime() - STALE_MOVE_MS)).delete();
}

/**
 * The job: carries the groom's saved spec onto the move's surface and writes the result (or why
 * not) on the move's row. A move whose row is gone (its request gave up) or no longer queued is
 * left alone.
 */
export async function runSurfaceMove({ moveId }: SurfaceMoveJobData): Promise<void> {
  const taken = await db()('groom_surface_moves').where({ id: moveId, status: 'queued' }).update({ status: 'running', updated_at: db().fn.now() });
  if (taken === 0) return;
  const row: MoveRow = await db()('groom_surface_moves').where({ id: moveId }).first();
  const groom: GroomRow | undefined = await db()('grooms').where({ id: row.groom_id }).first();
  if (!groom) return failSurfaceMove({ moveId }, 'The groom was deleted meanwhile.');
  const from: SurfaceRow = await db()('growth_surfaces').where({ id: groom.surface_id }).first();
  const to: SurfaceRow = await db()('growth_surfaces').where({ id: row.target_surface_id }).first();
  const boundary = groom.spec.field.boundary;
  try {
    const old = await preparedSurface(fileOf(from), boundary);
    const next = await preparedSurface(fileOf(to), boundary);
    const { spec, report } = transferSpec(
      groom.spec,
      { surface: old, identity: identityOfMesh(old.mesh), units: from.units },
      { surface: next, identity: identityOfMesh(next.mesh), units: to.units },
      { landmarks: row.input.landmarks ?? [], regionMap: row.input.regionMap ?? {}, method: row.input.method ?? 'auto' },
    );
    await db()('groom_surface_moves')
      .where({ id: moveId })
      .update({ status: 'done', revision: groom.revision, spec: JSON.stringify(spec), report: JSON.stringify(report), updated_at: db().fn.now() });
  } catch (error) {
    if (!(error instanceof GroomError || error instanceof FieldError)) throw error;
    await failSurfaceMove({ moveId }, `The groom cannot be moved onto ${to.name}: ${error.message}`);
  }
}

/** Marks a move failed with words for the groomer (also when its job is stopped past its budget). */
export async function failSurfaceMove({ moveId }: SurfaceMoveJobData, message: string): Promise<void> {
  await db()('groom_surface_moves').where({ id: moveId }).whereIn('status', ['queued', 'running']).update({ status: 'failed', error: message, updated_at: db().fn.now() });
}

/**
 * The surface guides grow their roots from after a move: on a sculpt pass (carried by polygon) the
 * one the groom's roots already came from, so guide ids, polygons and weights stay; otherwise the
 * new surface's own (null).
 */
function rootsAfter(report: TransferReport, groom: Pick<GroomRow, 'surface_id' | 'roots_surface_id'>): string | null {
  return report.method === 'topology' ? (groom.roots_surface_id ?? groom.surface_id) : null;
}

async function ownGroomRow(groomer: Groomer, groomId: string): Promise<GroomRow> {
  const row: GroomRow | undefined = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).first();
  if (!row) throw notFound('groom');
  return row;
}

/** What moving the groom onto the surface would do: the carried spec's report, and the revision it was made from. Writes nothing but the kept transfer. */
export async function previewSurfaceMove(groomer: Groomer, groomId: string, input: SurfaceMoveInput): Promise<SurfaceMovePreview> {
  const groom = await ownGroomRow(groomer, groomId);
  const { report, revision, from, to, moveId } = await carry(groomer, groom, input, true);
  return { report, revision, moveId: moveId!, from: { id: from.id, name: from.name }, to: { id: to.id, name: to.name } };
}

/**
 * Moves the groom onto the surface: the groom as saved is kept as a version on its old surface,
 * then its surface and spec change, as one transaction. Refused (409) when the spec was saved
 * again since `baseRevision`, the revision the groomer saw the report for.
 */
export async function acceptSurfaceMove(groomer: Groomer, groomId: string, input: SurfaceMoveInput & { baseRevision: number }): Promise<GroomDetail> {
  const groom = await ownGroomRow(groomer, groomId);
  const stale = (revision: number) =>
    new HttpError(409, 'stale-revision', `The spec changed since revision ${input.baseRevision} (now ${revision}); look at the transfer report again before moving the groom.`, { details: { revision } });
  if (groom.revision !== input.baseRevision) throw stale(groom.revision);
  if (groom.surface_id === input.surfaceId) throw new HttpError(409, 'same-surface', 'The groom already grows on that surface.');
  const { spec, report, revision, to } = await carry(groomer, groom, input);
  if (revision !== input.baseRevision) throw stale(revision);
  const versionId = await db().transaction(async (trx) => {
    const locked: GroomRow | undefined = await trx('grooms').where({ id: groomId, owner_id: groomer.userId }).forUpdate().first();
    if (!locked) throw notFound('groom');
    if (locked.revision !== input.baseRevision || locked.surface_id !== groom.surface_id) throw stale(locked.revision);
    const [{ latest }] = await trx('groom_versions').where({ groom_id: groomId }).max<{ latest: number | null }[]>('number as latest');
    const [kept] = await trx('groom_versions')
      .insert({ groom_id: groomId, surface_id: locked.surface_id, roots_surface_id: locked.roots_surface_id, number: (latest ?? 0) + 1, name: `Before moving to ${to.name}`.slice(0, GROOM_NAME_MAX), spec: JSON.stringify(locked.spec), source_revision: locked.revision })
      .returning('id');
    await trx('grooms')
      .where({ id: groomId })
      .update({ surface_id: to.id, roots_surface_id: rootsAfter(report, locked), spec: JSON.stringify(spec), revision: locked.revision + 1, spec_saved_at: trx.fn.now(), updated_at: trx.fn.now() });
    return kept.id as string;
  });
  await enqueueThumbnail({ groomId, versionId });
  await enqueueThumbnail({ groomId });
  return getGroom(groomer, groomId);
}

/** A new groom on another of the groomer's surfaces, starting from this groom's saved spec carried over (a fitted groom's copy stays fitted: not for sale). */
export async function startGroomFrom(groomer: Groomer, groomId: string, input: SurfaceMoveInput & { name?: string }): Promise<GroomDetail> {
  const groom = await ownGroomRow(groomer, groomId);
  const { spec, report, to } = await carry(groomer, groom, input);
  const name = input.name ?? `${groom.name.slice(0, GROOM_NAME_MAX - to.name.length - 4)} on ${to.name}`.slice(0, GROOM_NAME_MAX);
  const [{ id }] = await db()('grooms')
    .insert({ owner_id: groomer.userId, surface_id: to.id, roots_surface_id: rootsAfter(report, groom), from_purchase_id: groom.from_purchase_id, name, spec: JSON.stringify(spec) })
    .returning('id');
  await enqueueThumbnail({ groomId: id });
  return getGroom(groomer, id);
}
