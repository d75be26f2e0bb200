// A bar chart drawn as SVG: one bar per period, a value axis with round steps, and every bar
// named in words (its <title>, and a hidden table for screen readers), so the numbers can be
// read without the picture.
export type ChartBar = { key: string; label: string; value: number };

const WIDTH = 720;
const HEIGHT = 260;
const MARGIN = { top: 16, right: 12, bottom: 34, left: 72 };

/**
 * Round steps (1, 2 or 5 × 10ⁿ) that cover 0…max in about four intervals; `minStep` keeps
 * counts of whole things (units, downloads) on whole numbers.
 */
export function niceTicks(max: number, intervals = 4, minStep = 0): number[] {
  if (!(max > 0)) return [0, Math.max(1, minStep)];
  const raw = Math.max(max / intervals, minStep);
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((f) => f * magnitude).find((candidate) => candidate >= raw) ?? 10 * magnitude;
  const ticks: number[] = [];
  for (let tick = 0; tick < max + step / 2; tick += step) ticks.push(Number(tick.toPrecision(12)));
  if (ticks[ticks.length - 1] < max) ticks.push(ticks[ticks.length - 1] + step);
  return ticks;
}

export function BarChart({
  title,
  bars,
  format,
  minStep = 0,
  emptyText = 'Nothing in this period.',
}: {
  title: string;
  bars: ChartBar[];
  format: (value: number) => string;
  /** The smallest step of the value axis (1 for counts; for money, one cent as 1). */
  minStep?: number;
  emptyText?: string;
}) {
  const plotWidth = WIDTH - MARGIN.left - MARGIN.right;
  const plotHeight = HEIGHT - MARGIN.top - MARGIN.bottom;
  const ticks = niceTicks(Math.max(0, ...bars.map((bar) => bar.value)), 4, minStep);
  const top = ticks[ticks.length - 1] || 1;
  const y = (value: number) => MARGIN.top + plotHeight - (Math.max(0, value) / top) * plotHeight;
  const slot = bars.length > 0 ? plotWidth / bars.length : plotWidth;
  const barWidth = Math.max(2, Math.min(48, slot * 0.7));
  // Label at most about a dozen periods along the bottom.
  const labelEvery = Math.max(1, Math.ceil(bars.length / 12));
  const total = bars.reduce((sum, bar) => sum + bar.value, 0);

  return (
    <figure className="flex flex-col gap-2" data-testid="sales-chart" data-total={total}>
      <figcaption className="text-sm font-semibold text-loam">{title}</figcaption>
      {bars.length === 0 ? (
        <p className="rounded-2xl bg-vellum p-6 text-loam-soft">{emptyText}</p>
      ) : (
        <>
          <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} className="w-full" role="img" aria-label={`${title}: ${format(total)} in all`}>
            {ticks.map((tick) => (
              <g key={tick}>
                <line x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(tick)} y2={y(tick)} className="stroke-vellum" strokeWidth={1} />
                <text x={MARGIN.left - 8} y={y(tick)} dy="0.35em" textAnchor="end" className="fill-loam-soft text-[11px]">
                  {format(tick)}
                </text>
              </g>
            ))}
            {bars.map((bar, index) => {
              const x = MARGIN.left + slot * index + (slot - barWidth) / 2;
              const height = Math.max(0, y(0) - y(bar.value));
              return (
                <g key={bar.key} data-testid="chart-bar" data-value={bar.value}>
                  <rect x={x} y={y(bar.value)} width={barWidth} height={height} rx={Math.min(4, barWidth / 4)} className="fill-bracken">
                    <title>{`${bar.label}: ${format(bar.value)}`}</title>
                  </rect>
                  {index % labelEvery === 0 && (
                    <text x={x + barWidth / 2} y={HEIGHT - MARGIN.bottom + 18} textAnchor="middle" className="fill-loam-soft text-[11px]">
                      {bar.label}
                    </text>
                  )}
                </g>
              );
            })}
            <line x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(0)} y2={y(0)} className="stroke-loam-soft" strokeWidth={1} />
          </svg>
          <table className="sr-only">
            <caption>{title}</caption>
            <thead>
              <tr>
                <th scope="col">Period</th>
                <th scope="col">Value</th>
              </tr>
            </thead>
            <tbody>
              {bars.map((bar) => (
                <tr key={bar.key}>
                  <th scope="row">{bar.label}</th>
                  <td>{format(bar.value)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </figure>
  );
}
