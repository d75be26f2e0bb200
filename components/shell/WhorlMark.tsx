// Whorlwind's mark: a whorl drawn as hair strokes leaving the centre on a spiral.
const STROKES = 14;

function strokePath(index: number) {
  const start = (index / STROKES) * Math.PI * 2;
  const points: string[] = [];
  for (let step = 0; step <= 6; step += 1) {
    const radius = 3 + step * 2.1;
    const angle = start + step * 0.32;
    points.push(`${(16 + radius * Math.cos(angle)).toFixed(2)} ${(16 + radius * Math.sin(angle)).toFixed(2)}`);
  }
  return `M ${points.join(' L ')}`;
}

export function WhorlMark({ className = 'h-8 w-8' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <circle cx="16" cy="16" r="15.5" className="fill-pollen" />
      {Array.from({ length: STROKES }, (_, index) => (
        <path key={index} d={strokePath(index)} className="fill-none stroke-tarn-deep" strokeWidth="1.3" strokeLinecap="round" />
      ))}
    </svg>
  );
}
