// A listing's frozen spec carried onto one of a buyer's growth surfaces: the row a fit or a trial
// is worked out on (preset_transfers), what a buyer reads of it, and the job that fills it. The
// carrying is lib/groom's transfer, as the studio's move of a groom (lib/studio/surface-change.ts);
// the source is the listing's own copy of the seller's surface and spec, never the seller's
// studio rows (which may have changed or gone since the listing was made).
import { FieldError } from '../../field';
import { GroomError, identityOfMesh, parseGroomSpec, transferSpec, type GroomSpec, type TransferReport } from '../../groom';
import type { Actor } from '../../accounts/actor';
import { db } from '../../platform/db';
import { presignDownload } from '../../platform/storage';
import { preparedSurface } from '../../studio/surface-cache';
import type { SurfaceRow } from '../../studio/surfaces';
import type { Picture } from '../assets';
import { notFound } from '../errors';
import { enqueuePresetTransfer, type PresetTransferJobData } from '../jobs';
import { deleteMarketObjects, PICTURE_URL_SECONDS } from '../storage';
import type { PresetTransferView } from '../types';
import { makeTrialPreview } from './trial-preview';

export type TransferRow = {
  id: string;
  kind: 'fit' | 'trial';
  buyer_id: string;
  listing_id: string;
  purchase_id: string | null;
  target_surface_id: string;
  status: PresetTransferView['status'];
  stage: string;
  spec: GroomSpec | null;
  report: TransferReport | null;
  error: string | null;
  preview_key: string | null;
  pictures: Picture[] | null;
  preview_guide_count: number | null;
  preview_points_per_guide: number | null;
  groom_id: string | null;
  created_at: Date;
};

type ViewRow = TransferRow & { listing_title: string; listing_guide_count: number | null; surface_name: string };

function viewQuery(actor: Actor) {
  return db()('preset_transfers as t')
    .join('listings as l', 'l.id', 't.listing_id')
    .join('growth_surfaces as s', 's.id', 't.target_surface_id')
    .where('t.buyer_id', actor.userId)
    .select('t.*', 'l.title as listing_title', 'l.guide_count as listing_guide_count', 's.name as surface_name');
}

/** The buyer's own transfer of this kind, as they see it; anyone else's (or another kind's) is a 404. */
export async function transferView(actor: Actor, transferId: string, kind: TransferRow['kind']): Promise<PresetTransferView> {
  const row: ViewRow | undefined = await viewQuery(actor).where({ 't.id': transferId, 't.kind': kind }).first();
  if (!row) throw notFound(kind === 'fit' ? 'fit' : 'trial');
  const done = row.status === 'done';
  return {
    id: row.id,
    kind: row.kind,
    status: row.status,
    stage: row.stage,
    listing: { id: row.listing_id, title: row.listing_title },
    purchaseId: row.purchase_id,
    surface: { id: row.target_surface_id, name: row.surface_name },
    report: done ? row.report : null,
    error: row.error,
    groomId: row.groom_id,
    trial:
      done && row.kind === 'trial' && row.preview_key
        ? {
            guideCount: row.preview_guide_count ?? 0,
            pointsPerGuide: row.preview_points_per_guide ?? 0,
            listingGuideCount: row.listing_guide_count,
            previewUrl: await presignDownload(row.preview_key, PICTURE_URL_SECONDS),
            pictures: await Promise.all((row.pictures ?? []).map(async (picture) => ({ view: picture.view, url: await presignDownload(picture.key, PICTURE_URL_SECONDS) }))),
          }
        : null,
    createdAt: row.created_at.toISOString(),
  };
}

/**
 * Queues the job of a row just written and answers the row as its buyer sees it; a queue that
 * cannot be reached marks the row failed (nothing is left waiting for a job that never comes).
 */
export async function queuedTransfer(actor: Actor, transferId: string, kind: TransferRow['kind']): Promise<PresetTransferView> {
  try {
    await enqueuePresetTransfer({ transferId });
  } catch (error) {
    await failPresetTransfer({ transferId }, `The ${kind === 'fit' ? 'fitting' : 'trial'} could not be queued; try again in a moment.`);
    throw error;
  }
  return transferView(actor, transferId, kind);
}

/** Writes a stage of the job for the buyer's page to show. */
export async function markStage(transferId: string, stage: string): Promise<void> {
  await db()('preset_transfers').where({ id: transferId }).update({ stage, updated_at: db().fn.now() });
}

/**
 * The job: carries the listing's spec onto the buyer's surface and writes the carried spec and its
 * report on the row (and for a trial, its reduced preview), or why not in the buyer's words. A
 * transfer no longer queued (taken by another worker, or its row gone) is left alone.
 */
export async function runPresetTransfer({ transferId }: PresetTransferJobData): Promise<void> {
  const taken = await db()('preset_transfers').where({ id: transferId, status: 'queued' }).update({ status: 'running', stage: 'Reading both surfaces', updated_at: db().fn.now() });
  if (taken === 0) return;
  const row: TransferRow = await db()('preset_transfers').where({ id: transferId }).first();
  const listing = await db()('listings').where({ id: row.listing_id }).first('id', 'spec', 'surface_key', 'surface_file_name', 'guide_count');
  const target: SurfaceRow | undefined = await db()('growth_surfaces').where({ id: row.target_surface_id }).first();
  if (!listing || !target) return failPresetTransfer({ transferId }, 'The preset or your surface was deleted meanwhile.');
  try {
    const spec = parseGroomSpec(listing.spec);
    const boundary = spec.field.boundary;
    // Keyed by the stored object: a listing's surface file never changes under its key.
    const from = await preparedSurface({ id: `listing:${listing.surface_key}`, objectKey: listing.surface_key, fileName: listing.surface_file_name }, boundary);
    const to = await preparedSurface({ id: target.id, objectKey: target.object_key, fileName: target.file_name }, boundary);
    await markStage(transferId, 'Carrying the places over');
    const carried = transferSpec(spec, { surface: from, identity: identityOfMesh(from.mesh), units: spec.units }, { surface: to, identity: identityOfMesh(to.mesh), units: target.units });
    const trial = row.kind === 'trial' ? await makeTrialPreview(row, { ...carried, surface: to }, listing.guide_count, (stage) => markStage(transferId, stage)) : {};
    await db()('preset_transfers')
      .where({ id: transferId })
      .update({ status: 'done', stage: 'Done', spec: JSON.stringify(carried.spec), report: JSON.stringify(carried.report), ...trial, updated_at: db().fn.now() });
  } catch (error) {
    if (!(error instanceof GroomError || error instanceof FieldError)) throw error;
    await failPresetTransfer({ transferId }, `The preset cannot be fitted to ${target.name}: ${error.message}`);
  }
}

/** Marks a transfer failed with words for the buyer (also when its job is stopped past its budget). */
export async function failPresetTransfer({ transferId }: PresetTransferJobData, message: string): Promise<void> {
  await db()('preset_transfers')
    .where({ id: transferId })
    .whereIn('status', ['queued', 'running'])
    .update({ status: 'failed', stage: 'Stopped', error: message, updated_at: db().fn.now() });
}

/** How long a trial is kept (its row, pictures and reduced preview): long enough to come back to before buying. */
export const TRIAL_KEEP_DAYS = 7;

/**
 * Deletes trials older than TRIAL_KEEP_DAYS with their files (fits stay: an accepted one names its
 * groom). The rows go first, in one statement, so no page is left naming a missing file; a file
 * storage keeps after a failed delete is logged. Answers how many trials went.
 */
export async function sweepOldTrials(keepDays = TRIAL_KEEP_DAYS): Promise<number> {
  const gone: Pick<TransferRow, 'preview_key' | 'pictures'>[] = await db()('preset_transfers')
    .where({ kind: 'trial' })
    .where('created_at', '<', db().raw(`now() - make_interval(days => ?)`, [keepDays]))
    .delete()
    .returning(['preview_key', 'pictures']);
  const keys = gone.flatMap((row) => [row.preview_key, ...(row.pictures ?? []).map((picture) => picture.key)]).filter((key): key is string => key !== null);
  for (let i = 0; i < keys.length; i += 1000) await deleteMarketObjects(keys.slice(i, i + 1000));
  return gone.length;
}
