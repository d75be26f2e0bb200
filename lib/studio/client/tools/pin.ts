// The pin tool: a click pins the attribute chosen on the tool rail, at the chosen factor.
import { clickTool } from './clicks';

export const pinTool = clickTool(
  { id: 'pin', label: 'Pin', shortcut: 'N', hint: 'Click the surface to pin the value chosen below.' },
  (hit, { options }) => ({ changes: [{ type: 'apply', edit: { type: 'add-pin', pin: { attribute: options.attribute, point: hit.vertexPoint, value: options.value } } }] }),
);
