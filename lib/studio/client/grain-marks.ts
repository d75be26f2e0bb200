// "Read the grain": the suggested layout of the field worker (lib/field's suggestLayout) shown as
// grain marks — ghosts of whorls and saddles where the smoothest field would put them — which the
// groomer takes one by one (a click on a mark) or all at once, and which then are ordinary placed
// singularities with the field's guarantee. A mark stays a ghost only while no placed singularity
// of its index stands on its point, so taking one, undoing it and taking it again all follow from
// the spec alone. No React, no DOM.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { formatIndex } from './features';
import type { GrainMark } from './protocol';
import { addSingularity, type SpecEdit } from './spec-edits';

/** Whether a placed singularity of the mark's index stands on the mark's point. */
function isTaken(spec: GroomSpec, mark: GrainMark): boolean {
  return spec.field.singularities.some((s) => s.index === mark.index && !!s.point && s.point.every((x, k) => x === mark.point[k]));
}

/** The marks still to show: those not yet taken into the spec, in their order. */
export function marksLeft(spec: GroomSpec, marks: readonly GrainMark[]): GrainMark[] {
  return marks.filter((mark) => !isTaken(spec, mark));
}

/** Taking one mark: a singularity of its index placed on its point (snapped to the same vertex). */
export function takeMark(mark: GrainMark): SpecEdit {
  return addSingularity([mark.point[0], mark.point[1], mark.point[2]], mark.index);
}

/**
 * Taking every mark at once, as one undoable step: the suggestion is a whole layout (its indices
 * sum to what the surface demands), so it replaces the singularities placed so far rather than
 * adding to them; marks already taken stay as they were placed (twist and all).
 */
export function takeAllMarks(spec: GroomSpec, marks: readonly GrainMark[]): SpecEdit {
  const kept = spec.field.singularities.filter((s) => marks.some((mark) => s.index === mark.index && !!s.point && s.point.every((x, k) => x === mark.point[k])));
  const added = marksLeft(spec, marks).map((mark) => ({ point: [mark.point[0], mark.point[1], mark.point[2]] as [number, number, number], index: mark.index, handedness: 'counterclockwise' as const }));
  const count = kept.length + added.length;
  return {
    type: 'replace',
    spec: { ...spec, field: { ...spec.field, singularities: [...kept, ...added] } },
    label: `Take the grain's ${count === 1 ? 'singularity' : `${count} singularities`}`,
  };
}

/** The marks in words: "8 grain marks: 8 × +1/4", "2 grain marks: 2 whorls", "no grain mark". */
export function describeMarks(marks: readonly GrainMark[], order: number): string {
  if (marks.length === 0) return 'No grain mark: the smoothest field here needs no singularity.';
  const byIndex = new Map<number, number>();
  for (const mark of marks) byIndex.set(mark.index, (byIndex.get(mark.index) ?? 0) + 1);
  const parts = [...byIndex.entries()]
    .sort((a, b) => b[0] - a[0])
    .map(([index, n]) => (index === 1 ? `${n} whorl${n === 1 ? '' : 's'}` : index === -1 ? `${n} saddle${n === 1 ? '' : 's'}` : `${n} × ${formatIndex(index, order)}`));
  return `${marks.length} grain mark${marks.length === 1 ? '' : 's'}: ${parts.join(', ')}.`;
}
