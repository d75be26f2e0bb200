// Features added from the side list rather than drawn: placed at the surface point in the middle
// of the view (curves and strokes run from there to a second vertex beside it), with the values a
// new feature starts from; the groomer then types their places.
import type { Vec3 } from './features';
import { SADDLE_INDEX, WHORL_INDEX, addSingularity, type SpecEdit } from './spec-edits';

/** The features the side list can add. */
export type ListedFeature = 'whorl' | 'saddle' | 'singularity' | 'parting' | 'crest' | 'stroke' | 'pin';

/** The index a singularity added from the list starts with when it is neither a whorl nor a saddle. */
export const LISTED_INDEX = 2;

/** Whether a listed feature needs a second point (a curve or a stroke). */
export function needsSecondPoint(kind: ListedFeature): boolean {
  return kind === 'parting' || kind === 'crest' || kind === 'stroke';
}

/** The edit that adds a listed feature at `first` (and `second`, for curves and strokes). */
export function listedFeatureEdit(kind: ListedFeature, first: Vec3, second: Vec3): SpecEdit {
  switch (kind) {
    case 'whorl':
      return addSingularity(first, WHORL_INDEX);
    case 'saddle':
      return addSingularity(first, SADDLE_INDEX);
    case 'singularity':
      return addSingularity(first, LISTED_INDEX);
    case 'pin':
      return { type: 'add-pin', pin: { attribute: 'length', point: first, value: 1.5 } };
    case 'stroke':
      return { type: 'add-stroke', stroke: { points: [first, second] } };
    case 'parting':
    case 'crest':
      return { type: 'add-curve', kind, curve: { points: [first, second], closed: false } };
  }
}
