// What a trial makes on the buyer's surface once the spec is carried over: the guides grown there,
// three small pictures of them (lib/groom's renderer, as the listing's own pictures) and the
// reduced .glb of trial-limits.ts. Stored under the trial's own prefix: built for the trial, never a copy
// of the package's files.
import { growGuides, previewGuides, previewToGlb, renderThumbnail, solveGroomField, THUMBNAIL_VIEWS, type GroomSpec, type GroomSurface } from '../../groom';
import type { SolvedField } from '../../field';
import { encodeImage } from '../../groom/render/encode-image';
import { putObject } from '../../platform/storage';
import type { Picture } from '../assets';
import { trialLimits } from './trial-limits';

/** The pictures' size: enough to judge the coat's flow, no more. */
export const TRIAL_PICTURE_SIZE = 512;

export const trialPrefix = (buyerId: string, transferId: string) => `market/trials/${buyerId}/${transferId}`;

type Carried = { spec: GroomSpec; solved?: SolvedField; surface: GroomSurface };

/** The trial's columns of preset_transfers, its files stored. */
export async function makeTrialPreview(
  row: { id: string; buyer_id: string },
  carried: Carried,
  listingGuideCount: number | null,
  stage: (words: string) => Promise<void>,
): Promise<{ preview_key: string; pictures: string; preview_guide_count: number; preview_points_per_guide: number }> {
  await stage('Growing the guides on your surface');
  const solved = carried.solved ?? solveGroomField(carried.spec, carried.surface);
  const { guides } = growGuides(carried.surface, solved, carried.spec);
  await stage('Drawing the pictures');
  const prefix = trialPrefix(row.buyer_id, row.id);
  const pictures: Picture[] = [];
  for (const view of THUMBNAIL_VIEWS) {
    const image = renderThumbnail(carried.surface.mesh, guides, { size: TRIAL_PICTURE_SIZE, view, upAxis: carried.spec.upAxis, colourBy: 'length' });
    const key = `${prefix}/${view}-${TRIAL_PICTURE_SIZE}.webp`;
    await putObject(key, await encodeImage(image, 'webp'), 'image/webp');
    pictures.push({ view, size: TRIAL_PICTURE_SIZE, key });
  }
  await stage('Making the 3D preview');
  // The share is of the listing's own count (what the buyer would get), or of the guides grown here when the listing has none yet.
  const preview = previewGuides(guides, trialLimits(listingGuideCount ?? guides.count));
  const previewKey = `${prefix}/preview.glb`;
  await putObject(previewKey, previewToGlb(preview), 'model/gltf-binary');
  return { preview_key: previewKey, pictures: JSON.stringify(pictures), preview_guide_count: preview.count, preview_points_per_guide: preview.pointsPerGuide };
}
