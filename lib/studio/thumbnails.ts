// The thumbnail job: renders a groom's saved spec (or one version's) on its surface with its
// guides, stores the picture, and points the groom (and the version) at it.
import { randomUUID } from 'node:crypto';
import { FieldError } from '../field';
import { GroomError, renderThumbnail, type Guides } from '../groom';
import { encodeImage } from '../groom/render/encode-image';
import { db } from '../platform/db';
import { putObject } from '../platform/storage';
import type { ThumbnailJobData } from './jobs';
import { growStoredSpec } from './grow';
import { deleteOrphanedObjects } from './storage';
import { surfaceMesh, type StoredSurfaceFile } from './surface-cache';

/** Edge length of groom thumbnails, in pixels. */
export const GROOM_THUMBNAIL_SIZE = 512;
/**
 * Most guides a thumbnail grows: at 512 px more guides only darken the picture, and a thumbnail
 * is queued on every create, duplicate, version and restore, so it must stay cheap.
 */
export const THUMBNAIL_GUIDES = 20_000;

type ThumbnailSource = { spec: unknown; surface: StoredSurfaceFile };

async function sourceOf(data: ThumbnailJobData): Promise<ThumbnailSource | null> {
  const groom = await db()('grooms as g')
    .join('growth_surfaces as s', 's.id', 'g.surface_id')
    .where('g.id', data.groomId)
    .first('g.spec', 's.id as surface_id', 's.object_key', 's.file_name');
  if (!groom) return null;
  let spec = groom.spec;
  if (data.versionId) {
    const version = await db()('groom_versions').where({ id: data.versionId, groom_id: data.groomId }).first('spec');
    if (!version) return null;
    spec = version.spec;
  }
  return { spec, surface: { id: groom.surface_id, objectKey: groom.object_key, fileName: groom.file_name } };
}

/** Points a row at a new thumbnail; whether the row still exists, and the key it pointed at before. */
async function pointAt(table: 'grooms' | 'groom_versions', id: string, key: string): Promise<{ found: boolean; previous: string | null }> {
  return db().transaction(async (trx) => {
    const row: { thumbnail_key: string | null } | undefined = await trx(table).where({ id }).forUpdate().first('thumbnail_key');
    if (!row) return { found: false, previous: null };
    await trx(table).where({ id }).update({ thumbnail_key: key });
    return { found: true, previous: row.thumbnail_key };
  });
}

/**
 * Renders and stores the thumbnail the job asks for. A groom or version deleted in the meantime
 * is skipped; a spec that does not solve (saved mid-edit) is drawn as the bare surface, so the
 * list still shows what the groom grows on.
 */
export async function renderGroomThumbnail(data: ThumbnailJobData): Promise<void> {
  const source = await sourceOf(data);
  if (!source) return;
  let guides: Guides | null = null;
  let upAxis: 'y' | 'z' = 'y';
  try {
    const grown = await growStoredSpec(source.spec, source.surface, async () => {}, { sampleOf: THUMBNAIL_GUIDES });
    guides = grown.guides;
    upAxis = grown.spec.upAxis;
  } catch (error) {
    if (!(error instanceof FieldError || error instanceof GroomError)) throw error;
  }
  const mesh = await surfaceMesh(source.surface);
  const image = renderThumbnail(mesh, guides, { size: GROOM_THUMBNAIL_SIZE, view: 'front', upAxis, colourBy: 'length' });
  const bytes = await encodeImage(image, 'webp');

  // The groom and the version each get their own object, so that replacing one never removes the other's.
  const targets: { table: 'grooms' | 'groom_versions'; id: string; key: string }[] = [
    { table: 'grooms', id: data.groomId, key: `grooms/${data.groomId}/thumbnail-${randomUUID()}.webp` },
  ];
  if (data.versionId) {
    targets.push({ table: 'groom_versions', id: data.versionId, key: `grooms/${data.groomId}/versions/${data.versionId}/thumbnail-${randomUUID()}.webp` });
  }
  for (const target of targets) {
    await putObject(target.key, bytes, 'image/webp');
    const { found, previous } = await pointAt(target.table, target.id, target.key);
    // Deleted while rendering: the new picture belongs to nothing; otherwise the old one does not.
    await deleteOrphanedObjects([found ? previous : target.key]);
  }
}
