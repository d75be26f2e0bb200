// The whorl tool: a click places a whorl (index +1).
import { WHORL_INDEX } from '../spec-edits';
import { clickTool } from './clicks';
import { placeSingularity } from './singularities';

export const whorlTool = clickTool(
  { id: 'whorl', label: 'Whorl', shortcut: 'W', hint: 'Click the surface to place a whorl (index +1).' },
  (hit) => placeSingularity(hit, WHORL_INDEX),
);
