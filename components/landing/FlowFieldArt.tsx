// The landing page's picture: a patch of coat whose flow has a spiral whorl and a saddle,
// computed here as the sum of the two singularities' angle fields (index +1 and −1), the same
// kind of field Whorlwind solves for on a real growth surface.
const WIDTH = 480;
const HEIGHT = 360;
const SPACING = 20;
const WHORL = { x: 170, y: 160, twist: 0.9 };
const SADDLE = { x: 350, y: 250 };

function direction(x: number, y: number) {
  const whorl = Math.atan2(y - WHORL.y, x - WHORL.x) + WHORL.twist;
  const saddle = -Math.atan2(y - SADDLE.y, x - SADDLE.x);
  return whorl + saddle;
}

// A fixed pseudo-random offset per grid point, so the picture is the same on every render.
function jitter(column: number, row: number, salt: number) {
  const value = Math.sin(column * 127.1 + row * 311.7 + salt * 74.7) * 43758.5453;
  return value - Math.floor(value) - 0.5;
}

function hair(column: number, row: number) {
  let x = column * SPACING + jitter(column, row, 1) * 8;
  let y = row * SPACING + jitter(column, row, 2) * 8;
  const points = [`${x.toFixed(1)} ${y.toFixed(1)}`];
  // Follow the field for a few short steps, so each hair bends with the flow.
  for (let step = 0; step < 4; step += 1) {
    const angle = direction(x, y);
    x += Math.cos(angle) * 5;
    y += Math.sin(angle) * 5;
    points.push(`${x.toFixed(1)} ${y.toFixed(1)}`);
  }
  return `M ${points.join(' L ')}`;
}

export function FlowFieldArt() {
  const hairs: string[] = [];
  for (let row = 1; row < HEIGHT / SPACING; row += 1) {
    for (let column = 1; column < WIDTH / SPACING; column += 1) hairs.push(hair(column, row));
  }
  return (
    <svg
      viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
      className="h-auto w-full rounded-[2rem] bg-tarn-deep shadow-xl"
      role="img"
      aria-label="A patch of coat: hair flows out of a spiral whorl and meets crosswise at a saddle"
    >
      {hairs.map((path, index) => (
        <path key={index} d={path} className="fill-none stroke-lichen" strokeWidth="1.6" strokeLinecap="round" opacity="0.85" />
      ))}
      <circle cx={WHORL.x} cy={WHORL.y} r="9" className="fill-pollen" />
      <text x={WHORL.x + 14} y={WHORL.y - 12} className="fill-chalk text-[13px] font-semibold">
        whorl +1
      </text>
      <rect x={SADDLE.x - 7} y={SADDLE.y - 7} width="14" height="14" className="fill-bracken" transform={`rotate(45 ${SADDLE.x} ${SADDLE.y})`} />
      <text x={SADDLE.x + 14} y={SADDLE.y - 12} className="fill-chalk text-[13px] font-semibold">
        saddle −1
      </text>
    </svg>
  );
}
