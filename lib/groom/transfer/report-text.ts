import type { TransferReport } from './transfer';

const METHOD_WORDS = { topology: 'by polygon (same topology)', uv: 'by UV', alignment: 'by alignment along the normal' } as const;

function percent(x: number): string {
  return `${(100 * x).toFixed(x < 0.001 ? 3 : 1)} %`;
}

function point(p: readonly number[]): string {
  return `(${p.map((x) => x.toPrecision(6)).join(', ')})`;
}

/**
 * The transfer report as plain text for the command line: the method and alignment, one line per
 * feature, what was not carried and why, the new index budget and whether the field solves.
 * Guarantees: every feature and every item of `notCarried` appears on a line of its own.
 */
export function transferReportText(report: TransferReport): string {
  const a = report.alignment;
  const carried = report.features.filter((f) => f.to !== null);
  const largest = carried.reduce((m, f) => Math.max(m, f.moved ?? 0), 0);
  const lines = [
    `transfer    ${METHOD_WORDS[report.method]}; alignment by ${a.kind === 'bounding-box' ? 'bounding boxes' : `${a.kind === 'landmarks' ? 'landmarks' : 'the carried features'} (rms error ${a.landmarkError!.toPrecision(3)})`}, scale ${a.scale.toPrecision(4)}`,
    `surfaces    old ${report.from.faces} faces${report.from.hasUv ? ', UVs' : ', no UVs'}${report.from.uvOverlaps ? ` (${report.from.uvOverlaps} overlapping)` : ''}; new ${report.to.faces} faces${report.to.hasUv ? ', UVs' : ', no UVs'}${report.to.uvOverlaps ? ` (${report.to.uvOverlaps} overlapping)` : ''}`,
    `features    ${carried.length} of ${report.features.length} carried; moved at most ${percent(largest)} of the new surface's size`,
    ...report.features.map((f) => `  ${f.path.padEnd(32)} ${f.kind.padEnd(13)} ${f.to ? `→ ${point(f.to)}  moved ${percent(f.moved!)}` : 'not carried'}`),
  ];
  if (report.maps?.length) {
    lines.push(`maps        ${report.maps.length} carried`);
    for (const m of report.maps) {
      lines.push(`  ${m.path.padEnd(32)} ${m.attribute.padEnd(13)} ${m.how === 'polygon' ? 'by polygon, unchanged' : m.how === 'uv' ? `by UV${m.unlocated ? ` (${m.unlocated} vertices off the old UV layout read at the nearest point facing their way)` : ''}` : `by the nearest point of the old surface facing the same way (farthest ${percent(m.farthest!)} of the new surface's size${m.unchecked ? `; ${m.unchecked} vertices found none facing their way and took the nearest` : ''})`}`);
    }
  }
  if (report.notCarried.length > 0) {
    lines.push('not carried');
    for (const n of report.notCarried) lines.push(`  ${n.path}: ${n.reason}`);
  }
  const budget = report.budget.map((p) => `${report.budget.length > 1 ? `piece ${p.piece + 1}: ` : ''}placed ${p.placed}${p.demanded === null ? ' (free boundary)' : ` of ${p.demanded}${p.remainder ? `, remainder ${p.remainder} to place` : ''}`}`);
  lines.push(`index       ${budget.join('; ') || 'not computed'}`);
  lines.push(`field       ${report.field.solved ? 'solves with exactly the carried singularities' : `does not solve: ${report.field.message}`}`);
  return `${lines.join('\n')}\n`;
}
