// The gallery's pictures from a listing's renders (safe on the server and in the browser).
import type { GalleryPicture } from './Gallery';

/** Pairs the small and large renders of each view, in the order front, side, top. */
export function galleryPictures(gallery: { view: string; size: number; url: string }[]): GalleryPicture[] {
  const views = [...new Set(gallery.map((picture) => picture.view))];
  return views.map((view) => {
    const sizes = gallery.filter((picture) => picture.view === view).sort((a, b) => a.size - b.size);
    return { label: `${view} view`, thumbUrl: sizes[0].url, url: sizes[sizes.length - 1].url };
  });
}
