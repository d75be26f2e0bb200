// The editor's ways of working on the surface, named in Whorlwind's words.
import type { PinAttribute } from '@/lib/groom/spec/spec';

export type Tool = 'look' | 'whorl' | 'saddle' | 'singularity' | 'parting' | 'crest' | 'flow' | 'pin' | 'remainder';

export interface ToolOptions {
  /** Index of the "any index" tool. */
  index: number;
  attribute: PinAttribute;
  value: number;
  closed: boolean;
}

export const TOOLS: readonly { id: Exclude<Tool, 'remainder'>; label: string; key: string; hint: string }[] = [
  { id: 'look', label: 'Turn & pick', key: 'V', hint: 'Drag to turn the view, right-drag to slide it, scroll to come closer. Press a marker to pick it; drag it to move it.' },
  { id: 'whorl', label: 'Whorl', key: 'W', hint: 'Click the surface to place a whorl (index +1).' },
  { id: 'saddle', label: 'Saddle', key: 'S', hint: 'Click the surface to place a saddle (index −1).' },
  { id: 'singularity', label: 'Any index', key: 'I', hint: 'Click the surface to place a singularity of the index chosen below.' },
  { id: 'parting', label: 'Parting', key: 'P', hint: 'Click points along the parting; they are joined along the mesh. Enter or a second click on the last point finishes it.' },
  { id: 'crest', label: 'Crest', key: 'C', hint: 'Click points along the crest; they are joined along the mesh. Enter or a second click on the last point finishes it.' },
  { id: 'flow', label: 'Flow stroke', key: 'F', hint: 'Drag across the surface the way the hair should lie.' },
  { id: 'pin', label: 'Pin', key: 'N', hint: 'Click the surface to pin the value chosen below.' },
];

