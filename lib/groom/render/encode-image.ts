import sharp from 'sharp';
import type { TriangleMesh } from '../../field';
import type { Guides } from '../grow/guides';
import { renderThumbnail, THUMBNAIL_VIEWS, type GuideColouring, type RgbaImage, type ThumbnailView } from './render';

/**
 * Server-side encoding of rendered thumbnails with sharp. This is the one module of lib/groom
 * that needs Node; the rendering itself (render.ts) does not.
 */

export type ImageFormat = 'png' | 'webp';
export const THUMBNAIL_SIZES = [256, 1024] as const;

/** Encodes an RGBA image. Guarantees: PNG is lossless (decodes to the same pixels); WebP is lossy at quality 90. */
export async function encodeImage(image: RgbaImage, format: ImageFormat): Promise<Uint8Array> {
  const raw = sharp(Buffer.from(image.data.buffer, image.data.byteOffset, image.data.byteLength), {
    raw: { width: image.width, height: image.height, channels: 4 },
  });
  const encoded = format === 'png' ? await raw.png({ compressionLevel: 9 }).toBuffer() : await raw.webp({ quality: 90 }).toBuffer();
  return new Uint8Array(encoded.buffer, encoded.byteOffset, encoded.byteLength);
}

export interface Thumbnail {
  readonly view: ThumbnailView;
  readonly size: number;
  readonly format: ImageFormat;
  readonly bytes: Uint8Array;
}

/**
 * The full thumbnail set of a groom: front, side and top views at 256² and 1024², each as PNG
 * and WebP. Guarantees: 12 images, each view and size rendered once and encoded twice.
 */
export async function encodeThumbnails(mesh: TriangleMesh, guides: Guides, colourBy: GuideColouring = 'length'): Promise<Thumbnail[]> {
  const out: Thumbnail[] = [];
  for (const view of THUMBNAIL_VIEWS) {
    for (const size of THUMBNAIL_SIZES) {
      const image = renderThumbnail(mesh, guides, { size, view, upAxis: guides.upAxis, colourBy });
      for (const format of ['png', 'webp'] as const) out.push({ view, size, format, bytes: await encodeImage(image, format) });
    }
  }
  return out;
}
