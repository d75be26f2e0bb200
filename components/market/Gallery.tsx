'use client';
// The listing's pictures (rendered from the frozen groom version, front, side and top): one
// large, the others as small pictures to choose from.
import { useState } from 'react';

export type GalleryPicture = { label: string; thumbUrl: string; url: string };

export function Gallery({ pictures, title }: { pictures: GalleryPicture[]; title: string }) {
  const [shown, setShown] = useState(0);
  if (pictures.length === 0) {
    return (
      <p className="flex aspect-square items-center justify-center rounded-3xl bg-vellum p-6 text-center text-loam-soft">
        The pictures of this preset are still being rendered.
      </p>
    );
  }
  const picture = pictures[Math.min(shown, pictures.length - 1)];
  return (
    <div className="flex flex-col gap-3" data-testid="gallery">
      {/* eslint-disable-next-line @next/next/no-img-element -- short-lived object-storage URLs */}
      <img src={picture.url} alt={`${title}, ${picture.label}`} className="aspect-square w-full rounded-3xl bg-tarn-deep object-cover" />
      {pictures.length > 1 && (
        <ul className="flex flex-wrap gap-2" aria-label="Pictures">
          {pictures.map((candidate, index) => (
            <li key={candidate.url}>
              <button
                type="button"
                onClick={() => setShown(index)}
                aria-pressed={index === shown}
                aria-label={`Show the ${candidate.label}`}
                className="block overflow-hidden rounded-2xl ring-2 ring-transparent aria-pressed:ring-bracken"
              >
                {/* eslint-disable-next-line @next/next/no-img-element -- short-lived object-storage URLs */}
                <img src={candidate.thumbUrl} alt="" className="h-16 w-16 bg-tarn-deep object-cover" />
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

