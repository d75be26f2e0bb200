// Moving a groom onto another surface (a new version of the character, or another of the
// groomer's surfaces): the spec is carried over by lib/groom's transfer, the report is shown
// before anything changes, and accepting it keeps the groom as it was as a version on its old
// surface, then switches surface and spec in one transaction. Starting a new groom from a groom
// on another surface uses the same transfer.
import { GroomError, identityOfMesh, transferSpec, type GroomSpec, type TransferReport } from '../groom';
import { FieldError } from '../field';
import type { Groomer } from '../accounts/actor';
import { db } from '../platform/db';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import { enqueueThumbnail } from './jobs';
import { getGroom, GROOM_NAME_MAX, type GroomRow } from './grooms';
import { preparedSurface } from './surface-cache';
import { ownSurfaceRow, type SurfaceRow } from './surfaces';
import type { GroomDetail, SurfaceMoveInput, SurfaceMovePreview } from './types';

/** Surfaces larger than this are not moved inside a request (preparing two of them would hold the server up). */
export const MOVE_MAX_FACES = 400_000;

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

/** The transfer of a groom's saved spec onto one of the groomer's ready surfaces; nothing is written. */
async function carry(groomer: Groomer, groom: GroomRow, input: SurfaceMoveInput): Promise<{ spec: GroomSpec; report: TransferReport; from: SurfaceRow; to: SurfaceRow }> {
  const from: SurfaceRow = await db()('growth_surfaces').where({ id: groom.surface_id }).first();
  const to = await readyTarget(groomer, input.surfaceId);
  for (const row of [from, to]) {
    if ((row.face_count ?? 0) > MOVE_MAX_FACES) {
      throw new HttpError(413, 'too-large', `${row.name} has ${row.face_count!.toLocaleString('en')} faces; the studio moves grooms between surfaces of at most ${MOVE_MAX_FACES.toLocaleString('en')}. Use the command line (whorlwind-groom --from) for larger ones.`);
    }
  }
  const boundary = groom.spec.field.boundary;
  const [old, next] = [await preparedSurface(fileOf(from), boundary), await preparedSurface(fileOf(to), boundary)];
  try {
    const { spec, report } = transferSpec(
      groom.spec,
      { surface: old, identity: identityOfMesh(old.mesh), units: from.units },
      { surface: next, identity: identityOfMesh(next.mesh), units: to.units },
      { landmarks: input.landmarks ?? [], regionMap: input.regionMap ?? {}, method: input.method ?? 'auto' },
    );
    return { spec, report, from, to };
  } catch (error) {
    if (error instanceof GroomError || error instanceof FieldError) {
      throw new HttpError(422, 'transfer-refused', `The groom cannot be moved onto ${to.name}: ${error.message}`);
    }
    throw error;
  }
}

async function ownGroomRow(groomer: Groomer, groomId: string): Promise<GroomRow> {
  const row: GroomRow | undefined = await db()('grooms').where({ id: groomId, owner_id: groomer.userId }).first();
  if (!row) throw notFound('groom');
  return row;
}

/** What moving the groom onto the surface would do: the carried spec's report, and the revision it was made from. Writes nothing. */
export async function previewSurfaceMove(groomer: Groomer, groomId: string, input: SurfaceMoveInput): Promise<SurfaceMovePreview> {
  const groom = await ownGroomRow(groomer, groomId);
  const { report, from, to } = await carry(groomer, groom, input);
  return { report, revision: groom.revision, from: { id: from.id, name: from.name }, to: { id: to.id, name: to.name } };
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
  const { spec, to } = await carry(groomer, groom, input);
  const versionId = await db().transaction(async (trx) => {
    const locked: GroomRow | undefined = await trx('grooms').where({ id: groomId, owner_id: groomer.userId }).forUpdate().first();
    if (!locked) throw notFound('groom');
    if (locked.revision !== input.baseRevision || locked.surface_id !== groom.surface_id) throw stale(locked.revision);
    const [{ latest }] = await trx('groom_versions').where({ groom_id: groomId }).max<{ latest: number | null }[]>('number as latest');
    const [kept] = await trx('groom_versions')
      .insert({ groom_id: groomId, surface_id: locked.surface_id, number: (latest ?? 0) + 1, name: `Before moving to ${to.name}`.slice(0, GROOM_NAME_MAX), spec: JSON.stringify(locked.spec), source_revision: locked.revision })
      .returning('id');
    await trx('grooms')
      .where({ id: groomId })
      .update({ surface_id: to.id, spec: JSON.stringify(spec), revision: locked.revision + 1, spec_saved_at: trx.fn.now(), updated_at: trx.fn.now() });
    return kept.id as string;
  });
  await enqueueThumbnail({ groomId, versionId });
  await enqueueThumbnail({ groomId });
  return getGroom(groomer, groomId);
}

/** A new groom on another of the groomer's surfaces, starting from this groom's saved spec carried over. */
export async function startGroomFrom(groomer: Groomer, groomId: string, input: SurfaceMoveInput & { name?: string }): Promise<GroomDetail> {
  const groom = await ownGroomRow(groomer, groomId);
  const { spec, to } = await carry(groomer, groom, input);
  const name = input.name ?? `${groom.name.slice(0, GROOM_NAME_MAX - to.name.length - 4)} on ${to.name}`.slice(0, GROOM_NAME_MAX);
  const [{ id }] = await db()('grooms').insert({ owner_id: groomer.userId, surface_id: to.id, name, spec: JSON.stringify(spec) }).returning('id');
  await enqueueThumbnail({ groomId: id });
  return getGroom(groomer, id);
}
