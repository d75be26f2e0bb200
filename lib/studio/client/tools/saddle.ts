// The saddle tool: a click places a saddle (index −1).
import { SADDLE_INDEX } from '../spec-edits';
import { clickTool } from './clicks';
import { placeSingularity } from './singularities';

export const saddleTool = clickTool(
  { id: 'saddle', label: 'Saddle', shortcut: 'S', hint: 'Click the surface to place a saddle (index −1).' },
  (hit) => placeSingularity(hit, SADDLE_INDEX),
);
