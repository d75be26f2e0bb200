// The "any index" tool: a click places a singularity of the index chosen on the tool rail.
import { clickTool } from './clicks';
import { placeSingularity } from './singularities';

export const singularityTool = clickTool(
  { id: 'singularity', label: 'Any index', shortcut: 'I', hint: 'Click the surface to place a singularity of the index chosen below.' },
  (hit, context) => placeSingularity(hit, context.options.index),
);
