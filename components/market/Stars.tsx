// A rating out of five as filled and empty whorls of text, with the number in words for
// screen readers and tests.
export function Stars({ rating, count, size = 'text-base' }: { rating: number | null; count?: number; size?: string }) {
  if (rating === null || (count !== undefined && count === 0)) {
    return <span className="text-sm text-loam-soft">No reviews yet</span>;
  }
  const rounded = Math.round(rating * 2) / 2;
  const words = `Rated ${rating.toFixed(1)} out of 5${count !== undefined ? ` from ${count} review${count === 1 ? '' : 's'}` : ''}`;
  return (
    <span className="inline-flex items-center gap-1.5" title={words}>
      <span aria-hidden="true" className={`${size} tracking-tight`}>
        {Array.from({ length: 5 }, (_, index) => (
          <span key={index} className={index + 1 <= rounded ? 'text-bracken' : index + 0.5 === rounded ? 'text-pollen' : 'text-vellum'}>
            ★
          </span>
        ))}
      </span>
      <span className="sr-only">{words}</span>
      <span aria-hidden="true" className="text-sm text-loam-soft">
        {rating.toFixed(1)}
        {count !== undefined && ` (${count})`}
      </span>
    </span>
  );
}
