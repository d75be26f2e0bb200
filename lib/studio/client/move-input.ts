// What the groomer types in the Surface panel, read into the move's request: renamed regions as
// "old=new" lines, landmarks as "x y z = x y z" lines (the old surface's point, then the new one's).

export type MoveInputs = {
  regionMap?: Record<string, string>;
  landmarks?: { from: [number, number, number]; to: [number, number, number] }[];
};

function point(text: string): [number, number, number] | null {
  const parts = text.trim().split(/[\s,]+/).filter(Boolean).map(Number);
  return parts.length === 3 && parts.every(Number.isFinite) ? (parts as [number, number, number]) : null;
}

/** Six significant digits: well under a landmark's own precision (a click on a surface), and short to read. */
const coordinate = (x: number) => String(Number(x.toPrecision(6)));

/** One landmark pair as a line of the landmarks box (what `readMoveInputs` reads back). */
export function landmarkLine(from: readonly number[], to: readonly number[]): string {
  return `${from.map(coordinate).join(' ')} = ${to.map(coordinate).join(' ')}`;
}

/**
 * Reads the panel's two text boxes. Guarantees: blank lines are ignored; either every line is
 * read, or the answer is the first bad line in words (`{ problem }`); fields with no lines are left out.
 */
export function readMoveInputs(regions: string, landmarks: string): MoveInputs | { problem: string } {
  const out: MoveInputs = {};
  for (const line of regions.split('\n').map((l) => l.trim()).filter(Boolean)) {
    const [from, to, ...rest] = line.split('=').map((s) => s.trim());
    if (!from || !to || rest.length > 0) return { problem: `Write each renamed region as old=new (“${line}” is not).` };
    (out.regionMap ??= {})[from] = to;
  }
  for (const line of landmarks.split('\n').map((l) => l.trim()).filter(Boolean)) {
    const [a, b, ...rest] = line.split('=');
    const from = a === undefined ? null : point(a), to = b === undefined ? null : point(b);
    if (!from || !to || rest.length > 0) return { problem: `Write each landmark as the old surface's x y z = the new surface's x y z (“${line}” is not).` };
    (out.landmarks ??= []).push({ from, to });
  }
  return out;
}
